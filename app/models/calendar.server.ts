import { and, asc, between, eq, ne, or } from "drizzle-orm";
import { customers, orders } from "../../db/schema";
import { getDb } from "~/db.server";
import type { OrderHeading } from "~/lib/order-status";

/** The shop's orders (not cancelled) due or with their event between two ISO days, both included. */
export async function calendarOrders(shopId: string, from: string, to: string): Promise<OrderHeading[]> {
  return getDb()
    .select({ id: orders.id, number: orders.number, customer: customers.name, eventDate: orders.eventDate, dueDate: orders.dueDate, status: orders.status })
    .from(orders)
    .innerJoin(customers, eq(customers.id, orders.customerId))
    .where(and(eq(orders.shopId, shopId), ne(orders.status, "cancelled"), or(between(orders.dueDate, from, to), between(orders.eventDate, from, to))))
    .orderBy(asc(orders.number));
}
