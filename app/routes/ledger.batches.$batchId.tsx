import * as v from "valibot";
import { data, Link } from "react-router";
import type { Route } from "./+types/ledger.batches.$batchId";
import { requirePermission } from "~/auth.server";
import { PageHeader } from "~/components/page-header";
import { batchCode } from "~/lib/batches";
import { formatDate } from "~/lib/dates";
import { formatArea } from "~/lib/ledger";
import { formatMoney } from "~/lib/money";
import { formatSize } from "~/lib/units";
import { batchCostDetail } from "~/models/ledger.server";
import { getShop } from "~/models/shops.server";

export async function loader(args: Route.LoaderArgs) {
  const user = requirePermission(args, "ledger:read");
  const row = v.is(v.pipe(v.string(), v.uuid()), args.params.batchId) ? await batchCostDetail(user.shopId, args.params.batchId) : null;
  if (!row) throw data("No cut batch with that id in this shop's books.", { status: 404 });
  const shop = await getShop(user.shopId);
  return { row: { ...row, cutAt: row.cutAt.toISOString() }, currency: shop.currency, unit: shop.displayUnit };
}

export default function LedgerBatch({ loaderData }: Route.ComponentProps) {
  const { row, currency, unit } = loaderData;
  const money = (m: number) => formatMoney(m, currency);
  const area = (a: number) => formatArea(a, unit);
  const month = row.cutAt.slice(0, 7);
  const figures: [string, string][] = [
    ["Stock drawn", row.offcutDrawnAreaMm2 ? `${area(row.stockAreaMm2)}, of which racked offcuts ${area(row.offcutDrawnAreaMm2)}` : area(row.stockAreaMm2)],
    ["Parts", area(row.partsAreaMm2)],
    ["Yield", `${((row.partsAreaMm2 / Math.max(1, row.stockAreaMm2)) * 100).toFixed(1)} %`],
    ["Kerf loss", area(row.kerfLossMm2)],
    ["Offcuts racked", area(row.rackedAreaMm2)],
    ["Scrap", area(row.scrapAreaMm2)],
    ["Cost of the stock drawn", money(row.costDrawnMinor)],
    ["Value returned to the rack", money(row.valueReturnedMinor)],
    ["Net material cost", money(row.costDrawnMinor - row.valueReturnedMinor)],
    ["Cost of scrap and kerf", money(row.scrapCostMinor)],
    ["Spoiled parts, cut again", row.spoiledCount ? `${row.spoiledCount} (${area(row.spoiledAreaMm2)}, ${money(row.spoiledCostMinor)})` : "none"],
  ];
  return (
    <div className="space-y-8">
      <PageHeader eyebrow={`Ledger · ${row.materialName}`} title={batchCode(row.batchNumber)}>
        Cut {formatDate(row.cutAt.slice(0, 10))}.
      </PageHeader>
      <dl className="grid gap-x-8 gap-y-2 rounded-lg border border-line bg-card p-5 sm:grid-cols-2">
        {figures.map(([k, val]) => (
          <div key={k} className="flex justify-between gap-4 border-b border-line/60 py-1">
            <dt className="text-muted">{k}</dt>
            <dd className="text-right font-medium tabular-nums">{val}</dd>
          </div>
        ))}
      </dl>
      <section className="space-y-3">
        <h2 className="text-xl font-semibold">Panels</h2>
        <ul className="divide-y divide-line rounded-lg border border-line bg-card">
          {row.panels.map((p, i) => (
            <li key={i} className="flex flex-wrap justify-between gap-3 px-4 py-2">
              <span>
                {p.kind === "offcut" ? "Racked offcut" : "Stock panel"} {formatSize(p.lengthUm, p.widthUm, unit)}
              </span>
              <span className="tabular-nums text-muted">parts {area(p.partsAreaMm2)}</span>
              <span className="tabular-nums">{money(p.costMinor)}</span>
            </li>
          ))}
        </ul>
      </section>
      <section className="space-y-3">
        <h2 className="text-xl font-semibold">Material cost per order</h2>
        <ul className="divide-y divide-line rounded-lg border border-line bg-card">
          {row.allocations.map((a) => (
            <li key={a.orderId} className="flex flex-wrap justify-between gap-3 px-4 py-2">
              <Link to={`/orders/${a.orderId}`} className="font-semibold text-edge hover:underline">
                #{a.orderNumber}
              </Link>
              <span className="tabular-nums text-muted">parts {area(a.partsAreaMm2)}</span>
              <span className="tabular-nums font-medium">{money(a.costMinor)}</span>
            </li>
          ))}
        </ul>
      </section>
      <Link to={`/ledger?month=${month}`} className="text-edge underline">
        ← {month}
      </Link>
    </div>
  );
}
