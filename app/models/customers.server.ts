import { and, asc, count, desc, eq, ilike, or, sql } from "drizzle-orm";
import { customers, orders } from "../../db/schema";
import { getDb } from "~/db.server";
import { likePattern, type ListQuery } from "~/lib/listing";

export const CUSTOMER_SORTS = ["name", "email", "orders", "created"] as const;
export type CustomerSort = (typeof CUSTOMER_SORTS)[number];
export type CustomerInput = { name: string; email: string; phone: string; notes: string };

export async function listCustomers(shopId: string, query: ListQuery<CustomerSort>) {
  const db = getDb();
  const where = and(
    eq(customers.shopId, shopId),
    query.q ? or(ilike(customers.name, likePattern(query.q)), ilike(customers.email, likePattern(query.q)), ilike(customers.phone, likePattern(query.q))) : undefined,
  );
  const orderCount = db.$count(orders, eq(orders.customerId, customers.id));
  const sortColumn = { name: customers.name, email: customers.email, orders: orderCount, created: customers.createdAt }[query.sort];
  const [rows, [{ total }]] = await Promise.all([
    db
      .select({ id: customers.id, name: customers.name, email: customers.email, phone: customers.phone, orders: orderCount })
      .from(customers)
      .where(where)
      .orderBy(query.dir === "asc" ? asc(sortColumn) : desc(sortColumn), asc(customers.id))
      .limit(query.size)
      .offset((query.page - 1) * query.size),
    db.select({ total: count() }).from(customers).where(where),
  ]);
  return { rows, total };
}

export async function getCustomer(shopId: string, customerId: string) {
  const [row] = await getDb().select().from(customers).where(and(eq(customers.id, customerId), eq(customers.shopId, shopId)));
  return row ?? null;
}

/** For the order form: every customer of the shop, by name. */
export async function customerChoices(shopId: string) {
  return getDb().select({ id: customers.id, name: customers.name, email: customers.email }).from(customers).where(eq(customers.shopId, shopId)).orderBy(asc(sql`lower(${customers.name})`));
}

export async function createCustomer(shopId: string, input: CustomerInput) {
  const [row] = await getDb().insert(customers).values({ shopId, ...input }).returning({ id: customers.id });
  return row.id;
}

export async function updateCustomer(shopId: string, customerId: string, input: CustomerInput): Promise<boolean> {
  const rows = await getDb().update(customers).set(input).where(and(eq(customers.id, customerId), eq(customers.shopId, shopId))).returning({ id: customers.id });
  return rows.length > 0;
}
