// A shop ready for batching: birch in two thicknesses with stock, the demo's products, and
// confirmed orders due on given dates (plus a later one and a draft that must stay out).
import { eq } from "drizzle-orm";
import * as t from "../../db/schema";
import { createShop } from "./factories";
import { getDb } from "~/db.server";
import { createOrder } from "~/models/orders.server";

const db = getDb();
const mm = (n: number) => n * 1000;

/** A shop with birch in two thicknesses, the demo's products, and confirmed orders due on given dates. */
export async function batchScenario() {
  const shop = await createShop("Batches");
  const [birch6, birch3] = await db
    .insert(t.materials)
    .values([
      { shopId: shop.id, name: "Birch plywood 6 mm", kind: "plywood", thicknessUm: mm(6) },
      { shopId: shop.id, name: "Birch plywood 3 mm", kind: "plywood", thicknessUm: mm(3) },
    ])
    .returning();
  const [sheet6] = await db.insert(t.stockPanels).values([{ shopId: shop.id, materialId: birch6.id, lengthUm: mm(2440), widthUm: mm(1220), costMinor: 5290, onHand: 3 }]).returning();
  await db.insert(t.stockPanels).values({ shopId: shop.id, materialId: birch3.id, lengthUm: mm(1220), widthUm: mm(1220), costMinor: 1890, onHand: 2 });
  const [tableNumber, sign, placeCard] = await db
    .insert(t.products)
    .values([
      { shopId: shop.id, name: "Table number", priceMinor: 650 },
      { shopId: shop.id, name: "Welcome sign", priceMinor: 8500 },
      { shopId: shop.id, name: "Place card", priceMinor: 180 },
    ])
    .returning();
  await db.insert(t.productParts).values([
    { productId: tableNumber.id, materialId: birch6.id, name: "Number card", lengthUm: mm(210), widthUm: mm(150), grainLocked: true },
    { productId: sign.id, materialId: birch6.id, name: "Sign face", lengthUm: mm(600), widthUm: mm(400), grainLocked: true },
    { productId: placeCard.id, materialId: birch3.id, name: "Card", lengthUm: mm(90), widthUm: mm(55), process: "laser" },
  ]);
  const [ardent, penhaligon] = await db
    .insert(t.customers)
    .values([
      { shopId: shop.id, name: "Ardent–Vasquez wedding" },
      { shopId: shop.id, name: "Penhaligon party" },
    ])
    .returning();
  const order = async (customerId: string, dueDate: string, status: "confirmed" | "draft", lines: { productId: string; quantity: number; personalisation?: string[] }[]) => {
    const o = await createOrder(shop.id, { customerId, eventDate: "2027-01-30", dueDate, notes: "" }, lines.map((l) => ({ personalisation: [], notes: "", files: [], ...l })));
    await db.update(t.orders).set({ status }).where(eq(t.orders.id, o.id));
    return o;
  };
  const wedding = await order(ardent.id, "2027-01-10", "confirmed", [
    { productId: tableNumber.id, quantity: 3, personalisation: ["Table 1", "Table 2", "Table 3"] },
    { productId: sign.id, quantity: 1 },
    { productId: placeCard.id, quantity: 120, personalisation: Array.from({ length: 120 }, (_, i) => `Guest ${i + 1}`) },
  ]);
  const party = await order(penhaligon.id, "2027-01-12", "confirmed", [{ productId: tableNumber.id, quantity: 2, personalisation: ["Table A", "Table B"] }]);
  const later = await order(penhaligon.id, "2027-03-01", "confirmed", [{ productId: sign.id, quantity: 1 }]);
  const draft = await order(ardent.id, "2027-01-05", "draft", [{ productId: sign.id, quantity: 1 }]);
  return { shop, birch6, birch3, sheet6, wedding, party, later, draft };
}


/** Plans, releases and closes as cut a batch of the scenario's 6 mm lines due by `dueBy` (needs a plan runner). */
export async function cutBatch(s: Awaited<ReturnType<typeof batchScenario>>, dueBy: string) {
  const { createBatches } = await import("~/models/batches.server");
  const { releasePlan, requestPlan } = await import("~/models/plans.server");
  const { closeBatchAsCut, expectedOffcuts, tickSetup } = await import("~/models/floor.server");
  const [batchId] = await createBatches(s.shop.id, dueBy, [s.birch6.id]);
  const planId = await requestPlan(s.shop.id, batchId, { kerfMm: 3.2, trimMm: 10, stages: 2, objective: "sheets", timeLimitMs: 300, offcutIds: [], seed: 5 });
  let plan: typeof t.plans.$inferSelect | undefined;
  for (let i = 0; i < 300; i++) {
    [plan] = await db.select().from(t.plans).where(eq(t.plans.id, planId));
    if (plan.status === "done") break;
    if (plan.status === "failed") throw new Error(plan.error ?? "plan failed");
    await new Promise((r) => setTimeout(r, 100));
  }
  await releasePlan(s.shop.id, batchId, planId);
  const setups = (plan!.result as { plan: { setups: { count: number }[] } }).plan.setups;
  for (const [i, setup] of setups.entries()) await tickSetup(s.shop.id, s.shop.users.sawyer.id, batchId, i, setup.count, setups as never);
  const offcuts = await expectedOffcuts(batchId);
  await closeBatchAsCut(s.shop.id, batchId, offcuts.map((o, i) => ({ offcutId: o.id, rack: i === 0, lengthUm: o.lengthUm, widthUm: o.widthUm, location: "Rack A" })), setups.length);
  return batchId;
}
