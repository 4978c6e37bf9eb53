import { Form, Link, useSearchParams } from "react-router";
import type { Route } from "./+types/ledger.deposits";
import { requirePermission } from "~/auth.server";
import { MonthChoice } from "~/components/month-choice";
import { PageHeader } from "~/components/page-header";
import { ScrollRegion } from "~/components/scroll-region";
import { monthTitle } from "~/lib/dates";
import { DEPOSIT_STATUS_LABELS } from "~/lib/deposits";
import { periodTitle } from "~/lib/ledger-report";
import { formatMoney } from "~/lib/money";
import { depositLedger } from "~/models/deposit-ledger.server";
import { getShop } from "~/models/shops.server";

export async function loader(args: Route.LoaderArgs) {
  const user = requirePermission(args, "deposits:read");
  const [ledger, shop] = await Promise.all([depositLedger(user.shopId, new URL(args.request.url).searchParams), getShop(user.shopId)]);
  return { ...ledger, currency: shop.currency };
}

export default function DepositLedger({ loaderData }: Route.ComponentProps) {
  const { period, orders, totals, months, currency } = loaderData;
  const [params] = useSearchParams();
  const money = (minor: number) => formatMoney(minor, currency);
  const month = period.month ?? "";
  const heads = ["Order total", "Deposit asked", "Paid", "Refunded", "Balance after deposit"];
  return (
    <div className="space-y-8">
      <PageHeader eyebrow="Bookkeeper" title="Deposits">
        What customers paid towards their orders through the payment service, what went back to them, and what each order still owes.
      </PageHeader>
      <Form method="get" className="flex flex-wrap items-end gap-3">
        <MonthChoice month={month} />
        <Link to="/ledger" className="min-h-11 content-center text-sm text-edge underline">
          Material ledger
        </Link>
        <a href={`/ledger/deposits.csv?${params}`} download className="ml-auto inline-flex min-h-11 items-center rounded-md bg-edge px-4 font-semibold text-white hover:bg-edge-dark">
          Download CSV
        </a>
      </Form>

      <section className="space-y-3">
        <h2 id="deposit-orders" className="text-xl font-semibold">{periodTitle(period)}: orders with deposits</h2>
        <p className="text-sm text-muted">
          Received {money(totals.receivedInPeriodMinor)} · refunded {money(totals.refundedInPeriodMinor)} in this period. Paid and refunded count each order to date; the balance after deposit is what the order total leaves to collect.
        </p>
        <ScrollRegion labelledBy="deposit-orders">
          <table className="w-full min-w-[46rem] text-left text-sm" data-testid="deposit-orders">
            <thead className="border-b border-line text-xs uppercase tracking-wider text-muted">
              <tr>
                <th className="px-3 py-3">Order</th>
                <th className="px-3 py-3">Status</th>
                {heads.map((h) => (
                  <th key={h} className="px-3 py-3 text-right">
                    {h}
                  </th>
                ))}
              </tr>
            </thead>
            <tbody className="divide-y divide-line">
              {orders.map((o) => (
                <tr key={o.orderId}>
                  <th className="px-3 py-2 font-medium">
                    <Link to={`/orders/${o.orderId}`} className="text-edge underline decoration-edge/40 underline-offset-2 hover:decoration-edge">
                      #{o.orderNumber}
                    </Link>{" "}
                    <span className="font-normal">{o.customerName}</span>
                  </th>
                  <td className="whitespace-nowrap px-3 py-2">{DEPOSIT_STATUS_LABELS[o.status]}</td>
                  {[o.orderTotalMinor, o.askedMinor, o.paidMinor, o.refundedMinor, o.balanceMinor].map((m, i) => (
                    <td key={i} className="whitespace-nowrap px-3 py-2 text-right tabular-nums">
                      {money(m)}
                    </td>
                  ))}
                </tr>
              ))}
              {orders.length === 0 && (
                <tr>
                  <td colSpan={7} className="px-3 py-6 text-center text-muted">
                    No deposit was asked or paid in this period.
                  </td>
                </tr>
              )}
            </tbody>
          </table>
        </ScrollRegion>
      </section>

      <section className="space-y-3">
        <h2 id="deposit-months" className="text-xl font-semibold">By month, last twelve months</h2>
        <ScrollRegion labelledBy="deposit-months">
          <table className="w-full text-left text-sm" data-testid="deposit-months">
            <thead className="border-b border-line text-xs uppercase tracking-wider text-muted">
              <tr>
                <th className="px-3 py-3">Month</th>
                <th className="px-3 py-3 text-right">Received</th>
                <th className="px-3 py-3 text-right">Refunded</th>
                <th className="px-3 py-3 text-right">Net</th>
              </tr>
            </thead>
            <tbody className="divide-y divide-line">
              {months.map((m) => (
                <tr key={m.month} className={m.receivedMinor || m.refundedMinor ? "" : "text-muted"}>
                  <th className="px-3 py-2 font-medium">
                    <Link to={`?month=${m.month}`} className="hover:underline">
                      {monthTitle(m.month, "short")}
                    </Link>
                  </th>
                  <td className="px-3 py-2 text-right tabular-nums">{money(m.receivedMinor)}</td>
                  <td className="px-3 py-2 text-right tabular-nums">{money(m.refundedMinor)}</td>
                  <td className="px-3 py-2 text-right font-semibold tabular-nums">{money(m.netMinor)}</td>
                </tr>
              ))}
            </tbody>
          </table>
        </ScrollRegion>
      </section>
    </div>
  );
}
