import * as v from "valibot";
import { useState } from "react";
import { data, Form, Link, redirect, useFetcher } from "react-router";
import type { Route } from "./+types/saw.$batchId";
import { requirePermission } from "~/auth.server";
import { BatchBadge } from "~/components/batch-badge";
import { FormAlert, SubmitButton } from "~/components/forms";
import { PageHeader } from "~/components/page-header";
import { SawCaution } from "~/components/saw-caution";
import { itemsOf, spoiledOrigins } from "~/lib/batch-parts";
import { parseForm } from "~/lib/forms";
import { can } from "~/lib/permissions";
import { stockName } from "~/lib/stock-names";
import { formatLength, formatSize, parseLength } from "~/lib/units";
import { getBatch } from "~/models/batches.server";
import { chosenPlan, closeBatchAsCut, expectedOffcuts, floorState, FloorStateError, reservedOffcuts, spoilPart, type RackDecision } from "~/models/floor.server";
import { batchCutList, LASER_BLANK_PART } from "~/models/plan-job.server";
import { getShop } from "~/models/shops.server";

const Uuid = v.pipe(v.string(), v.uuid());
const KIND = { breakdown: "Break down", rip: "Rip", crosscut: "Crosscut" } as const;

async function load(shopId: string, batchId: string) {
  const batch = v.is(Uuid, batchId) ? await getBatch(shopId, batchId) : null;
  const plan = batch ? await chosenPlan(shopId, batch.id) : null;
  if (!batch || !plan) throw data("No batch at this shop's saw with that id.", { status: 404 });
  const shop = await getShop(shopId);
  const cutList = await batchCutList(batch.id, shop);
  return { batch, plan, shop, cutList };
}

export async function loader(args: Route.LoaderArgs) {
  const user = requirePermission(args, "floor:read");
  const { batch, plan, shop, cutList } = await load(user.shopId, args.params.batchId);
  const unit = shop.displayUnit;
  const [state, made, pulled] = await Promise.all([floorState(batch.id), expectedOffcuts(batch.id), reservedOffcuts(batch.id)]);
  const { plan: packed, stockRefs } = plan.result;
  const sheets = new Map<string, number>();
  for (const sheet of packed.sheets) {
    if (stockRefs[sheet.stockId]?.kind === "panel") {
      const size = formatSize(Math.round(sheet.length * 1000), Math.round(sheet.width * 1000), unit);
      sheets.set(size, (sheets.get(size) ?? 0) + 1);
    }
  }
  const ticked = new Map(state.ticks.map((t) => [t.setupIndex, t.countCut]));
  return {
    batch,
    unit,
    pull: { sheets: [...sheets].map(([size, count]) => ({ size, count })), offcuts: pulled.map((o) => ({ size: formatSize(o.lengthUm, o.widthUm, unit), location: o.location })) },
    setups: packed.setups.map((s, i) => ({
      index: i,
      kind: KIND[s.kind],
      setting: formatLength(Math.round(s.setting * 1000), unit),
      count: s.count,
      outside: s.outsideStopRange ?? false,
      cut: ticked.get(i) ?? null,
    })),
    parts: [
      ...cutList.sawn.map((p) => ({
        key: p.key,
        label: `${p.name} ${formatSize(p.lengthUm, p.widthUm, unit)}`,
        items: itemsOf(p.origins).map(({ first, pieces, origin: o }) => ({ value: first, label: `${o.text ? `${o.text} · ` : ""}#${o.orderNumber} ${o.customerName}, item ${o.itemIndex + 1}${pieces > 1 ? ` (${pieces} pieces)` : ""}` })), // the text first: it is what is cut into the piece
      })),
      ...(cutList.blanks.length ? [{ key: LASER_BLANK_PART, label: `Laser blank ${formatSize(shop.laserBedLengthUm, shop.laserBedWidthUm, unit)}`, items: [] }] : []),
    ],
    recuts: state.recuts.map((r) => ({ ...r, size: formatSize(r.lengthUm, r.widthUm, unit) })),
    offcuts: made.map((o) => ({ id: o.id, status: o.status, length: formatLength(o.lengthUm, unit, { showRounding: false }).replace(/ (mm|in)$/, ""), width: formatLength(o.widthUm, unit, { showRounding: false }).replace(/ (mm|in)$/, ""), location: o.location })),
    canWrite: can(user.role, "floor:write") && batch.status === "released",
  };
}

const ActionSchema = v.variant("intent", [
  v.object({ intent: v.literal("spoil"), part: v.pipe(v.string("Choose the part."), v.nonEmpty("Choose the part.")), item: v.optional(v.pipe(v.string(), v.regex(/^\d*$/, "Which item: choose one of this part's items.")), ""), quantity: v.pipe(v.string(), v.transform(Number), v.integer("Quantity: a whole number."), v.minValue(1, "Quantity: 1 or more."), v.maxValue(500, "Quantity: at most 500.")), reason: v.pipe(v.string("Say what went wrong."), v.trim(), v.nonEmpty("Say what went wrong, e.g. tear-out or cut short."), v.maxLength(200, "Reason: at most 200 characters.")) }),
  v.object({ intent: v.literal("close") }),
], "Unknown action.");

export async function action(args: Route.ActionArgs) {
  const user = requirePermission(args, "floor:write");
  const { batch, plan, shop, cutList } = await load(user.shopId, args.params.batchId);
  const form = await args.request.formData();
  const parsed = parseForm(ActionSchema, form);
  if (!parsed.ok) return data({ errors: parsed.errors }, { status: 400 });
  const input = parsed.data;
  try {
    if (input.intent === "spoil") {
      const blank = input.part === LASER_BLANK_PART;
      const part = cutList.sawn.find((p) => p.key === input.part);
      if (!part && !blank) return data({ errors: { part: "Choose one of this batch's parts." } }, { status: 400 });
      const pick = spoiledOrigins(part?.origins ?? [], input.item === "" ? null : Number(input.item), input.quantity);
      if (!pick.ok) return data({ errors: { [pick.field]: pick.error } }, { status: 400 });
      const spec = part
        ? { partName: part.name, lengthUm: part.lengthUm, widthUm: part.widthUm, grainLocked: part.grainLocked, process: "saw" as const }
        : { partName: "Laser blank", lengthUm: shop.laserBedLengthUm, widthUm: shop.laserBedWidthUm, grainLocked: false, process: "saw" as const };
      await spoilPart(user.shopId, user.id, batch.id, spec, pick.origins, input.reason);
    } else {
      const decisions: RackDecision[] = [];
      const errors: Record<string, string> = {};
      for (const o of await expectedOffcuts(batch.id)) {
        if (o.status !== "expected") continue;
        const rack = form.get(`rack-${o.id}`) === "on";
        const length = parseLength(String(form.get(`length-${o.id}`) ?? ""), shop.displayUnit);
        const width = parseLength(String(form.get(`width-${o.id}`) ?? ""), shop.displayUnit);
        if (rack && !length.ok) errors[`length-${o.id}`] = `Length ${length.error}.`;
        if (rack && !width.ok) errors[`width-${o.id}`] = `Width ${width.error}.`;
        decisions.push({ offcutId: o.id, rack, lengthUm: length.ok ? length.um : o.lengthUm, widthUm: width.ok ? width.um : o.widthUm, location: String(form.get(`location-${o.id}`) ?? "").trim().slice(0, 80) });
      }
      if (Object.keys(errors).length) return data({ errors }, { status: 400 });
      await closeBatchAsCut(user.shopId, batch.id, decisions, plan.result.plan.setups.length);
    }
  } catch (error) {
    if (error instanceof FloorStateError) return data({ errors: { form: error.message } }, { status: 409 });
    throw error;
  }
  return redirect(`/saw/${batch.id}`);
}

export default function FloorView({ loaderData, actionData }: Route.ComponentProps) {
  const { batch, pull, setups, parts, recuts, offcuts, canWrite, unit } = loaderData;
  const errors: Record<string, string> = actionData?.errors ?? {};
  const done = setups.filter((s) => s.cut !== null).length;
  return (
    <div className="space-y-8">
      <div className="flex flex-wrap items-start justify-between gap-4">
        <PageHeader eyebrow={`At the saw · ${batch.materialName}`} title={batch.code}>
          {done} of {setups.length} set-ups done.
        </PageHeader>
        <BatchBadge status={batch.status} />
      </div>
      {errors.form && <FormAlert>{errors.form}</FormAlert>}
      <SawCaution />

      <section className="grid gap-4 md:grid-cols-2">
        <div className="rounded-lg border border-line bg-card p-4">
          <h2 className="font-semibold">Pull these</h2>
          <ul className="mt-2 space-y-1">
            {pull.sheets.map((s) => (
              <li key={s.size}>
                {s.count} × {stockName("panel", s.size)}
              </li>
            ))}
            {pull.offcuts.map((o, i) => (
              <li key={i}>
                Offcut {o.size}
                {o.location ? ` from ${o.location}` : ""}
              </li>
            ))}
          </ul>
        </div>
        <div className="flex flex-wrap items-start gap-2 rounded-lg border border-line bg-card p-4">
          <h2 className="w-full font-semibold">Print</h2>
          <a href={`/batches/${batch.id}/setup-sheet?paper=a4`} className="inline-flex min-h-12 items-center rounded-md border border-line bg-white px-4 font-medium hover:border-edge">
            Set-up sheet (A4)
          </a>
          <a href={`/batches/${batch.id}/setup-sheet?paper=letter`} className="inline-flex min-h-12 items-center rounded-md border border-line bg-white px-4 font-medium hover:border-edge">
            Set-up sheet (Letter)
          </a>
          <a href={`/batches/${batch.id}/labels`} className="inline-flex min-h-12 items-center rounded-md border border-line bg-white px-4 font-medium hover:border-edge">
            Part labels
          </a>
        </div>
      </section>

      <section className="space-y-3">
        <h2 className="text-xl font-semibold">Set-ups in cutting order</h2>
        <ol className="space-y-3">
          {setups.map((s) => (
            <SetupRow key={s.index} setup={s} batchId={batch.id} canWrite={canWrite} />
          ))}
        </ol>
      </section>

      <section className="space-y-3">
        <h2 className="text-xl font-semibold">Spoiled parts</h2>
        {recuts.length > 0 && (
          <ul className="space-y-1">
            {recuts.map((r) => (
              <li key={r.id}>
                {r.partName} {r.size}
                {r.orderNumber ? ` for #${r.orderNumber}` : ""}
                {r.text ? ` (${r.text})` : ""}: {r.reason} <span className="text-sm text-muted">· goes into the next batch</span>
              </li>
            ))}
          </ul>
        )}
        {recuts.length === 0 && !canWrite && <p className="text-muted">{batch.status === "released" ? "No part reported spoiled yet." : "No part was reported spoiled in this batch."}</p>}
        {canWrite && <SpoilForm parts={parts} errors={errors} />}
      </section>

      <section className="space-y-3">
        <h2 className="text-xl font-semibold">Offcuts made</h2>
        {offcuts.length === 0 && <p className="text-muted">This plan leaves no offcut worth racking.</p>}
        <Form method="post" className="space-y-3" noValidate>
          <input type="hidden" name="intent" value="close" />
          <ul className="space-y-3">
            {offcuts.map((o) => (
              // On a phone: the tick on its own row, length and width side by side, the place below them.
              <li key={o.id} className="grid grid-cols-2 items-end gap-3 rounded-lg border border-line bg-card p-4 sm:flex sm:flex-wrap [&>label:first-child]:col-span-2 [&>label:last-child]:col-span-2 [&>span]:col-span-2" data-offcut={o.id}>
                {o.status === "expected" && canWrite ? (
                  <>
                    <label className="flex min-h-12 items-center gap-2 font-medium">
                      <input type="checkbox" name={`rack-${o.id}`} defaultChecked className="h-6 w-6 accent-edge" />
                      Rack it
                    </label>
                    <MeasureField label={`Length (${unit})`} name={`length-${o.id}`} value={o.length} error={errors[`length-${o.id}`]} />
                    <MeasureField label={`Width (${unit})`} name={`width-${o.id}`} value={o.width} error={errors[`width-${o.id}`]} />
                    <MeasureField label="Where it goes" name={`location-${o.id}`} value={o.location} placeholder="Rack A, slot 4" />
                  </>
                ) : (
                  <span>
                    {o.length} × {o.width} {unit} · {o.status === "racked" ? `on the rack${o.location ? ` at ${o.location}` : ""}` : o.status === "discarded" ? "not kept" : "expected"}
                  </span>
                )}
              </li>
            ))}
          </ul>
          {canWrite && (
            <SubmitButton className="min-h-14 px-8 text-lg" pendingText="Closing…">
              Close the batch as cut
            </SubmitButton>
          )}
        </Form>
      </section>
      <Link to="/saw" className="text-edge underline">
        ← All batches at the saw
      </Link>
    </div>
  );
}

function MeasureField({ label, name, value, error, placeholder }: { label: string; name: string; value: string; error?: string; placeholder?: string }) {
  return (
    <label className="space-y-1 text-sm font-medium">
      <span className="block">{label}</span>
      <input name={name} defaultValue={value} placeholder={placeholder} className={`block min-h-12 w-full rounded-md sm:w-40 border bg-white px-3 text-base ${error ? "border-bad" : "border-line"}`} aria-invalid={error ? true : undefined} />
      {error && <span className="block text-bad">{error}</span>}
    </label>
  );
}

type SetupView = Awaited<ReturnType<typeof loader>>["setups"][number];

/** One set-up: big enough to hit with a gloved thumb; the tick goes to the API and survives a reload. */
function SetupRow({ setup, batchId, canWrite }: { setup: SetupView; batchId: string; canWrite: boolean }) {
  const fetcher = useFetcher<{ error?: string }>();
  const pending = fetcher.state !== "idle";
  const ticked = setup.cut !== null;
  return (
    <li className={`flex flex-wrap items-center gap-4 rounded-lg border p-4 ${ticked ? "border-ok/40 bg-ok-soft" : "border-line bg-card"}`} data-setup={setup.index} data-ticked={ticked}>
      <span className="text-2xl font-semibold tabular-nums">{setup.index + 1}</span>
      <span className="min-w-48 grow">
        <span className="block text-lg font-semibold">
          {setup.kind} at {setup.setting}
        </span>
        <span className="text-muted">
          {setup.count} cut{setup.count === 1 ? "" : "s"} planned{ticked ? ` · ${setup.cut} done` : ""}
        </span>
        {setup.outside && <span className="block font-medium text-bad">Outside the stop block's range: cut to a marked line, or break down on another tool.</span>}
      </span>
      {canWrite && (
        <fetcher.Form method="post" action={`/api/batches/${batchId}/floor`} className="flex items-end gap-2">
          <input type="hidden" name="setupIndex" value={setup.index} />
          {ticked ? (
            <>
              <input type="hidden" name="untick" value="1" />
              <button type="submit" disabled={pending} className="min-h-14 rounded-md border border-line bg-white px-5 text-lg font-medium">
                Undo
              </button>
            </>
          ) : (
            <>
              <label className="text-sm font-medium">
                <span className="block">Cut</span>
                <input name="countCut" inputMode="numeric" defaultValue={setup.count} className="block min-h-14 w-20 rounded-md border border-line bg-white px-3 text-lg" aria-label={`Pieces cut at set-up ${setup.index + 1}`} />
              </label>
              <button type="submit" disabled={pending} className="min-h-14 rounded-md bg-edge px-6 text-lg font-semibold text-white hover:bg-edge-dark">
                Done
              </button>
            </>
          )}
        </fetcher.Form>
      )}
      {fetcher.data?.error && <p className="w-full text-bad">{fetcher.data.error}</p>}
    </li>
  );
}

function SpoilForm({ parts, errors }: { parts: Awaited<ReturnType<typeof loader>>["parts"]; errors: Record<string, string> }) {
  // Personalised pieces differ: the sawyer says whose card was spoiled, so its recut carries the right text.
  const [partKey, setPartKey] = useState("");
  const items = parts.find((p) => p.key === partKey)?.items ?? [];
  return (
    <Form method="post" className="grid gap-3 rounded-lg border border-line bg-card p-4 md:grid-cols-4" noValidate>
      <input type="hidden" name="intent" value="spoil" />
      <label className="space-y-1 text-sm font-medium md:col-span-2">
        <span className="block">Part</span>
        <select name="part" className="block min-h-12 w-full rounded-md border border-line bg-white px-3 text-base" value={partKey} onChange={(e) => setPartKey(e.target.value)}>
          <option value="">Choose…</option>
          {parts.map((p) => (
            <option key={p.key} value={p.key}>
              {p.label}
            </option>
          ))}
        </select>
        {errors.part && <span className="block text-bad">{errors.part}</span>}
      </label>
      <label className="space-y-1 text-sm font-medium md:col-span-2">
        <span className="block">Which item</span>
        <select name="item" key={partKey} disabled={items.length < 2} className="block min-h-12 w-full rounded-md border border-line bg-white px-3 text-base disabled:text-muted" defaultValue="">
          <option value="">{items.length === 1 ? items[0].label : "Not sure: the first ones"}</option>
          {items.length > 1 &&
            items.map((item) => (
              <option key={item.value} value={item.value}>
                {item.label}
              </option>
            ))}
        </select>
        {errors.item && <span className="block text-bad">{errors.item}</span>}
      </label>
      <label className="space-y-1 text-sm font-medium">
        <span className="block">How many</span>
        <input name="quantity" inputMode="numeric" defaultValue="1" className="block min-h-12 w-full rounded-md border border-line bg-white px-3 text-base" />
        {errors.quantity && <span className="block text-bad">{errors.quantity}</span>}
      </label>
      <label className="space-y-1 text-sm font-medium md:col-span-2">
        <span className="block">What went wrong</span>
        <input name="reason" placeholder="tear-out, cut short…" className="block min-h-12 w-full rounded-md border border-line bg-white px-3 text-base" />
        {errors.reason && <span className="block text-bad">{errors.reason}</span>}
      </label>
      <SubmitButton className="min-h-12 md:w-fit md:self-end">Record and cut again later</SubmitButton>
    </Form>
  );
}
