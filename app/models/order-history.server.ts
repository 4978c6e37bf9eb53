import { and, asc, eq } from "drizzle-orm";
import { depositMoves, deposits, orderEvents, users } from "../../db/schema";
import { getDb, type Queryable } from "~/db.server";
import { describeOrderEvent, readOrderEvent, splitEvent, type OrderEvent, type StoredOrderEvent } from "~/lib/order-history";

/** Who did it and when; `by` is a member's id, or null for Stopwise itself. */
export interface EventContext {
  by?: string | null;
  at?: Date;
}

/** Writes one history entry, inside the caller's transaction when given one, so it lands with the change it tells of. */
export async function logOrderEvent(db: Queryable, shopId: string, orderId: string, event: StoredOrderEvent, { by = null, at }: EventContext = {}): Promise<void> {
  await db.insert(orderEvents).values({ shopId, orderId, ...splitEvent(event), actorId: by, ...(at ? { at } : {}) });
}

export interface HistoryEntry {
  id: string;
  at: string;
  actor: string | null;
  text: string;
}

/**
 * An order's history, oldest first, in words; empty for another shop's order. With `deposits` (for
 * those who may read them) it also tells each deposit asked, paid and refunded, from the deposit's
 * own records: they are the payment service's word, so they are not copied.
 */
export async function orderHistory(shopId: string, orderId: string, { deposits: withDeposits = false } = {}): Promise<HistoryEntry[]> {
  const db = getDb();
  const [rows, asked, moves] = await Promise.all([
    db
      .select({ id: orderEvents.id, kind: orderEvents.kind, detail: orderEvents.detail, at: orderEvents.at, actor: users.name })
      .from(orderEvents)
      .leftJoin(users, eq(users.id, orderEvents.actorId))
      .where(and(eq(orderEvents.orderId, orderId), eq(orderEvents.shopId, shopId))),
    withDeposits
      ? db
          .select({ id: deposits.id, amountMinor: deposits.amountMinor, currency: deposits.currency, at: deposits.requestedAt })
          .from(deposits)
          .where(and(eq(deposits.orderId, orderId), eq(deposits.shopId, shopId)))
      : [],
    withDeposits
      ? db
          .select({ id: depositMoves.id, depositId: depositMoves.depositId, kind: depositMoves.kind, amountMinor: depositMoves.amountMinor, currency: depositMoves.currency, at: depositMoves.occurredAt, asked: deposits.requestedAt, actor: users.name })
          .from(depositMoves)
          .innerJoin(deposits, eq(deposits.id, depositMoves.depositId))
          .leftJoin(users, eq(users.id, depositMoves.recordedBy))
          .where(and(eq(deposits.orderId, orderId), eq(depositMoves.shopId, shopId)))
      : [],
  ]);
  // The service stamps money to the second, so within one second a payment could seem to come before
  // its ask, or a refund before its payment: each deposit's story is kept in order (asked, paid, refunded).
  const storyAt = (at: Date, after: Date) => (at < after ? after : at);
  const lastOf = new Map<string, Date>(); // per deposit, the time of its story so far
  const inOrder = [...moves].sort((a, b) => (a.kind === b.kind ? a.at.getTime() - b.at.getTime() : a.kind === "payment" ? -1 : 1));
  const told: { id: string; at: Date; actor: string | null; event: OrderEvent | null }[] = [
    ...rows.map((r) => ({ id: r.id, at: r.at, actor: r.actor, event: readOrderEvent(r.kind, r.detail) })),
    ...asked.map((d) => ({ id: d.id, at: d.at, actor: null, event: { kind: "deposit_asked", amountMinor: d.amountMinor, currency: d.currency } as const })),
    ...inOrder.map((m) => {
      const at = storyAt(m.at, lastOf.get(m.depositId) ?? m.asked);
      lastOf.set(m.depositId, at);
      return { id: m.id, at, actor: m.actor, event: { kind: m.kind === "payment" ? "deposit_paid" : "deposit_refunded", amountMinor: m.amountMinor, currency: m.currency } as const };
    }),
  ];
  return told
    .filter((e) => e.event !== null)
    .sort((a, b) => a.at.getTime() - b.at.getTime())
    .map((e) => ({ id: e.id, at: e.at.toISOString(), actor: e.actor, text: describeOrderEvent(e.event!) }));
}
