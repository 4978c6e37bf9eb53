import { useEffect, useState } from "react";
import * as v from "valibot";
import { data, Form, Link, redirect } from "react-router";
import useSWR from "swr";
import type { Route } from "./+types/batches.$batchId";
import { requirePermission } from "~/auth.server";
import { BatchBadge } from "~/components/batch-badge";
import { FormAlert, SelectField, SubmitButton } from "~/components/forms";
import { PageHeader } from "~/components/page-header";
import { PlanCompare, PlanCard } from "~/components/plan-cards";
import { useRouterClicks } from "~/components/router-clicks";
import { BATCH_LINES_SHOWN } from "~/lib/batches";
import { formatDate } from "~/lib/dates";
import { releaseEmail } from "~/lib/emails";
import { parseForm } from "~/lib/forms";
import { can } from "~/lib/permissions";
import { PlanSettingsSchema } from "~/lib/plan-settings";
import { formatLength, formatSize } from "~/lib/units";
import { publicOrigin, sendMail } from "~/mail.server";
import { batchPage, BatchStateError, changeChoices, getBatch, holdLines, moveLines } from "~/models/batches.server";
import { cutListOf } from "~/models/plan-job.server";
import { cancelPlan, listPlans, PlanStateError, releasePlan, requestPlan, sawyersOf, type PlanSummary } from "~/models/plans.server";
import { timed } from "~/timing.server";

const Uuid = v.pipe(v.string(), v.uuid());

export async function loader(args: Route.LoaderArgs) {
  const user = requirePermission(args, "batches:read");
  if (!v.is(Uuid, args.params.batchId)) throw data("No such batch in this shop.", { status: 404 });
  const batchId = args.params.batchId;
  // Everything that needs only the ids at once; what is read for another shop's id is thrown away.
  const [page, plans] = await timed("queries", () => Promise.all([batchPage(user.shopId, batchId), listPlans(user.shopId, batchId)]));
  if (!page) throw data("No such batch in this shop.", { status: 404 });
  const { batch, shop, lines, sources } = page;
  // The first lines by order number, unless all were asked for: a hundred lines are the page's biggest part.
  const allLines = new URL(args.request.url).searchParams.get("lines") === "all";
  const editable = can(user.role, "batches:write") && (batch.status === "open" || batch.status === "planned");
  const cutList = await timed("merge", () => cutListOf(sources, shop));
  const unit = shop.displayUnit;
  const parts = cutList.sawn.map((p) => ({
    key: p.key,
    name: p.name,
    size: formatSize(p.lengthUm, p.widthUm, unit),
    grainLocked: p.grainLocked,
    quantity: p.quantity,
    // Counts only: a row's origins are read when it is opened (PartOrigins), so the page stays small.
    orders: new Set(p.origins.map((o) => o.orderId)).size,
  }));
  return {
    batch: { id: batch.id, code: batch.code, status: batch.status, dueBy: batch.dueBy, materialName: batch.materialName, chosenPlanId: batch.chosenPlanId },
    lines: allLines ? lines : lines.slice(0, BATCH_LINES_SHOWN),
    lineCount: lines.length,
    parts,
    laser: { items: cutList.laser.reduce((n, p) => n + p.quantity, 0), blanks: cutList.blanks.length, bed: formatSize(shop.laserBedLengthUm, shop.laserBedWidthUm, unit), unplaced: cutList.laserUnplaced },
    plans,
    // What changing the batch needs (other batches, the plan form's saws, sleds and offcuts) is read only while it can change.
    changes: editable ? await timed("queries", () => batchChanges(user.shopId, batch, shop)) : null,
    unit,
    currency: shop.currency,
    canSeeFloor: can(user.role, "floor:read"),
    canReadLedger: can(user.role, "ledger:read"),
  };
}

async function batchChanges(shopId: string, batch: { id: string; materialId: string }, shop: { kerfUm: number; edgeTrimUm: number; displayUnit: "mm" | "in" }) {
  const { siblings, offcuts, saws, sleds } = await changeChoices(shopId, batch);
  const unit = shop.displayUnit;
  return {
    siblings: siblings.map((s) => ({ id: s.id, code: s.code })),
    offcuts: offcuts.map((o) => ({ id: o.id, label: `${formatSize(o.lengthUm, o.widthUm, unit)}${o.location ? ` · ${o.location}` : ""}` })),
    // The kerf measured on the saw last comes first; the shop's default otherwise.
    defaults: { kerf: (saws.find((s) => s.latestKerfUm !== null)?.latestKerfUm ?? shop.kerfUm) / 1000, trim: shop.edgeTrimUm / 1000 },
    saws: saws.map((s) => ({ id: s.id, label: `${s.name}${s.latestKerfUm !== null ? ` · kerf measured ${s.latestKerfUm / 1000} mm` : " · kerf not measured"}`, kerfMm: s.latestKerfUm === null ? null : s.latestKerfUm / 1000 })),
    sleds: sleds.map((s) => ({ id: s.id, label: `${s.name} · stop ${formatLength(s.stopMinUm, unit)}–${formatLength(s.stopMaxUm, unit)}` })),
  };
}

// The ticked lines of the shared move/hold form: every checkbox sends its line's id under one name.
const LineIds = v.pipe(
  v.array(v.string()),
  v.minLength(1, "Tick one or more lines first."),
  v.maxLength(10_000, "Too many lines at once."),
  v.check((ids) => ids.every((id) => v.is(Uuid, id)), "The ticked lines could not be read. Reload the page and try again."),
);

const ActionSchema = v.variant("intent", [
  v.object({ intent: v.literal("move-line"), lineId: LineIds, targetBatchId: v.pipe(v.string("Choose a batch."), v.uuid("Choose a batch.")) }),
  v.object({ intent: v.literal("hold-line"), lineId: LineIds }),
  v.object({ intent: v.literal("run-plan") }),
  v.object({ intent: v.literal("cancel-plan"), planId: Uuid }),
  v.object({ intent: v.literal("release"), planId: Uuid }),
], "Unknown action.");

export async function action(args: Route.ActionArgs) {
  const user = requirePermission(args, "batches:write");
  const batchId = args.params.batchId;
  if (!v.is(Uuid, batchId)) throw data("No such batch in this shop.", { status: 404 });
  const form = await args.request.formData();
  const parsed = parseForm(ActionSchema, { ...Object.fromEntries(form), lineId: form.getAll("lineId").map(String) }, ["targetBatchId", "planId"]);
  if (!parsed.ok) return data({ errors: parsed.errors, notice: null }, { status: 400 });
  const input = parsed.data;
  const notFound = () => data("No such batch, line or plan in this shop.", { status: 404 });
  try {
    switch (input.intent) {
      case "move-line":
        if (input.targetBatchId === batchId) return data({ errors: { targetBatchId: "Choose another batch: the lines are in this one." }, notice: null }, { status: 400 });
        if (!(await moveLines(user.shopId, batchId, input.lineId, input.targetBatchId))) throw notFound();
        break;
      case "hold-line":
        if (!(await holdLines(user.shopId, batchId, input.lineId))) throw notFound();
        break;
      case "run-plan": {
        if (!(await getBatch(user.shopId, batchId))) throw notFound();
        const settings = parseForm(PlanSettingsSchema, form);
        if (!settings.ok) return data({ errors: settings.errors, notice: null }, { status: 400 });
        await requestPlan(user.shopId, batchId, { ...settings.data, offcutIds: form.getAll("offcutIds").map(String).filter((id) => v.is(Uuid, id)) });
        break;
      }
      case "cancel-plan":
        if (!(await cancelPlan(user.shopId, batchId, input.planId))) return data({ errors: { form: "That plan has already finished." }, notice: null }, { status: 409 });
        break;
      case "release": {
        const released = await releasePlan(user.shopId, batchId, input.planId);
        const batch = await getBatch(user.shopId, batchId);
        const link = `${publicOrigin(args.request)}/saw/${batchId}`; // straight to this batch at the saw
        const failed: string[] = [];
        for (const sawyer of await sawyersOf(user.shopId)) {
          await sendMail({ to: sawyer.email, ...releaseEmail({ name: sawyer.name, code: batch!.code, material: batch!.materialName, sheets: released.sheets, setups: released.setups, link }) }).catch(() => failed.push(sawyer.email));
        }
        if (failed.length) return { errors: {} as Record<string, string>, notice: `Released. The e-mail to ${failed.join(", ")} could not be sent; tell them yourself.` };
        break;
      }
    }
  } catch (error) {
    if (error instanceof BatchStateError || error instanceof PlanStateError) return data({ errors: { form: error.message }, notice: null }, { status: 409 });
    throw error;
  }
  // Back to the page as it was asked for (all lines or the first ones).
  return redirect(`/batches/${batchId}${new URL(args.request.url).searchParams.get("lines") === "all" ? "?lines=all" : ""}`);
}

const fetchFloor = async (url: string): Promise<{ setups: number; ticks: unknown[]; recuts: unknown[] }> => {
  const res = await fetch(url, { headers: { Accept: "application/json" } });
  if (!res.ok) throw new Error(`The floor could not be read (${res.status}).`);
  return res.json();
};

const fetchPlans = async (url: string): Promise<{ plans: PlanSummary[] }> => {
  const res = await fetch(url, { headers: { Accept: "application/json" } });
  if (!res.ok) throw new Error(`Plans could not be loaded (${res.status}).`);
  return res.json();
};

type Origins = { part: string; quantity: number; origins: string[] };

const fetchOrigins = async (url: string): Promise<Origins> => {
  const res = await fetch(url, { headers: { Accept: "application/json" } });
  if (!res.ok) throw new Error(`The orders of this part could not be loaded (${res.status}).`);
  return res.json();
};

/** "20 from 3 orders"; opening it reads which orders, copies and texts the row is for. */
function PartOrigins({ batchId, part }: { batchId: string; part: { key: string; quantity: number; orders: number } }) {
  const [open, setOpen] = useState(false);
  return (
    <details onToggle={(e) => setOpen(e.currentTarget.open)}>
      <summary className="cursor-pointer text-muted">
        {part.quantity} from {part.orders} order{part.orders === 1 ? "" : "s"}
      </summary>
      {open && <OriginList url={`/api/batches/${batchId}/origins?part=${encodeURIComponent(part.key)}`} />}
    </details>
  );
}

function OriginList({ url }: { url: string }) {
  const { data, error } = useSWR(url, fetchOrigins);
  if (error) return <p className="mt-1 text-xs text-bad">{error.message}</p>;
  if (!data) return <p className="mt-1 text-xs text-muted">Loading the orders…</p>;
  return (
    <ul className="mt-1 max-h-48 space-y-0.5 overflow-y-auto text-xs">
      {data.origins.map((o, i) => (
        <li key={i}>{o}</li>
      ))}
      {data.quantity > data.origins.length && <li className="text-muted">… and {data.quantity - data.origins.length} more (all of them are on the labels)</li>}
    </ul>
  );
}

export default function BatchPage({ loaderData, actionData }: Route.ComponentProps) {
  const { batch, lines, lineCount, parts, laser, changes, unit, currency } = loaderData;
  const errors: Record<string, string> = actionData?.errors ?? {};
  const editable = changes !== null;
  // Poll while a plan is queued or running; otherwise the list stays as loaded.
  const { data: live, mutate } = useSWR(`/api/batches/${batch.id}/plans`, fetchPlans, {
    fallbackData: { plans: loaderData.plans },
    refreshInterval: (latest) => (latest?.plans.some((p) => p.status === "queued" || p.status === "running") ? 700 : 0),
  });
  // After an action the loader has the newest list (a plan just queued): it replaces swr's copy.
  useEffect(() => {
    void mutate({ plans: loaderData.plans }, { revalidate: false });
  }, [loaderData.plans, mutate]);
  const plans = live?.plans ?? loaderData.plans;
  const atSaw = batch.status === "released" && loaderData.canSeeFloor;
  const { data: floor } = useSWR(atSaw ? `/api/batches/${batch.id}/floor` : null, fetchFloor, { refreshInterval: 5000 });
  const done = plans.filter((p) => p.status === "done");
  const [compare, setCompare] = useState<[string, string]>(["", ""]);
  const routerClicks = useRouterClicks();

  return (
    <div className="space-y-8">
      <div className="flex flex-wrap items-start justify-between gap-4">
        <PageHeader eyebrow={`Batch · ${batch.materialName}`} title={batch.code}>
          Due by {formatDate(batch.dueBy)} · {lineCount} order line{lineCount === 1 ? "" : "s"}
        </PageHeader>
        <BatchBadge status={batch.status} />
      </div>
      {errors.form && <FormAlert>{errors.form}</FormAlert>}
      {atSaw && (
        <p className="rounded-lg border border-warn/40 bg-warn-soft p-4 font-medium text-warn" role="status" data-testid="floor-progress">
          At the saw: {floor ? `${floor.ticks.length} of ${floor.setups} set-ups done` : "waiting for the first tick"}
          {floor && floor.recuts.length > 0 ? ` · ${floor.recuts.length} part(s) to cut again` : ""}.{" "}
          <Link to={`/saw/${batch.id}`} className="underline">
            Open the floor view
          </Link>
        </p>
      )}
      {actionData?.notice && <FormAlert tone="warn">{actionData.notice}</FormAlert>}

      <section className="space-y-3">
        <h2 className="text-xl font-semibold">Parts to cut</h2>
        {parts.length === 0 && laser.blanks === 0 ? (
          <p className="text-muted">This batch has no parts.</p>
        ) : (
          <div className="overflow-x-auto rounded-lg border border-line bg-card">
            {/* Cell styles from the table down, not on every cell: a batch may merge into dozens of rows. */}
            <table className="w-full min-w-[36rem] text-left text-sm [&_td]:px-4 [&_td]:py-3 [&_th]:px-4 [&_th]:py-3">
              <thead className="border-b border-line text-xs uppercase tracking-wider text-muted">
                <tr>
                  {/* The count next to the name: on a phone the table scrolls sideways and the end is out of view. */}
                  <th>Part</th>
                  <th className="text-right">Qty</th>
                  <th>Finished size</th>
                  <th>Grain</th>
                  <th>For</th>
                </tr>
              </thead>
              <tbody className="divide-y divide-line [&_td:nth-child(1)]:font-medium [&_td:nth-child(2)]:text-right [&_td:nth-child(2)]:font-semibold [&_td:nth-child(2)]:tabular-nums [&_td:nth-child(3)]:tabular-nums">
                {parts.map((p) => (
                  <tr key={p.key} data-part={p.key}>
                    <td>{p.name}</td>
                    <td>{p.quantity}</td>
                    <td>{p.size}</td>
                    <td>{p.grainLocked ? "along the length" : "free"}</td>
                    <td>
                      <PartOrigins batchId={batch.id} part={p} />
                    </td>
                  </tr>
                ))}
                {laser.blanks > 0 && (
                  <tr data-part="laser-blank">
                    <td>Laser blank</td>
                    <td>{laser.blanks}</td>
                    <td>{laser.bed}</td>
                    <td>—</td>
                    <td className="text-muted">{laser.items} laser-cut items</td>
                  </tr>
                )}
              </tbody>
            </table>
          </div>
        )}
        {laser.blanks > 0 && (
          <div className="rounded-lg border border-line bg-card p-4 text-sm">
            <p>
              {laser.items} laser-cut items are nested on {laser.blanks} blank{laser.blanks === 1 ? "" : "s"} of {laser.bed}. Files for the laser (SVG, true size):
            </p>
            <ul className="mt-2 flex flex-wrap gap-2">
              {Array.from({ length: laser.blanks }, (_, i) => (
                <li key={i}>
                  <a href={`/batches/${batch.id}/blanks/${i + 1}`} download className="inline-block rounded-md border border-line bg-white px-3 py-1.5 hover:border-edge">
                    Blank {i + 1}.svg
                  </a>
                </li>
              ))}
            </ul>
          </div>
        )}
        {laser.unplaced.map((u) => (
          <FormAlert key={u.key} tone="warn">
            {u.quantity} × {u.name}: {u.reason}
          </FormAlert>
        ))}
      </section>

      <section className="space-y-3">
        <h2 className="text-xl font-semibold">Order lines</h2>
        {changes ? (
          // One form for every line: each line's checkbox names it, the controls above act on the ticked ones.
          <Form method="post" className="space-y-3" aria-label="Change the ticked lines">
            <LineActions siblings={changes.siblings} errors={errors} />
            <LineList lines={lines} editable onClick={routerClicks} />
          </Form>
        ) : (
          <LineList lines={lines} editable={false} onClick={routerClicks} />
        )}
        {lineCount > lines.length && (
          <p className="text-sm text-muted">
            {`The first ${lines.length} of ${lineCount} lines, by order number. `}
            <Link to="?lines=all" className="font-medium text-edge underline">{`Show all ${lineCount} lines`}</Link>
          </p>
        )}
      </section>

      {changes && (
        <section className="space-y-4 rounded-lg border border-line bg-card p-5">
          <h2 className="text-xl font-semibold">Plan the panels</h2>
          <Form method="post" className="grid gap-4 md:grid-cols-3" noValidate>
            <input type="hidden" name="intent" value="run-plan" />
            <PlanSettingsFields defaults={changes.defaults} errors={errors} offcuts={changes.offcuts} unit={unit} saws={changes.saws} sleds={changes.sleds} />
            <SubmitButton className="md:col-span-3 md:w-fit" pendingText="Queueing…">
              Run a plan
            </SubmitButton>
          </Form>
        </section>
      )}

      <section className="space-y-3">
        <h2 className="text-xl font-semibold">Plans</h2>
        {plans.length === 0 &&
          (batch.status === "cut" ? (
            // a batch recorded as cut before plans were kept: its figures are in the ledger
            <p className="text-muted">
              No plan is kept for this batch.
              {loaderData.canReadLedger && (
                <>
                  {" "}
                  Its cost and scrap are in the{" "}
                  <Link className="font-medium text-edge underline" to={`/ledger/batches/${batch.id}`}>
                    ledger
                  </Link>
                  .
                </>
              )}
            </p>
          ) : (
            <p className="text-muted">No plans yet.</p>
          ))}
        <ul className="grid gap-3 md:grid-cols-2">
          {plans.map((p) => (
            <li key={p.id}>
              <PlanCard plan={p} batchId={batch.id} currency={currency} unit={unit} canWrite={editable} chosen={batch.chosenPlanId === p.id} />
            </li>
          ))}
        </ul>
        {done.length >= 2 && (
          <div className="space-y-3 rounded-lg border border-line bg-card p-4">
            <h3 className="font-semibold">Compare two plans</h3>
            <div className="flex flex-wrap gap-3">
              {[0, 1].map((side) => (
                <SelectField key={side} label={side === 0 ? "First" : "Second"} name={`compare-${side}`} value={compare[side]} onChange={(e) => setCompare(side === 0 ? [e.target.value, compare[1]] : [compare[0], e.target.value])}>
                  <option value="">Choose…</option>
                  {done.map((p) => (
                    <option key={p.id} value={p.id}>
                      Plan {p.number}
                    </option>
                  ))}
                </SelectField>
              ))}
            </div>
            {compare[0] && compare[1] && <PlanCompare a={done.find((p) => p.id === compare[0])!} b={done.find((p) => p.id === compare[1])!} currency={currency} unit={unit} />}
          </div>
        )}
      </section>
      <p className="text-sm text-muted">A plan's cost is the stock it draws: stock panels at their catalogue price, racked offcuts at the material's cheapest price per area. Net of offcuts takes off what the offcuts it leaves are worth at that rate, as the ledger does once they are racked.</p>
    </div>
  );
}

type Line = { lineId: string; orderId: string; orderNumber: number; customerName: string; quantity: number; productName: string; dueDate: string };

/**
 * "#1001 Ardent–Vasquez wedding: 3 × Table number · due …", with a checkbox while the batch can
 * change. A batch has a hundred lines, so the styles sit on the list (not on every line) and each
 * phrase is one text node (React's separators add up).
 */
function LineList({ lines, editable, onClick }: { lines: Line[]; editable: boolean; onClick: (event: React.MouseEvent) => void }) {
  return (
    <ul
      className="divide-y divide-line rounded-lg border border-line bg-card [&_a]:font-semibold [&_a]:text-edge [&_a:hover]:underline [&_input]:h-5 [&_input]:w-5 [&_input]:shrink-0 [&_input]:accent-edge [&_label]:flex [&_label]:min-h-11 [&_label]:cursor-pointer [&_label]:items-center [&_label]:gap-3 [&_li]:px-4 [&_li]:py-3 [&_small]:text-sm [&_small]:text-muted"
      onClick={onClick}
    >
      {lines.map((l) => {
        const text = (
          <span>
            <a href={`/orders/${l.orderId}`}>{`#${l.orderNumber}`}</a>
            {` ${l.customerName}: ${l.quantity} × ${l.productName} `}
            <small>{`· due ${formatDate(l.dueDate)}`}</small>
          </span>
        );
        return (
          <li key={l.lineId}>
            {editable ? (
              <label>
                <input type="checkbox" name="lineId" value={l.lineId} />
                {text}
              </label>
            ) : (
              text
            )}
          </li>
        );
      })}
    </ul>
  );
}

/** Move the ticked lines to another batch of this material, or hold them back. Plain form controls: works before scripts load. */
function LineActions({ siblings, errors }: { siblings: { id: string; code: string }[]; errors: Record<string, string> }) {
  const button = "min-h-11 rounded-md border border-line bg-white px-4 text-sm font-medium hover:border-edge";
  return (
    <div className="space-y-3 rounded-lg border border-line bg-card p-4">
      <p className="text-sm text-muted">Tick the lines to change, then move them or hold them back. Either discards this batch's plans: they no longer match its parts.</p>
      <div className="flex flex-wrap items-end gap-3">
        {siblings.length > 0 && (
          <>
            {/* Its message goes under the whole row (below), so the buttons stay level with the select. */}
            <SelectField label="Move the ticked lines to" name="targetBatchId" id="move-target" defaultValue="" aria-invalid={errors.targetBatchId ? true : undefined} aria-describedby={errors.targetBatchId ? "move-target-error" : undefined}>
              <option value="">Choose a batch…</option>
              {siblings.map((s) => (
                <option key={s.id} value={s.id}>
                  {s.code}
                </option>
              ))}
            </SelectField>
            <button type="submit" name="intent" value="move-line" className={button}>
              Move
            </button>
          </>
        )}
        <button type="submit" name="intent" value="hold-line" className={button}>
          Hold back the ticked lines
        </button>
      </div>
      {errors.lineId && (
        <p className="text-sm font-medium text-bad" role="alert">
          {errors.lineId}
        </p>
      )}
      {errors.targetBatchId && (
        <p id="move-target-error" className="text-sm font-medium text-bad" role="alert">
          {errors.targetBatchId}
        </p>
      )}
    </div>
  );
}

type Choice = { id: string; label: string };

function PlanSettingsFields({ defaults, errors, offcuts, unit, saws, sleds }: { defaults: { kerf: number; trim: number }; errors: Record<string, string>; offcuts: Choice[]; unit: "mm" | "in"; saws: (Choice & { kerfMm: number | null })[]; sleds: Choice[] }) {
  const input = "block w-full rounded-md border border-line bg-white px-3 py-2.5";
  const err = (f: string) => errors[f] && <p className="text-sm font-medium text-bad">{errors[f]}</p>;
  const [kerf, setKerf] = useState(String(defaults.kerf));
  return (
    <>
      {/* On a tablet the saw and sled lists take a row each, so their kerf and stop range stay readable. */}
      <label className="space-y-1 text-sm font-medium md:col-span-3 lg:col-span-1">
        <span>Saw</span>
        <select
          name="sawId"
          defaultValue={saws.find((s) => s.kerfMm !== null)?.id ?? ""}
          onChange={(e) => {
            const chosen = saws.find((s) => s.id === e.target.value);
            if (chosen?.kerfMm != null) setKerf(String(chosen.kerfMm));
          }}
          className={input}
        >
          <option value="">None chosen</option>
          {saws.map((s) => (
            <option key={s.id} value={s.id}>
              {s.label}
            </option>
          ))}
        </select>
        {err("sawId")}
      </label>
      <label className="space-y-1 text-sm font-medium md:col-span-3 lg:col-span-2">
        <span>Crosscut sled (its stop range and widest piece bound the plan)</span>
        <select name="sledId" defaultValue={sleds[0]?.id ?? ""} className={input}>
          <option value="">None chosen: the shop's saw capacities</option>
          {sleds.map((s) => (
            <option key={s.id} value={s.id}>
              {s.label}
            </option>
          ))}
        </select>
        {err("sledId")}
      </label>
      <label className="space-y-1 text-sm font-medium">
        <span>Kerf (mm)</span>
        <input name="kerfMm" inputMode="decimal" value={kerf} onChange={(e) => setKerf(e.target.value)} className={input} aria-invalid={errors.kerfMm ? true : undefined} />
        {err("kerfMm")}
      </label>
      <label className="space-y-1 text-sm font-medium">
        <span>Edge trim per side (mm)</span>
        <input name="trimMm" inputMode="decimal" defaultValue={defaults.trim} className={input} aria-invalid={errors.trimMm ? true : undefined} />
        {err("trimMm")}
      </label>
      <label className="space-y-1 text-sm font-medium">
        <span>Time to search (seconds)</span>
        <input name="seconds" inputMode="decimal" defaultValue="2" className={input} aria-invalid={errors.seconds ? true : undefined} />
        {err("seconds")}
      </label>
      <label className="space-y-1 text-sm font-medium md:col-span-2">
        <span>How the saw works the sheet</span>
        <select name="stages" defaultValue="2" className={input}>
          <option value="2">Rip strips along the length, then crosscut them on the sled</option>
          <option value="3">Crosscut the sheet into panels first, then rip, then crosscut</option>
          <option value="0">Any edge-to-edge cuts</option>
        </select>
        {err("stages")}
      </label>
      <label className="space-y-1 text-sm font-medium">
        <span>Aim for</span>
        <select name="objective" defaultValue="sheets" className={input}>
          <option value="sheets">Fewest sheets</option>
          <option value="setups">Fewest fence and stop settings (at most one sheet more)</option>
        </select>
        {err("objective")}
      </label>
      <fieldset className="space-y-2 md:col-span-3">
        <legend className="text-sm font-medium">Racked offcuts the plan may use ({unit === "mm" ? "millimetres" : "inches"})</legend>
        {offcuts.length === 0 ? (
          <p className="text-sm text-muted">None of this material on the rack.</p>
        ) : (
          <div className="flex flex-wrap gap-3">
            {offcuts.map((o) => (
              <label key={o.id} className="flex min-h-11 items-center gap-2 rounded-md border border-line bg-white px-3 text-sm">
                <input type="checkbox" name="offcutIds" value={o.id} defaultChecked className="h-5 w-5 accent-edge" />
                {o.label}
              </label>
            ))}
          </div>
        )}
      </fieldset>
      <p className="text-sm text-muted md:col-span-3">Kerf and trim in millimetres; {formatLength(3200, "in")} is a full-kerf blade (3.2 mm).</p>
    </>
  );
}
