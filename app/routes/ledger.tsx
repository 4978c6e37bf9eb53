import { Form, Link, useSearchParams } from "react-router";
import useSWR from "swr";
import type { Route } from "./+types/ledger";
import { requirePermission } from "~/auth.server";
import { LedgerChart } from "~/components/ledger-chart";
import { MonthChoice } from "~/components/month-choice";
import { PageHeader } from "~/components/page-header";
import { ScrollRegion } from "~/components/scroll-region";
import { formatDate } from "~/lib/dates";
import { formatArea } from "~/lib/ledger";
import { periodTitle, yieldOf, type Figures } from "~/lib/ledger-report";
import { formatMoney } from "~/lib/money";
import { ledgerReport } from "~/models/ledger-report.server";
import { getShop } from "~/models/shops.server";
import { timed } from "~/timing.server";

export async function loader(args: Route.LoaderArgs) {
  const user = requirePermission(args, "ledger:read");
  const [report, shop] = await timed("queries", () => Promise.all([ledgerReport(user.shopId, new URL(args.request.url).searchParams), getShop(user.shopId)]));
  return { report, currency: shop.currency, unit: shop.displayUnit };
}

type Report = Awaited<ReturnType<typeof loader>>["report"];
const fetchReport = async (url: string): Promise<Report> => {
  const res = await fetch(url, { headers: { Accept: "application/json" } });
  if (!res.ok) throw new Error(`The ledger could not be loaded (${res.status}).`);
  return res.json();
};

export default function Ledger({ loaderData }: Route.ComponentProps) {
  const [params] = useSearchParams();
  const { currency, unit } = loaderData;
  const { data } = useSWR(`/api/ledger?${params}`, fetchReport, { fallbackData: loaderData.report, revalidateOnMount: false });
  const report = data ?? loaderData.report;
  const { summary, batches, period, trend } = report;
  const money = (minor: number) => formatMoney(minor, currency);
  // Areas add up the batches' rows as the CSV prints them (lib/ledger.ts, one rounding rule), so every
  // figure here is the sum of the CSV's cells; money is exact in minor units anyway.
  const area = (rows: typeof batches, ...fields: ("stockAreaMm2" | "partsAreaMm2" | "rackedAreaMm2" | "scrapAreaMm2" | "kerfLossMm2")[]) =>
    formatArea(rows.flatMap((r) => fields.map((field) => r[field])), unit);
  const cells = (f: Figures, rows: typeof batches) => [
    f.batches,
    area(rows, "stockAreaMm2"),
    area(rows, "partsAreaMm2"),
    `${(yieldOf(f) * 100).toFixed(1)} %`,
    area(rows, "rackedAreaMm2"),
    area(rows, "scrapAreaMm2", "kerfLossMm2"),
    money(f.costDrawnMinor),
    money(f.valueReturnedMinor),
    money(f.costDrawnMinor - f.valueReturnedMinor),
    money(f.scrapCostMinor),
    f.spoiledCount ? `${f.spoiledCount} · ${money(f.spoiledCostMinor)}` : "—",
  ];
  const heads = ["Batches", "Stock drawn", "Parts", "Yield", "Offcuts racked", "Scrap and kerf", "Stock cost", "Returned to rack", "Net material", "Scrap cost", "Spoiled (recut)"];
  const month = period.month ?? "";
  return (
    <div className="space-y-8">
      <PageHeader eyebrow="Bookkeeper" title="Ledger">
        What the batches cut in a period drew from stock, what became parts, offcuts and scrap, and what it cost.
      </PageHeader>
      <Form method="get" className="flex flex-wrap items-end gap-3">
        <MonthChoice month={month} />
        <span className="text-sm text-muted">or a range:</span>
        <input type="date" name="from" aria-label="From" defaultValue={params.get("from") ?? ""} className="min-h-11 rounded-md border border-line bg-white px-3" />
        <input type="date" name="to" aria-label="To" defaultValue={params.get("to") ?? ""} className="min-h-11 rounded-md border border-line bg-white px-3" />
        <a href={`/ledger.csv?${params}`} download className="ml-auto inline-flex min-h-11 items-center rounded-md bg-edge px-4 font-semibold text-white hover:bg-edge-dark">
          Download CSV
        </a>
      </Form>

      <section className="space-y-3">
        <h2 id="per-material" className="text-xl font-semibold">{periodTitle(period)}: per material</h2>
        <ScrollRegion labelledBy="per-material">
          <table className="w-full min-w-[64rem] text-left text-sm" data-testid="ledger-summary">
            <thead className="border-b border-line text-xs uppercase tracking-wider text-muted">
              <tr>
                <th className="px-3 py-3">Material</th>
                {heads.map((h) => (
                  <th key={h} className="px-3 py-3 text-right">
                    {h}
                  </th>
                ))}
              </tr>
            </thead>
            <tbody className="divide-y divide-line">
              {summary.materials.map((m) => (
                <tr key={m.materialId}>
                  <th className="px-3 py-2 font-medium">{m.materialName}</th>
                  {cells(m, batches.filter((b) => b.materialId === m.materialId)).map((c, i) => (
                    <td key={i} className="whitespace-nowrap px-3 py-2 text-right tabular-nums">
                      {c}
                    </td>
                  ))}
                </tr>
              ))}
              {summary.materials.length === 0 && (
                <tr>
                  <td colSpan={12} className="px-3 py-6 text-center text-muted">
                    No batch was cut in this period.
                  </td>
                </tr>
              )}
            </tbody>
            <tfoot className="border-t-2 border-ink/30 font-semibold">
              <tr>
                <th className="px-3 py-2">Total</th>
                {cells(summary.total, batches).map((c, i) => (
                  <td key={i} className="whitespace-nowrap px-3 py-2 text-right tabular-nums">
                    {c}
                  </td>
                ))}
              </tr>
            </tfoot>
          </table>
        </ScrollRegion>
      </section>

      <section className="space-y-3">
        <h2 className="text-xl font-semibold">Batches cut</h2>
        <ul className="divide-y divide-line rounded-lg border border-line bg-card">
          {batches.map((b) => (
            // two groups, so a narrow screen wraps every row the same way: the batch, then its figures
            <li key={b.batchId} className="flex flex-wrap items-baseline justify-between gap-x-4 gap-y-1 px-4 py-3">
              <span className="flex items-baseline gap-3">
                <Link to={`/ledger/batches/${b.batchId}`} className="font-semibold text-edge hover:underline">
                  {b.batchCode}
                </Link>
                <span>{b.materialName}</span>
              </span>
              <span className="flex flex-wrap items-baseline gap-x-4 gap-y-1">
                <span className="text-sm text-muted">cut {formatDate(b.cutDay)}</span>
                <span className="tabular-nums">yield {(yieldOf(b) * 100).toFixed(1)} %</span>
                <span className="tabular-nums">scrap {money(b.scrapCostMinor)}</span>
              </span>
            </li>
          ))}
          {batches.length === 0 && <li className="px-4 py-3 text-muted">None.</li>}
        </ul>
      </section>

      <section className="space-y-3">
        <h2 className="text-xl font-semibold">Yield and scrap cost, last twelve months</h2>
        <LedgerChart trend={trend} currency={currency} />
      </section>
      <p className="text-sm text-muted">
        Full sheets count at their price, racked offcuts at the material's cheapest price per area; offcuts returned to the rack are credited at the same rate. Scrap cost is the net material cost's share of scrap and kerf by area. An order's material cost is its share by the area of its parts.
      </p>
    </div>
  );
}
