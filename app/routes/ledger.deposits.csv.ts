import type { Route } from "./+types/ledger.deposits.csv";
import { requirePermission } from "~/auth.server";
import { depositLedgerCsv } from "~/lib/deposit-ledger";
import { depositLedger } from "~/models/deposit-ledger.server";
import { getShop } from "~/models/shops.server";

// The deposits page's per-order rows as CSV, the period and currency on the first line.
export async function loader(args: Route.LoaderArgs) {
  const user = requirePermission(args, "deposits:read");
  const [ledger, shop] = await Promise.all([depositLedger(user.shopId, new URL(args.request.url).searchParams), getShop(user.shopId)]);
  return new Response(depositLedgerCsv(ledger.orders, ledger.period, shop.currency), {
    headers: {
      "Content-Type": "text/csv; charset=utf-8",
      "Content-Disposition": `attachment; filename="stopwise-deposits-${ledger.period.label.replace(/ /g, "_")}.csv"`,
      "Cache-Control": "no-store",
    },
  });
}
