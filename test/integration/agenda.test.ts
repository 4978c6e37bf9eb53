// The home page's list of what is waiting, against a real database: what counts as due soon, in no
// batch, at the saw, a sled to check or a deposit unpaid, what each role is shown, and no other shop's work.
import { eq } from "drizzle-orm";
import request from "supertest";
import { beforeAll, describe, expect, it } from "vitest";
import * as t from "../../db/schema";
import { appServer, visible } from "../support/app";
import { createShop, signIn, type TestShop } from "../support/factories";
import { getDb } from "~/db.server";
import { addDays, todayIso } from "~/lib/dates";
import { shopAgenda } from "~/models/agenda.server";

// Dates relative to today: the home page reads the real clock.
const now = new Date();
const today = todayIso(now);
const day = (offset: number) => addDays(today, offset);
const server = await appServer();
let shop: TestShop;

async function seedShop(s: TestShop, customerName: string) {
  const db = getDb();
  const [birch] = await db.insert(t.materials).values({ shopId: s.id, name: "Birch 6 mm", kind: "plywood", thicknessUm: 6000 }).returning();
  // MDF has sheets on hand and a batch waiting; birch has batches and no sheet (a sold-out size counts as none)
  const [mdf] = await db.insert(t.materials).values({ shopId: s.id, name: "MDF 6 mm", kind: "mdf", thicknessUm: 6000 }).returning();
  await db.insert(t.stockPanels).values([
    { shopId: s.id, materialId: mdf.id, lengthUm: 2_440_000, widthUm: 1_220_000, costMinor: 2480, onHand: 3 },
    { shopId: s.id, materialId: birch.id, lengthUm: 2_440_000, widthUm: 1_220_000, costMinor: 4600, onHand: 0 },
  ]);
  await db.insert(t.batches).values({ shopId: s.id, number: 8, materialId: mdf.id, dueBy: day(20), status: "planned" });
  const [product] = await db.insert(t.products).values({ shopId: s.id, name: "Table number", priceMinor: 450 }).returning();
  await db.insert(t.productParts).values({ productId: product.id, materialId: birch.id, name: "Number card", lengthUm: 210_000, widthUm: 150_000 });
  const [customer] = await db.insert(t.customers).values({ shopId: s.id, name: customerName }).returning();
  const order = async (number: number, status: (typeof t.orderStatusEnum.enumValues)[number], dueDate: string, withLine = false) => {
    const [o] = await db.insert(t.orders).values({ shopId: s.id, number, customerId: customer.id, eventDate: dueDate, dueDate, status }).returning();
    if (withLine) await db.insert(t.orderLines).values({ orderId: o.id, productId: product.id, quantity: 18, unitPriceMinor: 450 });
    return o;
  };
  const soon = await order(1, "confirmed", day(3), true);
  await order(2, "draft", day(-2));
  await order(3, "confirmed", day(60), true); // beyond 14 days, and beyond the 21 days of batching
  const ready = await order(4, "ready", day(1));
  const cancelled = await order(5, "cancelled", day(2));
  const [, , cut] = await db
    .insert(t.batches)
    .values([
      { shopId: s.id, number: 7, materialId: birch.id, dueBy: day(18), status: "open" },
      { shopId: s.id, number: 6, materialId: birch.id, dueBy: day(8), status: "released" },
      { shopId: s.id, number: 5, materialId: birch.id, dueBy: day(-22), status: "cut" },
    ])
    .returning();
  // one spoiled part waits to be cut again; one other is in a batch already
  const recut = { shopId: s.id, materialId: birch.id, spoiledInBatchId: cut.id, partName: "Number card", lengthUm: 210_000, widthUm: 150_000, grainLocked: false, process: "saw" as const, reason: "tear-out" };
  await db.insert(t.recutParts).values([recut, { ...recut, batchId: cut.id }]);
  const [sled] = await db.insert(t.sleds).values({ shopId: s.id, name: "Big sled", stopMinUm: 20_000, stopMaxUm: 1_200_000, widestUm: 610_000 }).returning();
  await db.insert(t.sledChecks).values({ shopId: s.id, sledId: sled.id, widthFirstEndUm: 25_000, widthSecondEndUm: 25_000, stripLengthUm: 400_000, pivotDistanceUm: 500_000, checkedAt: new Date(now.getTime() - 120 * 86_400_000) });
  const token = () => `tok${Math.random().toString(36).slice(2)}${Math.random().toString(36).slice(2)}`;
  await db.insert(t.deposits).values([
    { shopId: s.id, orderId: soon.id, amountMinor: 1500, currency: "EUR", linkToken: token() },
    { shopId: s.id, orderId: cancelled.id, amountMinor: 900, currency: "EUR", linkToken: token() },
    { shopId: s.id, orderId: ready.id, amountMinor: 2000, currency: "EUR", linkToken: token(), status: "paid" },
  ]);
}

beforeAll(async () => {
  shop = await createShop("Agenda");
  await seedShop(shop, "Ardent–Vasquez wedding");
  const other = await createShop("Agenda elsewhere");
  await seedShop(other, "Someone else's wedding");
});

describe("what is waiting on the shop", () => {
  it("gathers for the owner every kind of work, this shop's only", async () => {
    const facts = await shopAgenda(shop.id, "owner", now);
    // open orders due within 14 days, soonest first: not the ready, cancelled or later ones
    expect(facts.dueSoon?.total).toBe(2);
    expect(facts.dueSoon?.orders.map((o) => [o.number, o.dueDate, o.status, o.customerName])).toEqual([
      [2, day(-2), "draft", "Ardent–Vasquez wedding"],
      [1, day(3), "confirmed", "Ardent–Vasquez wedding"],
    ]);
    expect(facts.drafts).toBe(1);
    expect(facts.ready).toBe(1);
    // the confirmed line due within 21 days (order 3's is due later), and the spoiled part in no batch
    expect(facts.unbatched).toEqual({ lines: 1, recuts: 1, dueBy: day(21) });
    expect(facts.batches?.map((b) => [b.number, b.status])).toEqual([
      [6, "released"],
      [7, "open"],
      [8, "planned"],
    ]);
    // birch's open batch waits with no full sheet on hand (the released one has its sheets already)
    expect(facts.sheetsOut).toEqual([{ materialName: "Birch 6 mm", batches: 1 }]);
    expect(facts.sleds?.list.map((s) => s.name)).toEqual(["Big sled"]);
    expect(facts.sleds?.toleranceUmPerM).toBe(150);
    // asked and unpaid, on an order that is not cancelled
    expect(facts.unpaidDeposits).toEqual({ count: 1, amounts: [{ amountMinor: 1500, currency: "EUR" }] });
  });

  it("gives each role only what it may read: the sawyer the saw and the sleds, the bookkeeper orders and deposits", async () => {
    const sawyer = await shopAgenda(shop.id, "sawyer", now);
    expect(sawyer.dueSoon).toBeUndefined();
    expect(sawyer.unbatched).toBeUndefined();
    expect(sawyer.unpaidDeposits).toBeUndefined();
    expect(sawyer.batches?.map((b) => b.status)).toEqual(["released"]);
    expect(sawyer.sleds?.list).toHaveLength(1);

    const books = await shopAgenda(shop.id, "bookkeeper", now);
    expect(books.dueSoon?.total).toBe(2);
    expect([books.drafts, books.ready, books.unbatched, books.batches, books.sleds, books.sheetsOut]).toEqual([undefined, undefined, undefined, undefined, undefined, undefined]);
    expect(books.unpaidDeposits?.count).toBe(1);

    const planner = await shopAgenda(shop.id, "planner", now);
    expect(planner.unbatched?.lines).toBe(1);
    expect(planner.batches).toHaveLength(3);
    expect(planner.sheetsOut).toHaveLength(1);
    expect(sawyer.sheetsOut).toBeUndefined();
    expect([planner.drafts, planner.sleds, planner.unpaidDeposits]).toEqual([undefined, undefined, undefined]);
  });

  it("shows on the home page, each entry linked to where the work is done", async () => {
    const owner = await signIn(server, shop.users.owner);
    const res = await request(server).get("/").set("Cookie", owner);
    expect(res.status).toBe(200);
    const text = visible(res.text);
    expect(text).toContain("Waiting on the shop");
    expect(text).toContain("2 orders due to leave the shop within 14 days");
    expect(text).toContain("overdue"); // the draft, due two days ago
    expect(text).toContain("1 draft order not confirmed yet");
    expect(text).toContain("1 order ready to hand over");
    expect(text).toContain("1 sled to check for square");
    expect(text).toContain("1 material with no full sheet in stock");
    expect(text).toContain("1 order line and 1 spoiled part to cut again in no batch yet");
    expect(text).toContain("1 deposit asked and not paid, €15.00 in all");
    expect(text).not.toContain("Someone else's wedding");
    expect(res.text).toContain('href="/orders?status=draft"');
    expect(res.text).toContain('href="/sleds"');

    const sawyer = await signIn(server, shop.users.sawyer);
    const floor = visible((await request(server).get("/").set("Cookie", sawyer)).text);
    expect(floor).toContain("1 batch at the saw");
    expect(floor).not.toContain("draft order");
    expect(floor).not.toContain("deposit asked");
  });
});

describe("the shop's day", () => {
  it("is counted where the shop is: a New York evening is still that day", async () => {
    const ny = await createShop("Agenda NY");
    await getDb().update(t.shops).set({ timeZone: "America/New_York" }).where(eq(t.shops.id, ny.id));
    const evening = new Date("2027-03-10T03:00:00Z"); // 22:00 on 9 March in New York (UTC−5 until 14 March, IANA rules)
    expect((await shopAgenda(ny.id, "owner", evening)).today).toBe("2027-03-09");
    const utc = await createShop("Agenda UTC");
    expect((await shopAgenda(utc.id, "owner", evening)).today).toBe("2027-03-10");
  });
});
