import * as v from "valibot";
import { data, Form, redirect } from "react-router";
import type { Route } from "./+types/sleds";
import { requirePermission } from "~/auth.server";
import { Field, FormAlert, SelectField, SubmitButton } from "~/components/forms";
import { PageHeader } from "~/components/page-header";
import { SawCaution } from "~/components/saw-caution";
import { parseForm, type FieldErrors } from "~/lib/forms";
import { lengthSchema } from "~/lib/length-fields";
import { can } from "~/lib/permissions";
import { checkStatus, formatErrorRate, formatFine, formatKerf, kerfComment, KERF_MAX_UM, KERF_MIN_UM, MOVE_TEXT, STALE_AFTER_DAYS } from "~/lib/sled";
import { formatLength, type DisplayUnit } from "~/lib/units";
import { getShop } from "~/models/shops.server";
import { addSaw, addSled, recordKerf, recordSledCheck, sawStation, type SledCheck } from "~/models/sleds.server";

export async function loader(args: Route.LoaderArgs) {
  const user = requirePermission(args, "sleds:read");
  const [station, shop] = await Promise.all([sawStation(user.shopId), getShop(user.shopId)]);
  return { ...station, unit: shop.displayUnit, toleranceUmPerM: shop.sledToleranceUmPerM, now: new Date().toISOString(), canWrite: can(user.role, "sleds:write") };
}

const Uuid = v.pipe(v.string("Choose from the list."), v.uuid("Choose from the list."));
const Name = v.pipe(v.string("Enter a name."), v.trim(), v.nonEmpty("Enter a name."), v.maxLength(80, "At most 80 characters."));
const Note = (max: number) => v.pipe(v.optional(v.string(), ""), v.trim(), v.maxLength(max, `At most ${max} characters.`));
const mm = (n: number) => n * 1000;

function actionSchema(unit: DisplayUnit) {
  const len = (min: number, max: number) => lengthSchema(unit, { min, max });
  return v.variant(
    "intent",
    [
      v.object({ intent: v.literal("add-saw"), name: Name, blade: Note(120) }),
      // A test cut's width: 0.5–6 mm covers every table-saw blade (thin kerf ≈ 2.4, full ≈ 3.2 mm).
      v.object({ intent: v.literal("kerf"), sawId: Uuid, kerf: len(KERF_MIN_UM, KERF_MAX_UM), note: Note(200) }),
      v.pipe(
        v.object({
          intent: v.literal("add-sled"),
          name: Name,
          sawId: v.pipe(v.optional(v.string(), ""), v.transform((s) => s || null), v.nullable(v.pipe(v.string(), v.uuid("Choose from the list.")))),
          stopMin: len(mm(1), mm(3000)),
          stopMax: len(mm(1), mm(3000)),
          widest: len(mm(50), mm(3000)),
        }),
        v.forward(v.check((s) => s.stopMax > s.stopMin, "The stop range must end above where it starts."), ["stopMax"]),
      ),
      v.pipe(
        v.object({
          intent: v.literal("check"),
          sledId: Uuid,
          widthA: len(mm(1), mm(300)),
          widthB: len(mm(1), mm(300)),
          stripLength: len(mm(50), mm(3000)),
          pivotDistance: len(mm(50), mm(3000)),
        }),
        // A taper of more than 10 mm is a misread tape, not a sled.
        v.forward(v.check((s) => Math.abs(s.widthA - s.widthB) <= mm(10), "The two ends differ by more than 10 mm: measure the strip again."), ["widthB"]),
      ),
    ],
    "Unknown action.",
  );
}

type ActionResult = { intent: string; target: string | null; errors: FieldErrors };

export async function action(args: Route.ActionArgs) {
  const user = requirePermission(args, "sleds:write");
  const form = await args.request.formData();
  const unit = (await getShop(user.shopId)).displayUnit;
  const parsed = parseForm(actionSchema(unit), form);
  const intent = String(form.get("intent") ?? "");
  // Which saw's or sled's form the messages belong to (each has its own).
  const target = intent === "kerf" ? String(form.get("sawId") ?? "") : intent === "check" ? String(form.get("sledId") ?? "") : null;
  if (!parsed.ok) return data<ActionResult>({ intent, target, errors: parsed.errors }, { status: 400 });
  const input = parsed.data;
  switch (input.intent) {
    case "add-saw":
      await addSaw(user.shopId, { name: input.name, blade: input.blade });
      break;
    case "kerf":
      if (!(await recordKerf(user.shopId, input.sawId, user.id, { kerfUm: input.kerf, note: input.note }))) throw data("No such saw in this shop.", { status: 404 });
      return redirect(`/sleds#saw-${input.sawId}`);
    case "add-sled":
      if (!(await addSled(user.shopId, { name: input.name, sawId: input.sawId, stopMinUm: input.stopMin, stopMaxUm: input.stopMax, widestUm: input.widest }))) throw data("No such saw in this shop.", { status: 404 });
      break;
    case "check": {
      const check = { widthFirstEndUm: input.widthA, widthSecondEndUm: input.widthB, stripLengthUm: input.stripLength, pivotDistanceUm: input.pivotDistance };
      if (!(await recordSledCheck(user.shopId, input.sledId, user.id, check))) throw data("No such sled in this shop.", { status: 404 });
      return redirect(`/sleds#sled-${input.sledId}`);
    }
  }
  return redirect("/sleds");
}

const dateFormat = new Intl.DateTimeFormat("en-GB", { day: "numeric", month: "short", year: "numeric", timeZone: "UTC" });
const when = (d: Date | string) => dateFormat.format(new Date(d));

/** Top view of the sled: Stopwise's sign convention for moving the fence. Original drawing. */
function FenceDiagram() {
  return (
    <svg viewBox="0 0 360 232" role="img" aria-labelledby="fence-diagram-title" className="h-auto w-full max-w-md">
      <title id="fence-diagram-title">
        Top view of the sled. The fence is nearest you and pivots on a bolt near the blade; its far end is the adjustment point, D from the pivot. A is the strip's width at the end that met the
        blade first, B at the fence end. A wider than B: pull the far end toward you. A narrower than B: push it away.
      </title>
      <rect x="10" y="10" width="340" height="195" rx="6" className="fill-card stroke-line" strokeWidth="2" />
      {/* blade slot and travel */}
      <line x1="250" y1="14" x2="250" y2="200" className="stroke-bad" strokeWidth="4" strokeDasharray="10 6" />
      <text x="258" y="28" className="fill-bad text-[11px]">blade</text>
      <path d="M300 150 L300 40" className="stroke-muted" strokeWidth="2" markerEnd="url(#arrow)" />
      <text x="306" y="100" className="fill-muted text-[11px]">travel</text>
      {/* the work and the strip */}
      <rect x="60" y="45" width="188" height="105" className="fill-edge-soft stroke-edge" strokeWidth="1.5" />
      <polygon points="252,45 272,45 268,150 252,150" className="fill-rail-ink stroke-rail" strokeWidth="1.5" />
      <text x="262" y="40" textAnchor="middle" className="fill-ink text-[13px] font-semibold">A</text>
      <text x="262" y="168" textAnchor="middle" className="fill-ink text-[13px] font-semibold">B</text>
      {/* fence with pivot and adjustment point */}
      <rect x="30" y="150" width="230" height="12" className="fill-rail" />
      <circle cx="236" cy="156" r="5" className="fill-card stroke-rail" strokeWidth="2" />
      <text x="218" y="146" textAnchor="end" className="fill-ink text-[11px]">pivot</text>
      <circle cx="42" cy="156" r="5" className="fill-edge stroke-card" strokeWidth="2" />
      <path d="M42 146 L42 120" className="stroke-edge-dark" strokeWidth="2.5" markerEnd="url(#arrow-edge)" />
      <path d="M42 166 L42 192" className="stroke-edge-dark" strokeWidth="2.5" markerEnd="url(#arrow-edge)" />
      <text x="50" y="124" className="fill-edge-dark text-[11px] font-semibold">A &lt; B: push away</text>
      <text x="50" y="194" className="fill-edge-dark text-[11px] font-semibold">A &gt; B: pull toward you</text>
      {/* D */}
      <line x1="42" y1="174" x2="236" y2="174" className="stroke-muted" strokeWidth="1" strokeDasharray="3 3" />
      <text x="150" y="186" textAnchor="middle" className="fill-muted text-[11px]">D</text>
      <text x="180" y="225" textAnchor="middle" className="fill-ink text-[12px] font-semibold">you stand here</text>
      <defs>
        <marker id="arrow" viewBox="0 0 10 10" refX="5" refY="5" markerWidth="6" markerHeight="6" orient="auto-start-reverse">
          <path d="M0 0 L10 5 L0 10 z" className="fill-muted" />
        </marker>
        <marker id="arrow-edge" viewBox="0 0 10 10" refX="5" refY="5" markerWidth="6" markerHeight="6" orient="auto-start-reverse">
          <path d="M0 0 L10 5 L0 10 z" className="fill-edge-dark" />
        </marker>
      </defs>
    </svg>
  );
}

function CheckResult({ check, unit }: { check: SledCheck; unit: DisplayUnit }) {
  return (
    <dl className="grid grid-cols-2 gap-x-4 gap-y-1 text-sm sm:grid-cols-4">
      <div>
        <dt className="text-muted">Error per cut</dt>
        <dd className="font-semibold tabular-nums">{formatFine(check.errorPerCutUm, unit)}</dd>
      </div>
      <div>
        <dt className="text-muted">Error</dt>
        <dd className="font-semibold tabular-nums">{formatErrorRate(check.errorUmPerM, unit)}</dd>
      </div>
      <div>
        <dt className="text-muted">Correction at the adjustment point</dt>
        <dd className="font-semibold tabular-nums">{formatFine(Math.abs(check.correctionUm), unit)}</dd>
      </div>
      <div>
        <dt className="text-muted">Which way</dt>
        <dd className="font-semibold">{MOVE_TEXT[check.move]}</dd>
      </div>
    </dl>
  );
}

export default function Sleds({ loaderData, actionData }: Route.ComponentProps) {
  const { saws, sleds, unit, toleranceUmPerM, canWrite } = loaderData;
  const now = new Date(loaderData.now);
  const result = actionData as ActionResult | undefined;
  const errorsFor = (intent: string, target: string | null = null): FieldErrors => (result && result.intent === intent && result.target === target ? result.errors : {});
  const sawName = (id: string | null) => saws.find((s) => s.id === id)?.name ?? "no saw named";
  const len = (um: number) => formatLength(um, unit);

  return (
    <div className="space-y-10">
      <PageHeader eyebrow="Sawyer" title="Sleds & saws">
        The measured kerf of each saw (plans use the latest) and the squareness of each crosscut sled by the five-cut test. Checks older than {STALE_AFTER_DAYS} days or out of the shop's tolerance (
        {formatErrorRate(toleranceUmPerM, unit)}) are flagged, and the set-up sheet warns about them.
      </PageHeader>
      {/* The kerf and five-cut tests are cuts at the saw too. */}
      <SawCaution />
      {result && Object.keys(result.errors).length > 0 && <FormAlert>Some fields need another look.</FormAlert>}
      {result?.errors.form && <FormAlert>{result.errors.form}</FormAlert>}

      <section className="space-y-4" aria-labelledby="saws-heading">
        <h2 id="saws-heading" className="text-xl font-semibold">Saws</h2>
        {saws.length === 0 && <p className="text-muted">No saws yet.</p>}
        {saws.map((saw) => {
          const errors = errorsFor("kerf", saw.id);
          return (
            <article key={saw.id} id={`saw-${saw.id}`} data-saw={saw.name} className="space-y-3 rounded-lg border border-line bg-card p-4">
              <header className="flex flex-wrap items-baseline justify-between gap-2">
                <h3 className="text-lg font-semibold">{saw.name}</h3>
                {saw.blade && <p className="text-sm text-muted">{saw.blade}</p>}
              </header>
              {saw.latestKerfUm === null ? (
                <p className="text-warn">No kerf measured yet: plans with this saw use the kerf typed in the plan settings.</p>
              ) : (
                <p>
                  Kerf <span className="text-lg font-semibold tabular-nums">{formatKerf(saw.latestKerfUm, unit)}</span>
                  <span className="text-sm text-muted"> · {when(saw.latestAt!)} · {kerfComment(saw.latestKerfUm)}</span>
                </p>
              )}
              {canWrite && (
                <Form method="post" className="grid gap-3 sm:grid-cols-[10rem_1fr_auto] sm:items-end" noValidate>
                  <input type="hidden" name="intent" value="kerf" />
                  <input type="hidden" name="sawId" value={saw.id} />
                  <Field label={`Test-cut width (${unit})`} name="kerf" id={`kerf-${saw.id}`} inputMode="decimal" error={errors.kerf} />
                  <Field label="Note" name="note" id={`kerf-note-${saw.id}`} placeholder="new blade, cleaned, …" error={errors.note} />
                  <SubmitButton>Record kerf</SubmitButton>
                </Form>
              )}
              {saw.history.length > 1 && (
                <details>
                  <summary className="cursor-pointer text-sm font-medium text-edge">Earlier measurements ({saw.history.length - 1})</summary>
                  <ul className="mt-2 divide-y divide-line text-sm">
                    {saw.history.slice(1).map((k) => (
                      <li key={k.id} className="py-1.5 tabular-nums">
                        {formatKerf(k.kerfUm, unit)} · {when(k.measuredAt)}
                        {k.measuredBy ? ` · ${k.measuredBy}` : ""}
                        {k.note ? ` · ${k.note}` : ""}
                      </li>
                    ))}
                  </ul>
                </details>
              )}
            </article>
          );
        })}
        {canWrite && (
          <details className="rounded-lg border border-line bg-card p-4" open={Object.keys(errorsFor("add-saw")).length > 0 || saws.length === 0}>
            <summary className="cursor-pointer font-semibold">Add a saw</summary>
            <Form method="post" className="mt-3 grid gap-3 md:grid-cols-[1fr_1fr_auto] md:items-end" noValidate>
              <input type="hidden" name="intent" value="add-saw" />
              <Field label="Name" name="name" id="saw-name" error={errorsFor("add-saw").name} />
              <Field label="Blade" name="blade" id="saw-blade" placeholder="250 mm, 3.2 mm full kerf" error={errorsFor("add-saw").blade} />
              <SubmitButton>Add saw</SubmitButton>
            </Form>
          </details>
        )}
      </section>

      <section className="space-y-4" aria-labelledby="sleds-heading">
        <h2 id="sleds-heading" className="text-xl font-semibold">Crosscut sleds</h2>
        <div className="grid gap-4 rounded-lg border border-line bg-card p-4 lg:grid-cols-[1fr_22rem]">
          <div className="space-y-2 text-sm">
            <h3 className="text-base font-semibold">The five-cut test, and which way Stopwise means</h3>
            <p>
              Cut each edge of a square-ish panel in turn, turning it a quarter the same way each time, then cut a strip off the first edge. Measure the strip at both ends and along its
              length. The error builds up once per cut, so Stopwise divides the taper by four.
            </p>
            <p>
              <strong>A</strong> is the strip's width at the end that met the blade first (furthest from the fence), <strong>B</strong> at the fence end. Stopwise takes the fence nearest
              you, pivoting on a bolt near the blade and adjusted at its far end, <strong>D</strong> from the pivot. <strong>A wider than B: pull the far end toward you; A narrower than B:
              push it away from you</strong>, by the correction shown. If your fence pivots at the other end, move the end that is free the opposite way.
            </p>
          </div>
          <FenceDiagram />
        </div>
        {sleds.length === 0 && <p className="text-muted">No sleds yet.</p>}
        {sleds.map((sled) => {
          const errors = errorsFor("check", sled.id);
          const status = sled.lastCheck ? checkStatus(sled.lastCheck, toleranceUmPerM, now) : null;
          return (
            <article key={sled.id} id={`sled-${sled.id}`} data-sled={sled.name} className="space-y-3 rounded-lg border border-line bg-card p-4">
              <header className="space-y-1">
                <h3 className="text-lg font-semibold">{sled.name}</h3>
                <p className="text-sm text-muted">
                  On {sawName(sled.sawId)} · stop block {len(sled.stopMinUm)} to {len(sled.stopMaxUm)} from the cut line · widest piece {len(sled.widestUm)}
                </p>
              </header>
              {!sled.lastCheck || !status ? (
                <FormAlert tone="warn">No squareness check on record: do a five-cut test before the next batch.</FormAlert>
              ) : (
                <div className="space-y-2">
                  <p className="text-sm">
                    Last check {when(sled.lastCheck.checkedAt)} ({status.ageDays} {status.ageDays === 1 ? "day" : "days"} ago){sled.lastCheck.checkedBy ? ` by ${sled.lastCheck.checkedBy}` : ""}
                  </p>
                  {status.stale && <FormAlert tone="warn">This check is more than {STALE_AFTER_DAYS} days old: check the sled again.</FormAlert>}
                  {status.outOfTolerance ? (
                    <FormAlert tone="bad">Out of the shop's tolerance ({formatErrorRate(toleranceUmPerM, unit)}): square the fence and check again.</FormAlert>
                  ) : (
                    !status.stale && <FormAlert tone="ok">Within the shop's tolerance ({formatErrorRate(toleranceUmPerM, unit)}).</FormAlert>
                  )}
                  <CheckResult check={sled.lastCheck} unit={unit} />
                </div>
              )}
              {canWrite && (
                <Form method="post" className="grid gap-3 sm:grid-cols-2 lg:grid-cols-[repeat(4,1fr)_auto] lg:items-end" noValidate>
                  <input type="hidden" name="intent" value="check" />
                  <input type="hidden" name="sledId" value={sled.id} />
                  <Field label={`A: width at the first-cut end (${unit})`} name="widthA" id={`a-${sled.id}`} inputMode="decimal" error={errors.widthA} />
                  <Field label={`B: width at the fence end (${unit})`} name="widthB" id={`b-${sled.id}`} inputMode="decimal" error={errors.widthB} />
                  <Field label={`Strip length (${unit})`} name="stripLength" id={`l-${sled.id}`} inputMode="decimal" error={errors.stripLength} />
                  <Field label={`D: pivot to adjustment point (${unit})`} name="pivotDistance" id={`d-${sled.id}`} inputMode="decimal" error={errors.pivotDistance} />
                  <SubmitButton>Record check</SubmitButton>
                </Form>
              )}
              {sled.history.length > 1 && (
                <details>
                  <summary className="cursor-pointer text-sm font-medium text-edge">Earlier checks ({sled.history.length - 1})</summary>
                  <ul className="mt-2 divide-y divide-line text-sm">
                    {sled.history.slice(1).map((c) => (
                      <li key={c.id} className="py-1.5 tabular-nums">
                        {when(c.checkedAt)} · A {formatFine(c.widthFirstEndUm, unit)}, B {formatFine(c.widthSecondEndUm, unit)} over {len(c.stripLengthUm)} · {formatErrorRate(c.errorUmPerM, unit)} · move{" "}
                        {formatFine(Math.abs(c.correctionUm), unit)}, {MOVE_TEXT[c.move]}
                        {c.checkedBy ? ` · ${c.checkedBy}` : ""}
                      </li>
                    ))}
                  </ul>
                </details>
              )}
            </article>
          );
        })}
        {canWrite && (
          <details className="rounded-lg border border-line bg-card p-4" open={Object.keys(errorsFor("add-sled")).length > 0 || sleds.length === 0}>
            <summary className="cursor-pointer font-semibold">Add a sled</summary>
            <Form method="post" className="mt-3 grid gap-3 md:grid-cols-3" noValidate>
              <input type="hidden" name="intent" value="add-sled" />
              <Field label="Name" name="name" id="sled-name" error={errorsFor("add-sled").name} />
              <SelectField label="Saw" name="sawId" id="sled-saw" error={errorsFor("add-sled").sawId}>
                <option value="">none</option>
                {saws.map((s) => (
                  <option key={s.id} value={s.id}>
                    {s.name}
                  </option>
                ))}
              </SelectField>
              <Field label={`Widest piece (${unit})`} name="widest" id="sled-widest" error={errorsFor("add-sled").widest} />
              <Field label={`Stop block nearest the cut line (${unit})`} name="stopMin" id="sled-stop-min" error={errorsFor("add-sled").stopMin} />
              <Field label={`Stop block furthest (${unit})`} name="stopMax" id="sled-stop-max" error={errorsFor("add-sled").stopMax} />
              <SubmitButton className="md:w-fit md:self-end">Add sled</SubmitButton>
            </Form>
          </details>
        )}
      </section>
    </div>
  );
}
