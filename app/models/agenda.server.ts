// The facts behind the home page's list of what is waiting (lib/agenda.ts): only those the role may
// read, read side by side.
import { and, asc, count, eq, inArray, lte, ne, sql } from "drizzle-orm";
import { batches, customers, deposits, materials, orders, stockPanels } from "../../db/schema";
import { getDb } from "~/db.server";
import { AGENDA_LINES, BATCH_AHEAD_DAYS, DUE_SOON_DAYS, type AgendaFacts } from "~/lib/agenda";
import { addDays, todayIso } from "~/lib/dates";
import { can, type Role } from "~/lib/permissions";
import { unbatchedCounts } from "./batches.server";
import { getShop } from "./shops.server";
import { listSleds } from "./sleds.server";

const OPEN_ORDER = ["draft", "confirmed", "in_production"] as const;

async function dueSoon(shopId: string, dueBy: string) {
  const db = getDb();
  const where = and(eq(orders.shopId, shopId), inArray(orders.status, OPEN_ORDER), lte(orders.dueDate, dueBy));
  const [rows, [{ total }]] = await Promise.all([
    db
      .select({ id: orders.id, number: orders.number, customerName: customers.name, dueDate: orders.dueDate, status: orders.status })
      .from(orders)
      .innerJoin(customers, eq(customers.id, orders.customerId))
      .where(where)
      .orderBy(asc(orders.dueDate), asc(orders.number))
      .limit(AGENDA_LINES),
    db.select({ total: count() }).from(orders).where(where),
  ]);
  return { total, orders: rows };
}

async function ordersIn(shopId: string, status: "draft" | "ready") {
  const [{ n }] = await getDb().select({ n: count() }).from(orders).where(and(eq(orders.shopId, shopId), eq(orders.status, status)));
  return n;
}

async function unbatched(shopId: string, dueBy: string) {
  return { ...(await unbatchedCounts(shopId, dueBy)), dueBy };
}

/** Batches not yet cut, soonest due first (the model of the batches list keeps its own order). */
function unfinishedBatches(shopId: string) {
  return getDb()
    .select({ id: batches.id, number: batches.number, materialName: materials.name, status: batches.status })
    .from(batches)
    .innerJoin(materials, eq(materials.id, batches.materialId))
    .where(and(eq(batches.shopId, shopId), inArray(batches.status, ["open", "planned", "released"])))
    .orderBy(asc(batches.dueBy), asc(batches.number));
}

/** Materials that batches not yet released wait for, with no full sheet on hand. */
async function sheetsOut(shopId: string) {
  const onHand = getDb()
    .select({ n: sql`coalesce(sum(${stockPanels.onHand}), 0)` })
    .from(stockPanels)
    .where(eq(stockPanels.materialId, materials.id));
  return getDb()
    .select({ materialName: materials.name, batches: sql<number>`count(*)::int` })
    .from(batches)
    .innerJoin(materials, eq(materials.id, batches.materialId))
    .where(and(eq(batches.shopId, shopId), inArray(batches.status, ["open", "planned"]), sql`(${onHand}) = 0`))
    .groupBy(materials.id, materials.name)
    .orderBy(asc(materials.name));
}

async function sledsToCheck(shopId: string, toleranceUmPerM: number) {
  const list = await listSleds(shopId);
  return { list: list.map((s) => ({ id: s.id, name: s.name, lastCheck: s.lastCheck })), toleranceUmPerM };
}

/** Deposits asked and not paid on orders still open, summed per currency (a shop may have changed its currency since). */
async function unpaidDeposits(shopId: string) {
  const rows = await getDb()
    .select({ count: count(), amountMinor: sql<number>`coalesce(sum(${deposits.amountMinor}), 0)::int`, currency: deposits.currency })
    .from(deposits)
    .innerJoin(orders, eq(orders.id, deposits.orderId))
    .where(and(eq(deposits.shopId, shopId), eq(deposits.status, "requested"), ne(orders.status, "cancelled")))
    .groupBy(deposits.currency)
    .orderBy(asc(deposits.currency));
  return { count: rows.reduce((a, r) => a + r.count, 0), amounts: rows.map(({ amountMinor, currency }) => ({ amountMinor, currency })) };
}

export async function shopAgenda(shopId: string, role: Role, now = new Date()): Promise<AgendaFacts> {
  const shop = await getShop(shopId);
  const today = todayIso(now, shop.timeZone);
  const skip = Promise.resolve(undefined);
  const [due, drafts, ready, lines, unfinished, sleds, deposit, out] = await Promise.all([
    can(role, "orders:read") ? dueSoon(shopId, addDays(today, DUE_SOON_DAYS)) : skip,
    can(role, "orders:write") ? ordersIn(shopId, "draft") : skip,
    can(role, "orders:write") ? ordersIn(shopId, "ready") : skip,
    can(role, "batches:write") ? unbatched(shopId, addDays(today, BATCH_AHEAD_DAYS)) : skip,
    can(role, "batches:write") || can(role, "floor:read") ? unfinishedBatches(shopId) : skip,
    can(role, "sleds:write") ? sledsToCheck(shopId, shop.sledToleranceUmPerM) : skip,
    can(role, "deposits:read") ? unpaidDeposits(shopId) : skip,
    can(role, "batches:write") ? sheetsOut(shopId) : skip,
  ]);
  // a sawyer reads every batch but acts only on those at the saw
  const batchList = unfinished && (can(role, "batches:write") ? unfinished : unfinished.filter((b) => b.status === "released"));
  return { today, dueSoon: due, drafts, ready, unbatched: lines, batches: batchList, sleds, unpaidDeposits: deposit, sheetsOut: out };
}
