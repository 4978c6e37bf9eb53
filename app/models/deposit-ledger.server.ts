import { and, eq, gte, inArray, lt, or, sql } from "drizzle-orm";
import { customers, depositMoves, deposits, orders } from "../../db/schema";
import { getDb } from "~/db.server";
import { todayIso } from "~/lib/dates";
import { depositMonths, depositOrderRows, totalsOf } from "~/lib/deposit-ledger";
import { parsePeriod } from "~/lib/ledger-report";
import { orderTotal } from "./deposits.server";


/** Everything the deposits ledger page and its CSV show for a period (default: this month). */
export async function depositLedger(shopId: string, params: URLSearchParams) {
  const db = getDb();
  const today = todayIso();
  const period = parsePeriod(params, today, "current");
  const from = new Date(`${period.from}T00:00:00Z`);
  const to = new Date(`${period.to}T00:00:00Z`);
  const movedInPeriod = db
    .select({ id: depositMoves.depositId })
    .from(depositMoves)
    .where(and(eq(depositMoves.shopId, shopId), gte(depositMoves.occurredAt, from), lt(depositMoves.occurredAt, to)));
  // The orders touched in the period, then all their deposits and moves (paid to date needs them all).
  const touched = db
    .select({ orderId: deposits.orderId })
    .from(deposits)
    .where(and(eq(deposits.shopId, shopId), or(and(gte(deposits.requestedAt, from), lt(deposits.requestedAt, to)), inArray(deposits.id, movedInPeriod))));
  const rows = await db
    .select({
      depositId: deposits.id,
      orderId: orders.id,
      orderNumber: orders.number,
      customerName: customers.name,
      orderTotalMinor: orderTotal(orders.id),
      amountMinor: deposits.amountMinor,
      status: deposits.status,
      requestedAt: deposits.requestedAt,
    })
    .from(deposits)
    .innerJoin(orders, eq(orders.id, deposits.orderId))
    .innerJoin(customers, eq(customers.id, orders.customerId))
    .where(and(eq(deposits.shopId, shopId), inArray(deposits.orderId, touched)));
  const moves = rows.length
    ? await db
        .select({ depositId: depositMoves.depositId, kind: depositMoves.kind, amountMinor: depositMoves.amountMinor, occurredAt: depositMoves.occurredAt })
        .from(depositMoves)
        .where(and(eq(depositMoves.shopId, shopId), inArray(depositMoves.depositId, rows.map((r) => r.depositId))))
    : [];
  const month = sql<string>`to_char(${depositMoves.occurredAt} at time zone 'UTC', 'YYYY-MM')`;
  const sums = await db
    .select({ month, kind: depositMoves.kind, amountMinor: sql<number>`sum(${depositMoves.amountMinor})::bigint` })
    .from(depositMoves)
    .where(and(eq(depositMoves.shopId, shopId), gte(depositMoves.occurredAt, new Date(Date.UTC(+today.slice(0, 4), +today.slice(5, 7) - 12, 1)))))
    .groupBy(month, depositMoves.kind);
  const orderRows = depositOrderRows(
    rows.map((r) => ({ ...r, orderTotalMinor: Number(r.orderTotalMinor), requestedAt: r.requestedAt.toISOString() })),
    moves.map((m) => ({ ...m, occurredAt: m.occurredAt.toISOString() })),
    period,
  );
  return {
    period,
    orders: orderRows,
    totals: totalsOf(orderRows),
    months: depositMonths(
      sums.map((s) => ({ ...s, amountMinor: Number(s.amountMinor) })),
      today.slice(0, 7),
    ),
  };
}
