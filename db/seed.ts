// The demo scenario of DESIGN.md: "Tallowmere Sign & Keepsake", a three-person shop.
// Every name and figure here is invented for the demo.
import { randomBytes } from "node:crypto";
import { count, eq } from "drizzle-orm";
import { generateIdFromEntropySize } from "lucia";
import type { Database } from "../app/db.server";
import { engineOnThisThread, runPlan } from "../app/jobs/plan-runner.server";
import { batchContents, createBatches } from "../app/models/batches.server";
import { closeBatchAsCut, expectedOffcuts, tickSetup } from "../app/models/floor.server";
import { moveOrder } from "../app/models/orders.server";
import { logOrderEvent } from "../app/models/order-history.server";
import { addPlan, releasePlan, type PlanResult } from "../app/models/plans.server";
import { getShop } from "../app/models/shops.server";
import { hashPassword } from "../app/password.server";
import * as t from "./schema";

export const DEMO_PASSWORD = "tallowmere-demo-2026";
export const DEMO_ACCOUNTS = [
  { email: "owner@tallowmere.example", name: "Edda Tallowmere", role: "owner" },
  { email: "planner@tallowmere.example", name: "Rafe Onwuka", role: "planner" },
  { email: "sawyer@tallowmere.example", name: "Ines Marlow", role: "sawyer" },
  { email: "books@tallowmere.example", name: "Tobiah Vance", role: "bookkeeper" },
] as const;

const mm = (value: number) => Math.round(value * 1000);

const GUEST_FIRST = ["Zoë", "Anh", "Mateo", "Saoirse", "Kofi", "Lena", "Tomás", "Priya", "Björn", "Amara", "Jules", "Nguyễn Thảo"];
const GUEST_LAST = ["Ardent", "Vasquez", "Holloway", "Okafor", "Lindqvist", "Duarte", "Marchetti", "Ferreira", "Quill", "Abernathy"];

/** 120 invented guest names for the place cards, deterministic. */
export function demoGuestNames(total = 120): string[] {
  const names: string[] = [];
  for (let i = 0; names.length < total; i++) {
    names.push(`${GUEST_FIRST[i % GUEST_FIRST.length]} ${GUEST_LAST[Math.floor(i / GUEST_FIRST.length) % GUEST_LAST.length]}`);
  }
  return names;
}

/**
 * The sheet stock the demo shop opens with. Last month's cuts (seedDemoHistory) draw their sheets from
 * it as releasing a plan does, so with the history seeded the counts on hand are these less what those
 * plans used.
 */
export const DEMO_STOCK = [
  { material: "Birch plywood 3 mm", lengthMm: 2440, widthMm: 1220, costMinor: 3450, onHand: 6, grain: "length" },
  { material: "Birch plywood 3 mm", lengthMm: 1220, widthMm: 1220, costMinor: 1890, onHand: 4, grain: "length" },
  { material: "Birch plywood 6 mm", lengthMm: 2440, widthMm: 1220, costMinor: 5290, onHand: 8, grain: "length" },
  { material: "Birch plywood 6 mm", lengthMm: 1220, widthMm: 1220, costMinor: 2880, onHand: 3, grain: "length" },
  { material: "MDF 6 mm", lengthMm: 2440, widthMm: 1220, costMinor: 2190, onHand: 5, grain: "none" },
  { material: "MDF 6 mm", lengthMm: 1220, widthMm: 1220, costMinor: 1240, onHand: 2, grain: "none" },
] as const;

export async function isEmpty(db: Database): Promise<boolean> {
  const [row] = await db.select({ n: count() }).from(t.shops);
  return row.n === 0;
}

export async function seedDemo(db: Database, today = new Date()): Promise<void> {
  const passwordHash = await hashPassword(DEMO_PASSWORD);
  const day = (offset: number) => new Date(today.getTime() + offset * 86_400_000).toISOString().slice(0, 10);

  await db.transaction(async (tx) => {
    const [shop] = await tx
      .insert(t.shops)
      .values({ name: "Tallowmere Sign & Keepsake", currency: "GBP", displayUnit: "mm", timeZone: "Europe/London", depositRule: "percent", depositPercent: 30 })
      .returning();

    const [owner] = await tx
      .insert(t.users)
      .values(DEMO_ACCOUNTS.map((account) => ({ id: generateIdFromEntropySize(10), shopId: shop.id, passwordHash, ...account })))
      .returning();

    const [birch3, birch6, mdf6] = await tx
      .insert(t.materials)
      .values([
        { shopId: shop.id, name: "Birch plywood 3 mm", kind: "plywood", thicknessUm: mm(3), note: "B/BB face, laser grade" },
        { shopId: shop.id, name: "Birch plywood 6 mm", kind: "plywood", thicknessUm: mm(6), note: "B/BB face" },
        { shopId: shop.id, name: "MDF 6 mm", kind: "mdf", thicknessUm: mm(6), note: "moisture resistant" },
      ])
      .returning();

    const byName = new Map([birch3, birch6, mdf6].map((m) => [m.name, m.id]));
    await tx.insert(t.stockPanels).values(DEMO_STOCK.map(({ material, lengthMm, widthMm, ...panel }) => ({ shopId: shop.id, materialId: byName.get(material)!, lengthUm: mm(lengthMm), widthUm: mm(widthMm), ...panel })));

    await tx.insert(t.offcuts).values([
      { shopId: shop.id, materialId: birch6.id, lengthUm: mm(812), widthUm: mm(430), location: "Rack A, slot 2" },
      { shopId: shop.id, materialId: birch6.id, lengthUm: mm(1220), widthUm: mm(286), location: "Rack A, slot 3" },
      { shopId: shop.id, materialId: birch3.id, lengthUm: mm(640), widthUm: mm(415), location: "Rack B, slot 1" },
      { shopId: shop.id, materialId: mdf6.id, lengthUm: mm(955), widthUm: mm(380), location: "Rack C, slot 4", grain: "none" },
    ]);

    const [ardent, penhaligon, brindle] = await tx
      .insert(t.customers)
      .values([
        { shopId: shop.id, name: "Ardent–Vasquez wedding", email: "celia.ardent@example.com", phone: "+44 7700 900123", notes: "Barn venue; rustic finish" },
        { shopId: shop.id, name: "Marisol Penhaligon", email: "marisol.p@example.com", phone: "+44 7700 900456", notes: "Nursery for baby Wren" },
        { shopId: shop.id, name: "Brindle & Bean café", email: "hello@brindlebean.example", phone: "+44 20 7946 0018", notes: "Engraved menu boards" },
      ])
      .returning();

    const product = async (name: string, priceMinor: number, leadTimeDays: number, parts: Omit<typeof t.productParts.$inferInsert, "productId">[]) => {
      const [row] = await tx.insert(t.products).values({ shopId: shop.id, name, priceMinor, leadTimeDays }).returning();
      await tx.insert(t.productParts).values(parts.map((part) => ({ ...part, productId: row.id })));
      return row;
    };
    const welcomeSign = await product("Welcome sign 600 × 400", 8500, 14, [
      { name: "Sign face", materialId: birch6.id, lengthUm: mm(600), widthUm: mm(400), quantity: 1, grainLocked: true },
    ]);
    const tableNumber = await product("Table number 150 × 210", 650, 10, [
      { name: "Number card", materialId: birch6.id, lengthUm: mm(210), widthUm: mm(150), quantity: 1, grainLocked: true },
    ]);
    const placeCard = await product("Place card 90 × 55, laser-cut", 180, 10, [
      { name: "Card", materialId: birch3.id, lengthUm: mm(90), widthUm: mm(55), quantity: 1, process: "laser" },
    ]);
    const namePlaque = await product("Nursery name plaque 400 × 150", 3200, 10, [
      { name: "Plaque", materialId: birch6.id, lengthUm: mm(400), widthUm: mm(150), quantity: 1, grainLocked: true },
    ]);
    const milestoneDisc = await product("Milestone disc Ø150", 700, 10, [
      { name: "Disc blank", materialId: birch6.id, lengthUm: mm(152), widthUm: mm(152), quantity: 1 },
    ]);
    const menuBoard = await product("Café menu board 500 × 350", 4200, 21, [
      { name: "Board", materialId: mdf6.id, lengthUm: mm(500), widthUm: mm(350), quantity: 1 },
      { name: "Hanging batten", materialId: mdf6.id, lengthUm: mm(500), widthUm: mm(40), quantity: 1 },
    ]);

    const [wedding, nursery, cafe] = await tx
      .insert(t.orders)
      .values([
        { shopId: shop.id, number: 1001, customerId: ardent.id, eventDate: day(32), dueDate: day(18), status: "confirmed", confirmedAt: today, confirmationSentAt: today },
        { shopId: shop.id, number: 1002, customerId: penhaligon.id, eventDate: day(24), dueDate: day(14), status: "confirmed", confirmedAt: today, confirmationSentAt: today },
        { shopId: shop.id, number: 1003, customerId: brindle.id, eventDate: day(40), dueDate: day(19), status: "draft" },
      ])
      .returning();

    await tx.insert(t.orderLines).values([
      { orderId: wedding.id, productId: welcomeSign.id, quantity: 1, unitPriceMinor: welcomeSign.priceMinor, personalisation: ["Welcome to the wedding of Celia & Marco"] },
      {
        orderId: wedding.id,
        productId: tableNumber.id,
        quantity: 18,
        unitPriceMinor: tableNumber.priceMinor,
        personalisation: Array.from({ length: 18 }, (_, i) => `Table ${i + 1}`),
      },
      { orderId: wedding.id, productId: placeCard.id, quantity: 120, unitPriceMinor: placeCard.priceMinor, personalisation: demoGuestNames(120) },
      { orderId: nursery.id, productId: namePlaque.id, quantity: 1, unitPriceMinor: namePlaque.priceMinor, personalisation: ["Wren"] },
      {
        orderId: nursery.id,
        productId: milestoneDisc.id,
        quantity: 6,
        unitPriceMinor: milestoneDisc.priceMinor,
        personalisation: ["Newborn", "1 month", "3 months", "6 months", "9 months", "1 year"],
      },
      { orderId: cafe.id, productId: menuBoard.id, quantity: 4, unitPriceMinor: menuBoard.priceMinor, personalisation: ["Breakfast", "Lunch", "Coffee", "Cakes"] },
    ]);

    // Their histories: taken over the last few days, the two confirmed just now (as confirmedAt says).
    const hoursAgo = (h: number) => new Date(today.getTime() - h * 3_600_000);
    const by = (at: Date) => ({ by: owner.id, at });
    await logOrderEvent(tx, shop.id, wedding.id, { kind: "created", lines: 3 }, by(hoursAgo(75)));
    await logOrderEvent(tx, shop.id, wedding.id, { kind: "texts", product: placeCard.name, count: 120 }, by(hoursAgo(50)));
    await logOrderEvent(tx, shop.id, nursery.id, { kind: "created", lines: 2 }, by(hoursAgo(28)));
    await logOrderEvent(tx, shop.id, cafe.id, { kind: "created", lines: 1 }, by(hoursAgo(26)));
    for (const [order, email] of [[wedding, "celia.ardent@example.com"], [nursery, penhaligon.email]] as const) {
      await logOrderEvent(tx, shop.id, order.id, { kind: "status", from: "draft", to: "confirmed" }, by(today));
      if (email) await logOrderEvent(tx, shop.id, order.id, { kind: "confirmation_sent", to: email }, by(today));
    }

    // Deposits at 30 %: the wedding paid its £125.40 (of £418.00) on the payment link; the nursery's is asked.
    await demoDeposit(tx, { shopId: shop.id, orderId: wedding.id, amountMinor: 12_540, tag: "wedding", requestedAt: today, paidAt: today });
    await demoDeposit(tx, { shopId: shop.id, orderId: nursery.id, amountMinor: 2_220, tag: "nursery", requestedAt: today, paidAt: null });

    // The saw station: one saw with a measured kerf, one sled squared a week ago (0.05 mm over 400 mm: 0.031 mm/m).
    const [sawRow] = await tx.insert(t.saws).values({ shopId: shop.id, name: "Cabinet saw", blade: "250 mm, 3.2 mm full kerf" }).returning();
    await tx.insert(t.kerfMeasurements).values({ shopId: shop.id, sawId: sawRow.id, kerfUm: mm(3.2), note: "test cut in 18 mm birch", measuredAt: new Date(today.getTime() - 7 * 86_400_000) });
    const [sledRow] = await tx.insert(t.sleds).values({ shopId: shop.id, sawId: sawRow.id, name: "Big sled", stopMinUm: mm(20), stopMaxUm: mm(1200), widestUm: mm(610) }).returning();
    await tx.insert(t.sledChecks).values({ shopId: shop.id, sledId: sledRow.id, widthFirstEndUm: 25_050, widthSecondEndUm: 25_000, stripLengthUm: mm(400), pivotDistanceUm: mm(550), checkedAt: new Date(today.getTime() - 7 * 86_400_000) });
  });
}

/**
 * Last month in the demo shop's books: two past orders cut in two batches, each made the way the shop
 * works: the planner batches the confirmed line, the packing engine plans it and the plan runner saves
 * it, the planner releases it (sheets drawn from stock, offcuts expected), the sawyer ticks every
 * set-up and racks the offcuts, and closing the batch writes its books. One transaction: all or none.
 * The engine runs on this thread with a fixed seed and clock, so the plans are the same on every machine.
 */
export async function seedDemoHistory(db: Database, today = new Date()): Promise<void> {
  const [shop] = await db.select().from(t.shops).where(eq(t.shops.name, "Tallowmere Sign & Keepsake"));
  const mats = await db.select().from(t.materials).where(eq(t.materials.shopId, shop.id));
  const birch6 = mats.find((m) => m.name === "Birch plywood 6 mm")!;
  const mdf6 = mats.find((m) => m.name === "MDF 6 mm")!;
  const lastMonth = (day: number, hour = 15) => new Date(Date.UTC(today.getUTCFullYear(), today.getUTCMonth() - 1, day, hour));
  const iso = (d: Date) => d.toISOString().slice(0, 10);
  await db.transaction(async (tx) => {
    const [hartwell, quince] = await tx
      .insert(t.customers)
      .values([
        { shopId: shop.id, name: "Hartwell christening", email: "hartwell@example.com" },
        { shopId: shop.id, name: "Quince & Co. shop", email: "signs@quince.example" },
      ])
      .returning();
    const products = await tx.select().from(t.products).where(eq(t.products.shopId, shop.id));
    const plaque = products.find((p) => p.name.startsWith("Nursery name plaque"))!;
    const menu = products.find((p) => p.name.startsWith("Café menu board"))!;
    const [christening, shopSigns] = await tx
      .insert(t.orders)
      .values([
        { shopId: shop.id, number: 990, customerId: hartwell.id, eventDate: iso(lastMonth(20)), dueDate: iso(lastMonth(12)), status: "confirmed", confirmedAt: lastMonth(2), confirmationSentAt: lastMonth(2) },
        { shopId: shop.id, number: 991, customerId: quince.id, eventDate: iso(lastMonth(25)), dueDate: iso(lastMonth(16)), status: "confirmed", confirmedAt: lastMonth(3), confirmationSentAt: lastMonth(3) },
      ])
      .returning();
    await tx.insert(t.orderLines).values([
      { orderId: christening.id, productId: plaque.id, quantity: 12, unitPriceMinor: plaque.priceMinor, personalisation: Array.from({ length: 12 }, (_, i) => `Guest plaque ${i + 1}`) },
      { orderId: shopSigns.id, productId: menu.id, quantity: 6, unitPriceMinor: menu.priceMinor, personalisation: [] },
    ]);
    // Both paid their 30 % deposit two days after confirming.
    await demoDeposit(tx, { shopId: shop.id, orderId: christening.id, amountMinor: 11_520, tag: "christening", requestedAt: lastMonth(2), paidAt: lastMonth(4) });
    await demoDeposit(tx, { shopId: shop.id, orderId: shopSigns.id, amountMinor: 7_560, tag: "quince", requestedAt: lastMonth(3), paidAt: lastMonth(5) });

    const people = await tx.select().from(t.users).where(eq(t.users.shopId, shop.id));
    const sawyer = people.find((u) => u.role === "sawyer")!;
    const owner = people.find((u) => u.role === "owner")!;
    for (const [order, customer, lines, confirmed] of [[christening, hartwell, 1, lastMonth(2)], [shopSigns, quince, 1, lastMonth(3)]] as const) {
      await logOrderEvent(tx, shop.id, order.id, { kind: "created", lines }, { by: owner.id, at: new Date(confirmed.getTime() - 86_400_000) });
      await logOrderEvent(tx, shop.id, order.id, { kind: "status", from: "draft", to: "confirmed" }, { by: owner.id, at: confirmed });
      await logOrderEvent(tx, shop.id, order.id, { kind: "confirmation_sent", to: customer.email! }, { by: owner.id, at: confirmed });
    }
    const [saw] = await tx.select().from(t.saws).where(eq(t.saws.shopId, shop.id));
    const [sled] = await tx.select().from(t.sleds).where(eq(t.sleds.shopId, shop.id));
    const settings = await getShop(shop.id, tx);
    // What the batch page's plan form offered then: the shop's kerf (the saw's was measured only after these cuts) and edge trim.
    const planSettings: t.PlanSettings = { sawId: saw.id, sledId: sled.id, kerfMm: settings.kerfUm / 1000, trimMm: settings.edgeTrimUm / 1000, stages: 2, objective: "sheets", timeLimitMs: 2000, offcutIds: [], seed: HISTORY_PLAN_SEED };
    const cuts = [
      { material: birch6, order: christening, batchedAt: lastMonth(6, 9), cutAt: lastMonth(10), rack: (i: number) => `Rack A, slot ${4 + i}` },
      { material: mdf6, order: shopSigns, batchedAt: lastMonth(9, 9), cutAt: lastMonth(14), rack: (i: number) => `Rack C, slot ${1 + i}` },
    ];
    for (const cut of cuts) {
      const at = (date: Date, minutes: number) => ({ db: tx, now: new Date(date.getTime() + minutes * 60_000) });
      const [batchId] = await createBatches(shop.id, cut.order.dueDate, [cut.material.id], at(cut.batchedAt, 0));
      const { lines } = await batchContents(batchId, tx);
      if (lines.length !== 1 || lines[0].orderId !== cut.order.id) throw new Error(`The history batch of order #${cut.order.number} took other lines too; seed the history into the demo shop as seeded.`);

      const planId = await addPlan(shop.id, batchId, planSettings, at(cut.batchedAt, 5));
      await runPlan(planId, { ...at(cut.batchedAt, 5), engine: historyEngine() });
      const [plan] = await tx.select().from(t.plans).where(eq(t.plans.id, planId));
      if (plan.status !== "done" || plan.error) throw new Error(`The history plan of order #${cut.order.number} did not come out whole: ${plan.error ?? plan.status}`);

      await releasePlan(shop.id, batchId, planId, at(cut.batchedAt, 30));
      await moveOrder(shop.id, cut.order.id, "in_production", { ...at(cut.batchedAt, 31), by: owner.id });
      // At the saw on the day: one set-up ticked every five minutes, each with its full count, then the offcuts racked as planned.
      const { setups } = (plan.result as PlanResult).plan;
      for (const [i, setup] of setups.entries()) {
        await tickSetup(shop.id, sawyer.id, batchId, i, setup.count, setups, at(cut.cutAt, 5 * (i - setups.length)));
      }
      const made = (await expectedOffcuts(batchId, tx)).filter((o) => o.status === "expected");
      const decisions = made.map((o, i) => ({ offcutId: o.id, rack: true, lengthUm: o.lengthUm, widthUm: o.widthUm, location: cut.rack(i) }));
      await closeBatchAsCut(shop.id, batchId, decisions, setups.length, at(cut.cutAt, 0));
      await moveOrder(shop.id, cut.order.id, "ready", { ...at(cut.cutAt, 60), by: owner.id });
      await moveOrder(shop.id, cut.order.id, "delivered", { ...at(cut.cutAt, 24 * 60 * 2), by: owner.id });
    }
  });
}

/** The history plans' engine: this thread, the fixed seed above and a clock that moves 0.01 ms per reading. */
export const HISTORY_PLAN_SEED = 990;
export function historyEngine() {
  let ms = 0;
  return engineOnThisThread({ now: () => (ms += 0.01) });
}

type Tx = Parameters<Parameters<Database["transaction"]>[0]>[0];

/** A demo deposit in GBP, paid (with its recorded payment) or only asked; the service's ids are invented. */
async function demoDeposit(tx: Tx, d: { shopId: string; orderId: string; amountMinor: number; tag: string; requestedAt: Date; paidAt: Date | null }) {
  const paymentIntentId = d.paidAt ? `pi_demo_${d.tag}` : null;
  const requestedAt = d.requestedAt;
  const [deposit] = await tx
    .insert(t.deposits)
    .values({ shopId: d.shopId, orderId: d.orderId, amountMinor: d.amountMinor, currency: "GBP", status: d.paidAt ? "paid" : "requested", linkToken: randomBytes(24).toString("base64url"), paymentIntentId, requestedAt, paidAt: d.paidAt })
    .returning();
  if (d.paidAt && paymentIntentId) {
    await tx.insert(t.depositMoves).values({ shopId: d.shopId, depositId: deposit.id, kind: "payment", amountMinor: d.amountMinor, currency: "GBP", eventId: `evt_demo_${d.tag}`, providerRef: paymentIntentId, occurredAt: d.paidAt });
  }
}

/** A second, smaller shop, so that each shop seeing only its own data can be tried. */
export const SECOND_SHOP_OWNER = { email: "owner@harrowgate.example", name: "Perpetua Harrowgate", role: "owner" } as const;

export async function seedSecondShop(db: Database): Promise<void> {
  const passwordHash = await hashPassword(DEMO_PASSWORD);
  await db.transaction(async (tx) => {
    const [shop] = await tx.insert(t.shops).values({ name: "Harrowgate Plaque Co.", currency: "GBP", displayUnit: "in", timeZone: "Europe/London" }).returning();
    await tx.insert(t.users).values({ id: generateIdFromEntropySize(10), shopId: shop.id, passwordHash, ...SECOND_SHOP_OWNER });
    const [oak] = await tx.insert(t.materials).values({ shopId: shop.id, name: "Oak-veneer MDF 12 mm", kind: "mdf", thicknessUm: mm(12) }).returning();
    await tx.insert(t.stockPanels).values({ shopId: shop.id, materialId: oak.id, lengthUm: mm(2440), widthUm: mm(1220), costMinor: 6400, onHand: 2, grain: "length" });
    const [customer] = await tx.insert(t.customers).values({ shopId: shop.id, name: "Lowick Parish Hall", email: "hall@lowick.example" }).returning();
    const [plaque] = await tx.insert(t.products).values({ shopId: shop.id, name: "Memorial plaque 300 × 200", priceMinor: 5500, leadTimeDays: 14 }).returning();
    await tx.insert(t.productParts).values({ productId: plaque.id, materialId: oak.id, name: "Plaque", lengthUm: mm(300), widthUm: mm(200), grainLocked: true });
    const [order] = await tx.insert(t.orders).values({ shopId: shop.id, number: 501, customerId: customer.id, eventDate: "2027-03-14", dueDate: "2027-02-28", status: "confirmed" }).returning();
    await tx.insert(t.orderLines).values({ orderId: order.id, productId: plaque.id, quantity: 1, unitPriceMinor: 5500, personalisation: ["In memory of the founders"] });
  });
}

// Run directly (bin/start): seed only an empty database, so a second start keeps the shop's data.
if (import.meta.url === `file://${process.argv[1]}`) {
  const { createDatabase } = await import("../app/db.server");
  const { client, db } = createDatabase(process.env.DATABASE_URL!, { max: 1 });
  try {
    if (await isEmpty(db)) {
      await seedDemo(db);
      await seedDemoHistory(db);
      await seedSecondShop(db);
      console.log("Loaded the demo shops (Tallowmere Sign & Keepsake; Harrowgate Plaque Co.).");
    }
  } finally {
    await client.end();
  }
}
