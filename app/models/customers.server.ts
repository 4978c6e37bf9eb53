import { and, asc, count, desc, eq, ilike, or, sql } from "drizzle-orm";
import { customers, orders } from "../../db/schema";
import { getDb } from "~/db.server";
import { CUSTOMER_SUGGESTIONS, customerLabel } from "~/lib/customer-schema";
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

/**
 * The order form's customer picker: up to `limit` customers whose name or e-mail contains `q`, names
 * that start with it first, then by name. An empty `q` gives the first customers by name.
 */
export async function searchCustomers(shopId: string, q: string, limit = CUSTOMER_SUGGESTIONS) {
  const byName = [asc(sql`lower(${customers.name})`), asc(customers.id)];
  return getDb()
    .select({ id: customers.id, name: customers.name, email: customers.email })
    .from(customers)
    .where(and(eq(customers.shopId, shopId), q ? or(ilike(customers.name, likePattern(q)), ilike(customers.email, likePattern(q))) : undefined))
    .orderBy(...(q ? [desc(ilike(customers.name, likePattern(q).slice(1))), ...byName] : byName))
    .limit(limit);
}

export async function hasCustomers(shopId: string): Promise<boolean> {
  const [row] = await getDb().select({ id: customers.id }).from(customers).where(eq(customers.shopId, shopId)).limit(1);
  return Boolean(row);
}

export type CustomerChoice = { ok: true; id: string } | { ok: false; message: string; suggestions: { id: string; name: string; email: string }[] };

/**
 * The customer an order form names. The text field (`text`, a customer's label as the picker shows it,
 * or just their name) is what the person saw; the id the picker sets beside it counts only while its
 * customer's label is that text, so a form posted without JavaScript is read by its text alone. A form
 * with an id and no text field at all (older clients, scripts) is taken by the id.
 */
export async function chooseCustomer(shopId: string, id: string | undefined, text: string | undefined): Promise<CustomerChoice> {
  const typed = text?.trim();
  // An id alone goes on as it is: the order's schema checks its form, the order's transaction its shop.
  if (typed === undefined) return id ? { ok: true, id } : { ok: false, message: "Choose a customer.", suggestions: [] };
  const byId = id && /^[0-9a-f-]{36}$/i.test(id) ? await getCustomer(shopId, id) : null;
  if (!typed) return { ok: false, message: "Choose a customer: type part of their name and pick them from the list.", suggestions: [] };
  if (typed.includes("\u0000")) return { ok: false, message: "A customer's name has no control characters.", suggestions: [] }; // PostgreSQL text cannot hold NUL
  if (byId && customerLabel(byId) === typed) return { ok: true, id: byId.id };
  const matches = await getDb()
    .select({ id: customers.id, name: customers.name, email: customers.email })
    .from(customers)
    .where(and(eq(customers.shopId, shopId), or(sql`lower(${customers.name}) = lower(${typed})`, sql`lower(${customers.name} || ' (' || ${customers.email} || ')') = lower(${typed})`)))
    .limit(CUSTOMER_SUGGESTIONS);
  const exact = matches.filter((c) => customerLabel(c).toLowerCase() === typed.toLowerCase());
  if (exact.length === 1) return { ok: true, id: exact[0].id };
  if (exact.length === 0 && matches.length === 1) return { ok: true, id: matches[0].id };
  if (matches.length > 1) return { ok: false, message: `Several customers are called “${typed}”: pick one with their e-mail from the list.`, suggestions: matches };
  const suggestions = await searchCustomers(shopId, typed.slice(0, 160)); // a name is at most 160 characters
  return {
    ok: false,
    message: suggestions.length ? `No customer is called “${typed}”; pick one from the list.` : `No customer matches “${typed}”. Add them under Customers first.`,
    suggestions,
  };
}

export async function createCustomer(shopId: string, input: CustomerInput) {
  const [row] = await getDb().insert(customers).values({ shopId, ...input }).returning({ id: customers.id });
  return row.id;
}

export async function updateCustomer(shopId: string, customerId: string, input: CustomerInput): Promise<boolean> {
  const rows = await getDb().update(customers).set(input).where(and(eq(customers.id, customerId), eq(customers.shopId, shopId))).returning({ id: customers.id });
  return rows.length > 0;
}
