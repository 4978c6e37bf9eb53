import { and, asc, count, desc, eq, ilike, inArray, isNull, or, sql } from "drizzle-orm";
import { batches, batchLines, customers, lineFiles, orderLines, orders, products, shops } from "../../db/schema";
import { getDb, type WriteContext } from "~/db.server";
import { batchCode } from "~/lib/batches";
import { defaultDueDate } from "~/lib/dates";
import { DEPOSIT_FILTERS, type DepositStatus } from "~/lib/deposits";
import { likePattern, parseListQuery, type ListQuery } from "~/lib/listing";
import { headerChanges } from "~/lib/order-history";
import { checkLineTexts } from "~/lib/order-lines";
import { canMoveTo, linesEditable, ORDER_STATUSES, type OrderHeading, type OrderStatus } from "~/lib/order-status";
import { logOrderEvent, type EventContext } from "./order-history.server";
import { ORDER_ID, orderItemCount, orderTotal } from "./order-sql.server";

export const ORDER_SORTS = ["number", "customer", "event", "due", "status", "total"] as const;
export type OrderSort = (typeof ORDER_SORTS)[number];
export const ORDER_FILTERS = { status: ORDER_STATUSES, deposit: DEPOSIT_FILTERS } as const;

export class OrderStateError extends Error {}

/** The list query of an orders address: soonest due first unless asked otherwise. */
export function orderListQuery(request: Request): ListQuery<OrderSort> {
  return parseListQuery(new URL(request.url).searchParams, { sorts: ORDER_SORTS, defaultSort: "due", defaultDir: "asc", filters: ORDER_FILTERS });
}

const lineTotal = orderTotal();
// The order's personalisation texts, one row each, for the search: a guest's name finds their order.
const textsLike = (pattern: string) =>
  sql`from ${orderLines} ol cross join lateral jsonb_array_elements_text(ol.personalisation) as t(text) where ol.order_id = ${ORDER_ID} and t.text ilike ${pattern}`;
// The status of the order's latest deposit (one index probe per listed order), null when none was asked.
const latestDeposit = sql<DepositStatus | null>`(select d.status from deposits d where d.shop_id = "orders"."shop_id" and d.order_id = "orders"."id" order by d.requested_at desc limit 1)`;

export type OrderListRow = OrderHeading & {
  items: number;
  totalMinor: number;
  /** The latest deposit's status, for those who may see deposits (else always null). */
  deposit: DepositStatus | null;
  /** With a search: the first personalisation text it found, to show why the order is listed (else null). */
  matched: string | null;
};

/**
 * One page of the shop's orders, sorted and filtered in PostgreSQL (the shop's 10,000 orders never
 * reach Node), with the count of all that match and the shop's currency to show them in (read with
 * the count: the list page needs nothing else of the shop, and a round trip costs more than the read).
 */
export async function listOrders(shopId: string, query: ListQuery<OrderSort>, { deposits: seesDeposits }: { deposits: boolean }): Promise<{ rows: OrderListRow[]; total: number; currency: string }> {
  const db = getDb();
  const q = query.q.replace(/^#/, "");
  const depositFilter = seesDeposits ? query.filters.deposit : undefined;
  const where = and(
    eq(orders.shopId, shopId),
    query.filters.status ? eq(orders.status, query.filters.status as OrderStatus) : undefined,
    depositFilter ? (depositFilter === "none" ? sql`${latestDeposit} is null` : sql`${latestDeposit} = ${depositFilter}`) : undefined,
    q ? or(ilike(customers.name, likePattern(q)), /^\d+$/.test(q) ? eq(orders.number, Number(q)) : undefined, sql`exists (select 1 ${textsLike(likePattern(q))})`) : undefined,
  );
  const sortColumn = { number: orders.number, customer: customers.name, event: orders.eventDate, due: orders.dueDate, status: orders.status, total: lineTotal }[query.sort];
  const [rows, [summary]] = await Promise.all([
    db
      .select({
        id: orders.id,
        number: orders.number,
        customer: customers.name,
        eventDate: orders.eventDate,
        dueDate: orders.dueDate,
        status: orders.status,
        items: orderItemCount,
        totalMinor: lineTotal,
        deposit: seesDeposits ? latestDeposit : sql<null>`null`,
        matched: q ? sql<string | null>`(select t.text ${textsLike(likePattern(q))} order by ol.id limit 1)` : sql<null>`null`,
      })
      .from(orders)
      .innerJoin(customers, eq(customers.id, orders.customerId))
      .where(where)
      .orderBy(query.dir === "asc" ? asc(sortColumn) : desc(sortColumn), desc(orders.number))
      .limit(query.size)
      .offset((query.page - 1) * query.size)
      // Prepared: each sort and filter is one statement text, kept per connection, so PostgreSQL plans it once.
      .prepare("orders_page")
      .execute(),
    db
      .select({ total: count(), currency: sql<string>`(select ${shops.currency} from ${shops} where ${shops.id} = ${shopId})` })
      .from(orders)
      .innerJoin(customers, eq(customers.id, orders.customerId))
      .where(where)
      .prepare("orders_count")
      .execute(),
  ]);
  return { rows: rows.map((r) => ({ ...r, totalMinor: Number(r.totalMinor) })), total: summary.total, currency: summary.currency };
}

export async function ordersOfCustomer(shopId: string, customerId: string) {
  return getDb()
    .select({ id: orders.id, number: orders.number, eventDate: orders.eventDate, status: orders.status, totalMinor: lineTotal })
    .from(orders)
    .where(and(eq(orders.shopId, shopId), eq(orders.customerId, customerId)))
    .orderBy(desc(orders.eventDate));
}

/** The order with its customer, lines and files, or null when it is not this shop's. */
export async function getOrder(shopId: string, orderId: string) {
  const db = getDb();
  const [order] = await db
    .select({
      id: orders.id,
      number: orders.number,
      status: orders.status,
      eventDate: orders.eventDate,
      dueDate: orders.dueDate,
      notes: orders.notes,
      confirmedAt: orders.confirmedAt,
      confirmationSentAt: orders.confirmationSentAt,
      confirmationError: orders.confirmationError,
      readyNoticeSentAt: orders.readyNoticeSentAt,
      customerId: customers.id,
      customerName: customers.name,
      customerEmail: customers.email,
    })
    .from(orders)
    .innerJoin(customers, eq(customers.id, orders.customerId))
    .where(and(eq(orders.id, orderId), eq(orders.shopId, shopId)));
  if (!order) return null;
  const lines = await db
    .select({
      id: orderLines.id,
      productId: orderLines.productId,
      productName: products.name,
      quantity: orderLines.quantity,
      unitPriceMinor: orderLines.unitPriceMinor,
      personalisation: orderLines.personalisation,
      notes: orderLines.notes,
    })
    .from(orderLines)
    .innerJoin(products, eq(products.id, orderLines.productId))
    .where(eq(orderLines.orderId, order.id))
    .orderBy(asc(products.name), asc(orderLines.id));
  const files = lines.length
    ? await db
        .select({ id: lineFiles.id, orderLineId: lineFiles.orderLineId, fileName: lineFiles.fileName, contentType: lineFiles.contentType, sizeBytes: lineFiles.sizeBytes })
        .from(lineFiles)
        .where(and(eq(lineFiles.shopId, shopId), inArray(lineFiles.orderLineId, lines.map((l) => l.id))))
        .orderBy(asc(lineFiles.createdAt))
    : [];
  const withFiles = lines.map((line) => ({ ...line, files: files.filter((f) => f.orderLineId === line.id) }));
  const totalMinor = lines.reduce((sum, l) => sum + l.quantity * l.unitPriceMinor, 0);
  return { ...order, lines: withFiles, totalMinor };
}

export type OrderDetail = NonNullable<Awaited<ReturnType<typeof getOrder>>>;

/** The shop's current (not retired) products that a new order line may name, with the price it takes. */
export async function productChoices(shopId: string) {
  return getDb()
    .select({ id: products.id, name: products.name, priceMinor: products.priceMinor, leadTimeDays: products.leadTimeDays })
    .from(products)
    .where(and(eq(products.shopId, shopId), isNull(products.retiredAt)))
    .orderBy(asc(products.name));
}

export type NewLine = { productId: string; quantity: number; personalisation: string[]; notes: string; files: { fileName: string; contentType: string; sizeBytes: number; storageKey: string }[] };
export type OrderHeader = { customerId: string; eventDate: string; dueDate: string; notes: string };

/**
 * Writes an order and all its lines and file records in one transaction; the shop row is locked so
 * two orders made at once get consecutive numbers. Prices are the products' current prices.
 */
export async function createOrder(shopId: string, header: OrderHeader, lines: NewLine[], who: EventContext & { repeatOf?: number; leftOut?: string[] } = {}): Promise<{ id: string; number: number }> {
  return getDb().transaction(async (tx) => {
    await tx.select({ id: shops.id }).from(shops).where(eq(shops.id, shopId)).for("update");
    const [customer] = await tx.select({ id: customers.id }).from(customers).where(and(eq(customers.id, header.customerId), eq(customers.shopId, shopId)));
    if (!customer) throw new OrderStateError("That customer is not in this shop.");
    const [{ next }] = await tx.select({ next: sql<number>`coalesce(max(${orders.number}), 1000) + 1` }).from(orders).where(eq(orders.shopId, shopId));
    const [order] = await tx.insert(orders).values({ shopId, number: next, ...header }).returning({ id: orders.id, number: orders.number });
    await insertLines(tx, shopId, order.id, lines);
    const repeat = who.repeatOf === undefined ? {} : { repeatOf: who.repeatOf, leftOut: who.leftOut ?? [] };
    await logOrderEvent(tx, shopId, order.id, { kind: "created", lines: lines.length, ...repeat }, who);
    return order;
  });
}

/**
 * A new draft for the same customer with the same lines at today's prices (their texts too, unless
 * asked not to), due by the products' lead times before the new event. Lines of products no longer
 * offered are left out, as its history says; with none left it is refused. Artwork files stay with
 * the first order. Null: not this shop's order.
 */
export async function repeatOrder(shopId: string, orderId: string, { eventDate, texts }: { eventDate: string; texts: boolean }, who: EventContext = {}): Promise<{ id: string; number: number } | null> {
  const db = getDb();
  const [source] = await db.select({ number: orders.number, customerId: orders.customerId }).from(orders).where(and(eq(orders.id, orderId), eq(orders.shopId, shopId)));
  if (!source) return null;
  const lines = await db
    .select({ productId: orderLines.productId, product: products.name, retiredAt: products.retiredAt, leadTimeDays: products.leadTimeDays, quantity: orderLines.quantity, personalisation: orderLines.personalisation, notes: orderLines.notes })
    .from(orderLines)
    .innerJoin(products, eq(products.id, orderLines.productId))
    .where(eq(orderLines.orderId, orderId))
    .orderBy(asc(products.name), asc(orderLines.id));
  const offered = lines.filter((l) => l.retiredAt === null);
  if (offered.length === 0) throw new OrderStateError("None of this order's products is offered any more, so there is nothing to order again.");
  const dueDate = defaultDueDate(eventDate, offered.map((l) => l.leadTimeDays));
  const leftOut = [...new Set(lines.filter((l) => l.retiredAt !== null).map((l) => l.product))];
  const newLines = offered.map((l) => ({ productId: l.productId, quantity: l.quantity, personalisation: texts ? l.personalisation : [], notes: l.notes, files: [] }));
  return createOrder(shopId, { customerId: source.customerId, eventDate, dueDate, notes: "" }, newLines, { ...who, repeatOf: source.number, leftOut });
}

type Tx = Parameters<Parameters<ReturnType<typeof getDb>["transaction"]>[0]>[0];

/** Inserts the lines at their products' prices; returns each line's product name and quantity, for the history. */
async function insertLines(tx: Tx, shopId: string, orderId: string, lines: NewLine[]): Promise<{ product: string; quantity: number }[]> {
  if (lines.length === 0) return [];
  const ids = [...new Set(lines.map((l) => l.productId))];
  // Locked against a delete at the same moment; a product retired since the form was checked is refused.
  const prices = await tx
    .select({ id: products.id, name: products.name, priceMinor: products.priceMinor })
    .from(products)
    .where(and(eq(products.shopId, shopId), inArray(products.id, ids), isNull(products.retiredAt)))
    .for("share");
  const productOf = new Map(prices.map((p) => [p.id, p]));
  const added: { product: string; quantity: number }[] = [];
  for (const line of lines) {
    const price = productOf.get(line.productId)?.priceMinor;
    if (price === undefined) throw new OrderStateError("A product on this order is not (or no longer) offered in this shop's catalogue.");
    const [row] = await tx
      .insert(orderLines)
      .values({ orderId, productId: line.productId, quantity: line.quantity, unitPriceMinor: price, personalisation: line.personalisation, notes: line.notes })
      .returning({ id: orderLines.id });
    if (line.files.length) await tx.insert(lineFiles).values(line.files.map((f) => ({ ...f, shopId, orderLineId: row.id })));
    added.push({ product: productOf.get(line.productId)!.name, quantity: line.quantity });
  }
  return added;
}

async function lockOrder(tx: Tx, shopId: string, orderId: string) {
  const [order] = await tx.select({ id: orders.id, status: orders.status }).from(orders).where(and(eq(orders.id, orderId), eq(orders.shopId, shopId))).for("update");
  return order ?? null;
}

/** Adds lines to an order whose lines may still change; false when the order is not this shop's. */
export async function addLines(shopId: string, orderId: string, lines: NewLine[], who: EventContext = {}): Promise<boolean> {
  return getDb().transaction(async (tx) => {
    const order = await lockOrder(tx, shopId, orderId);
    if (!order) return false;
    if (!linesEditable(order.status)) throw new OrderStateError("This order is in production; its lines can no longer change.");
    for (const line of await insertLines(tx, shopId, order.id, lines)) await logOrderEvent(tx, shopId, order.id, { kind: "line_added", ...line }, who);
    return true;
  });
}

/** Removes a line (and returns its stored file keys so the caller can delete the bytes). Null: not found. */
export async function removeLine(shopId: string, orderId: string, lineId: string, who: EventContext = {}): Promise<string[] | null> {
  return getDb().transaction(async (tx) => {
    const order = await lockOrder(tx, shopId, orderId);
    if (!order) return null;
    if (!linesEditable(order.status)) throw new OrderStateError("This order is in production; its lines can no longer change.");
    const files = await tx.select({ key: lineFiles.storageKey }).from(lineFiles).where(and(eq(lineFiles.orderLineId, lineId), eq(lineFiles.shopId, shopId)));
    const [removed] = await tx.delete(orderLines).where(and(eq(orderLines.id, lineId), eq(orderLines.orderId, order.id))).returning({ productId: orderLines.productId, quantity: orderLines.quantity });
    if (!removed) return null;
    const [product] = await tx.select({ name: products.name }).from(products).where(eq(products.id, removed.productId));
    await logOrderEvent(tx, shopId, order.id, { kind: "line_removed", product: product.name, quantity: removed.quantity }, who);
    return files.map((f) => f.key);
  });
}

/**
 * Puts the typed personalisation texts on a line, checked against its item count as it stands. Null: no
 * such line on this shop's order. Refused once the line's batch has gone to the saw: its labels and
 * laser files may already be printed.
 */
export async function updateLineTexts(shopId: string, orderId: string, lineId: string, typed: string, who: EventContext = {}): Promise<{ ok: true } | { ok: false; error: string } | null> {
  return getDb().transaction(async (tx) => {
    const order = await lockOrder(tx, shopId, orderId);
    if (!order) return null;
    if (!linesEditable(order.status)) throw new OrderStateError("This order is in production; its lines can no longer change.");
    const [line] = await tx
      .select({ id: orderLines.id, quantity: orderLines.quantity, personalisation: orderLines.personalisation, product: products.name })
      .from(orderLines)
      .innerJoin(products, eq(products.id, orderLines.productId))
      .where(and(eq(orderLines.id, lineId), eq(orderLines.orderId, order.id)))
      .for("update", { of: orderLines });
    if (!line) return null;
    const texts = checkLineTexts(typed, line.quantity);
    if (!texts.ok) return texts;
    const [atSaw] = await tx
      .select({ number: batches.number })
      .from(batchLines)
      .innerJoin(batches, eq(batches.id, batchLines.batchId))
      .where(and(eq(batchLines.orderLineId, line.id), inArray(batches.status, ["released", "cut", "closed"])))
      .limit(1);
    if (atSaw) throw new OrderStateError(`This line is in batch ${batchCode(atSaw.number)}, which has gone to the saw; its texts no longer change.`);
    // Saving the same texts again changes nothing, and tells no history.
    if (texts.texts.join("\n") === line.personalisation.join("\n")) return { ok: true };
    await tx.update(orderLines).set({ personalisation: texts.texts }).where(eq(orderLines.id, line.id));
    await logOrderEvent(tx, shopId, order.id, { kind: "texts", product: line.product, count: texts.texts.length }, who);
    return { ok: true };
  });
}

export async function updateHeader(shopId: string, orderId: string, header: OrderHeader, who: EventContext = {}): Promise<boolean> {
  return getDb().transaction(async (tx) => {
    const order = await lockOrder(tx, shopId, orderId);
    if (!order) return false;
    if (order.status === "delivered" || order.status === "cancelled") throw new OrderStateError(`A ${order.status} order no longer changes.`);
    const [customer] = await tx.select({ id: customers.id, name: customers.name }).from(customers).where(and(eq(customers.id, header.customerId), eq(customers.shopId, shopId)));
    if (!customer) throw new OrderStateError("That customer is not in this shop.");
    const [before] = await tx
      .select({ customer: customers.name, eventDate: orders.eventDate, dueDate: orders.dueDate, notes: orders.notes })
      .from(orders)
      .innerJoin(customers, eq(customers.id, orders.customerId))
      .where(eq(orders.id, order.id));
    await tx.update(orders).set(header).where(eq(orders.id, order.id));
    const changes = headerChanges(before, { customer: customer.name, eventDate: header.eventDate, dueDate: header.dueDate, notes: header.notes });
    if (changes.length) await logOrderEvent(tx, shopId, order.id, { kind: "header", changes }, who);
    return true;
  });
}

/**
 * Moves an order on. Confirming happens once: a second "confirm" (a double click, a retry) finds the
 * order already confirmed and changes nothing. Returns the status before, or null when not found.
 */
export async function moveOrder(shopId: string, orderId: string, to: OrderStatus, { db = getDb(), now = new Date(), by }: WriteContext & Pick<EventContext, "by"> = {}): Promise<OrderStatus | null> {
  return db.transaction(async (tx) => {
    const order = await lockOrder(tx, shopId, orderId);
    if (!order) return null;
    if (!canMoveTo(order.status, to)) throw new OrderStateError(`A ${order.status.replace("_", " ")} order cannot become ${to.replace("_", " ")}.`);
    if (to === "confirmed") {
      const [{ lines }] = await tx.select({ lines: count() }).from(orderLines).where(eq(orderLines.orderId, order.id));
      if (lines === 0) throw new OrderStateError("An order needs at least one line before it is confirmed.");
    }
    await tx
      .update(orders)
      .set({ status: to, ...(to === "confirmed" ? { confirmedAt: now, confirmationSentAt: null, confirmationError: null } : {}) })
      .where(eq(orders.id, order.id));
    await logOrderEvent(tx, shopId, order.id, { kind: "status", from: order.status, to }, { by, at: now });
    return order.status;
  });
}

/** Keeps the confirmation e-mail's outcome on the order, and in its history. */
export async function recordConfirmation(shopId: string, orderId: string, outcome: { sentAt: Date; to: string } | { error: string }, who: EventContext = {}) {
  await getDb().transaction(async (tx) => {
    await tx
      .update(orders)
      .set("sentAt" in outcome ? { confirmationSentAt: outcome.sentAt, confirmationError: null } : { confirmationError: outcome.error })
      .where(and(eq(orders.id, orderId), eq(orders.shopId, shopId)));
    const event = "sentAt" in outcome ? ({ kind: "confirmation_sent", to: outcome.to } as const) : ({ kind: "confirmation_failed", error: outcome.error } as const);
    await logOrderEvent(tx, shopId, orderId, event, who);
  });
}

export async function recordReadyNotice(shopId: string, orderId: string, sent: { at: Date; to: string }, who: EventContext = {}) {
  await getDb().transaction(async (tx) => {
    await tx.update(orders).set({ readyNoticeSentAt: sent.at }).where(and(eq(orders.id, orderId), eq(orders.shopId, shopId)));
    await logOrderEvent(tx, shopId, orderId, { kind: "ready_notice", to: sent.to }, { ...who, at: sent.at });
  });
}

/** A file of one of this shop's orders, for download; null when the ids do not belong together here. */
export async function getLineFile(shopId: string, orderId: string, fileId: string) {
  const [row] = await getDb()
    .select({ fileName: lineFiles.fileName, contentType: lineFiles.contentType, storageKey: lineFiles.storageKey })
    .from(lineFiles)
    .innerJoin(orderLines, eq(orderLines.id, lineFiles.orderLineId))
    .innerJoin(orders, eq(orders.id, orderLines.orderId))
    .where(and(eq(lineFiles.id, fileId), eq(lineFiles.shopId, shopId), eq(orders.id, orderId), eq(orders.shopId, shopId)));
  return row ?? null;
}
