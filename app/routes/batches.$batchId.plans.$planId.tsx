import * as v from "valibot";
import { data, Link } from "react-router";
import type { Route } from "./+types/batches.$batchId.plans.$planId";
import { requirePermission } from "~/auth.server";
import { PageHeader } from "~/components/page-header";
import { PanelDrawing, SetupList, type PartLabel } from "~/components/panel-drawing";
import { mmToUm } from "~/lib/packing";
import { can } from "~/lib/permissions";
import { stockDrawn, stockName } from "~/lib/stock-names";
import { formatSize } from "~/lib/units";
import { getBatch } from "~/models/batches.server";
import { batchCutList, LASER_BLANK_PART } from "~/models/plan-job.server";
import { getPlan } from "~/models/plans.server";
import { getShop } from "~/models/shops.server";

const Uuid = v.pipe(v.string(), v.uuid());

export async function loader(args: Route.LoaderArgs) {
  const user = requirePermission(args, "batches:read");
  const { batchId, planId } = args.params;
  const batch = v.is(Uuid, batchId) ? await getBatch(user.shopId, batchId) : null;
  const plan = batch && v.is(Uuid, planId) ? await getPlan(user.shopId, batch.id, planId) : null;
  if (!batch || !plan) throw data("No such plan in this shop.", { status: 404 });
  if (plan.status !== "done" || !plan.result) throw data("This plan has no panels yet.", { status: 404 });
  const shop = await getShop(user.shopId);
  const cutList = await batchCutList(batch.id, shop);
  const unit = shop.displayUnit;
  const labels: Record<string, PartLabel> = {};
  for (const p of cutList.sawn) {
    labels[p.key] = { name: p.name, size: formatSize(p.lengthUm, p.widthUm, unit), origins: p.origins.map((o) => `#${o.orderNumber} ${o.customerName}${o.text ? ` · ${o.text}` : ""}`) };
  }
  labels[LASER_BLANK_PART] = { name: "Laser blank", size: formatSize(shop.laserBedLengthUm, shop.laserBedWidthUm, unit), origins: [`${cutList.laser.reduce((n, p) => n + p.quantity, 0)} laser-cut items on ${cutList.blanks.length} blanks`] };
  const { plan: packed, stockRefs } = plan.result;
  const sheets = packed.sheets.map((sheet, i) => {
    const ref = stockRefs[sheet.stockId];
    const size = formatSize(mmToUm(sheet.length), mmToUm(sheet.width), unit);
    return { sheet, offcut: ref?.kind === "offcut", title: `Panel ${i + 1} of ${packed.sheets.length}: ${stockName(ref?.kind, size)}` };
  });
  const offcutsUsed = sheets.filter((s) => s.offcut).length;
  return { batch, number: plan.number, sheets, stock: stockDrawn(plan.sheetSizes ?? [], offcutsUsed, unit), labels, setups: packed.setups, kerf: plan.settings.kerfMm, unit, unplaced: packed.unplaced, metrics: packed.metrics, ripMaxMm: shop.ripMaxUm / 1000, printable: batch.chosenPlanId === plan.id && batch.status !== "open" && batch.status !== "planned" && can(user.role, "floor:read") };
}

export default function PlanView({ loaderData }: Route.ComponentProps) {
  const { batch, number, sheets, stock, labels, setups, kerf, unit, unplaced, metrics, ripMaxMm, printable } = loaderData;
  return (
    <div className="space-y-6">
      <PageHeader eyebrow={`${batch.code} · ${batch.materialName}`} title={`Plan ${number}`}>
        {stock} · yield {(metrics.yield * 100).toFixed(1)} % · {metrics.setups} fence and stop settings · kerf {kerf} mm. Tap a part to see its orders.
      </PageHeader>
      {printable && (
        <p className="flex flex-wrap gap-3">
          {/* Released to the saw: the sheet and labels print from here (A4 or US Letter). */}
          {[
            ["setup-sheet", "Set-up sheet"],
            ["labels", "Part labels"],
          ].map(([path, name]) =>
            (["a4", "letter"] as const).map((paper) => (
              <a key={path + paper} href={`/batches/${batch.id}/${path}?paper=${paper}`} className="inline-flex min-h-11 items-center rounded-md border border-line bg-white px-4 font-medium hover:border-edge">
                {name} ({paper === "a4" ? "A4" : "Letter"}, PDF)
              </a>
            )),
          )}
        </p>
      )}
      {unplaced.length > 0 && (
        <p className="rounded-md border border-warn/40 bg-warn-soft p-3 text-sm text-warn">
          Not placed: {unplaced.map((u) => `${u.quantity} × ${labels[u.partId]?.name ?? u.partId} (${u.reason})`).join("; ")}
        </p>
      )}
      <div className="grid gap-6 xl:grid-cols-[1fr_20rem]">
        <div className="space-y-6">
          {sheets.map(({ sheet, title }, i) => (
            <section key={i} className="rounded-lg border border-line bg-card p-3" aria-label={title}>
              <h2 className="mb-2 font-semibold">{title}</h2>
              <PanelDrawing sheet={sheet} labels={labels} kerfMm={kerf} title={title} />
            </section>
          ))}
        </div>
        <aside className="space-y-3 xl:sticky xl:top-6 xl:self-start">
          <h2 className="text-xl font-semibold">Set-ups in cutting order</h2>
          <SetupList setups={setups} unit={unit} ripMaxMm={ripMaxMm} />
        </aside>
      </div>
      <Link to={`/batches/${batch.id}`} className="text-edge underline">
        ← {batch.code}
      </Link>
    </div>
  );
}
