import { and, eq, gte, inArray, lt, or, sql } from "drizzle-orm";
import { customers, depositMoves, deposits, orders } from "../../db/schema";
import { getDb } from "~/db.server";
import { localStamp, todayIso } from "~/lib/dates";
import { depositMonths, depositOrderRows, totalsOf } from "~/lib/deposit-ledger";
import { parsePeriod } from "~/lib/ledger-report";
import { orderTotal } from "./order-sql.server";
import { getShop } from "./shops.server";


/** Everything the deposits ledger page and its CSV show for a period (default: this month), its days and months on the shop's clock. */
export async function depositLedger(shopId: string, params: URLSearchParams) {
  const db = getDb();
  const { timeZone } = await getShop(shopId);
  const today = todayIso(new Date(), timeZone);
  const period = parsePeriod(params, today, "current");
  const dayStart = (day: string) => sql`(${day}::timestamp at time zone ${timeZone})`;
  const from = dayStart(period.from);
  const to = dayStart(period.to);
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
      orderTotalMinor: orderTotal(),
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
  const month = sql<string>`to_char(${depositMoves.occurredAt} at time zone ${timeZone}, 'YYYY-MM')`;
  const sums = await db
    .select({ month, kind: depositMoves.kind, amountMinor: sql<number>`sum(${depositMoves.amountMinor})::bigint` })
    .from(depositMoves)
    .where(and(eq(depositMoves.shopId, shopId), gte(depositMoves.occurredAt, dayStart(`${depositMonths([], today.slice(0, 7))[0].month}-01`))))
    .groupBy(sql`1`, depositMoves.kind); // by position: the zone is a parameter, so the month expression is not the same text twice
  const orderRows = depositOrderRows(
    rows.map((r) => ({ ...r, orderTotalMinor: Number(r.orderTotalMinor), requestedAt: localStamp(r.requestedAt, timeZone) })),
    moves.map((m) => ({ ...m, occurredAt: localStamp(m.occurredAt, timeZone) })),
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
