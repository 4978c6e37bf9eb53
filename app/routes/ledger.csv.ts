import type { Route } from "./+types/ledger.csv";
import { requirePermission } from "~/auth.server";
import { ledgerCsv } from "~/lib/ledger-report";
import { CURRENCIES, isCurrency } from "~/lib/money";
import { ledgerReport } from "~/models/ledger-report.server";
import { getShop } from "~/models/shops.server";

// The same rows as the page, as CSV (RFC 4180 quoting by papaparse), currency and unit in the header.
export async function loader(args: Route.LoaderArgs) {
  const user = requirePermission(args, "ledger:read");
  const [report, shop] = await Promise.all([ledgerReport(user.shopId, new URL(args.request.url).searchParams), getShop(user.shopId)]);
  const digits = isCurrency(shop.currency) ? CURRENCIES[shop.currency] : 2;
  return new Response(ledgerCsv(report.batches, report.period, shop.currency, shop.displayUnit, digits), {
    headers: {
      "Content-Type": "text/csv; charset=utf-8",
      "Content-Disposition": `attachment; filename="stopwise-ledger-${report.period.label.replace(/ /g, "_")}.csv"`,
      "Cache-Control": "no-store",
    },
  });
}
