// SQL pieces about an order that several queries select.
import { sql, type SQLWrapper } from "drizzle-orm";
import { orderLines } from "../../db/schema";

/**
 * The outer query's order id, written out in full: in a query on orders alone Drizzle leaves its
 * columns unqualified, and inside a subquery on order_lines a bare "id" would be the line's own.
 */
export const ORDER_ID = sql.raw(`"orders"."id"`);

/** An order's total in minor units: for an order id, or for ORDER_ID of the query it sits in. */
export const orderTotal = (orderId: string | SQLWrapper = ORDER_ID) =>
  sql<number>`coalesce((select sum(ol.quantity::bigint * ol.unit_price_minor) from ${orderLines} ol where ol.order_id = ${orderId}), 0)::bigint`;

/** How many items the order's lines hold, for ORDER_ID of the query it sits in. */
export const orderItemCount = sql<number>`coalesce((select sum(ol.quantity) from ${orderLines} ol where ol.order_id = ${ORDER_ID}), 0)::int`;
