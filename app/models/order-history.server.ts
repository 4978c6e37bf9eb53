import { and, asc, eq } from "drizzle-orm";
import { orderEvents, orders, users } from "../../db/schema";
import { getDb, type Queryable } from "~/db.server";
import { describeOrderEvent, readOrderEvent, splitEvent, type OrderEvent } from "~/lib/order-history";

/** Who did it and when; `by` is a member's id, or null for Stopwise itself. */
export interface EventContext {
  by?: string | null;
  at?: Date;
}

/** Writes one history entry, inside the caller's transaction when given one, so it lands with the change it tells of. */
export async function logOrderEvent(db: Queryable, shopId: string, orderId: string, event: OrderEvent, { by = null, at }: EventContext = {}): Promise<void> {
  await db.insert(orderEvents).values({ shopId, orderId, ...splitEvent(event), actorId: by, ...(at ? { at } : {}) });
}

/** An order's history, oldest first, in words; empty for another shop's order. */
export async function orderHistory(shopId: string, orderId: string) {
  const rows = await getDb()
    .select({ id: orderEvents.id, kind: orderEvents.kind, detail: orderEvents.detail, at: orderEvents.at, actor: users.name })
    .from(orderEvents)
    .innerJoin(orders, and(eq(orders.id, orderEvents.orderId), eq(orders.shopId, shopId)))
    .leftJoin(users, eq(users.id, orderEvents.actorId))
    .where(and(eq(orderEvents.orderId, orderId), eq(orderEvents.shopId, shopId)))
    .orderBy(asc(orderEvents.at), asc(orderEvents.id));
  return rows.flatMap((r) => {
    const event = readOrderEvent(r.kind, r.detail);
    return event ? [{ id: r.id, at: r.at.toISOString(), actor: r.actor, text: describeOrderEvent(event) }] : [];
  });
}
