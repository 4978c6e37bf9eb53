// Last month in the demo shop (db/seed.ts seedDemoHistory) went through the app's own flow: a batch
// of each order's line, a plan from the packing engine saved by the plan runner, released, every
// set-up ticked and the batch closed as cut. These tests read what that left and check it against
// the validator, the ledger code and sums worked out here.
import { and, eq, inArray } from "drizzle-orm";
import request from "supertest";
import { beforeAll, describe, expect, it } from "vitest";
import * as t from "../../db/schema";
import { DEMO_PASSWORD, DEMO_STOCK, historyEngine, seedDemo, seedDemoHistory } from "../../db/seed";
import { appServer, visible } from "../support/app";
import { signIn } from "../support/factories";
import { getDb } from "~/db.server";
import { batchLedger, ledgerFigures } from "~/lib/ledger";
import { validatePlan } from "~/lib/packing";
import { chosenPlan } from "~/models/floor.server";
import { buildPackingJob } from "~/models/plan-job.server";
import { stockUse } from "~/models/plans.server";
import { getShop } from "~/models/shops.server";

const server = await appServer();
const db = getDb();
let shopId: string;
/** The history batches by order number, with the batch row and its chosen plan. */
const history = new Map<number, { batch: typeof t.batches.$inferSelect; plan: NonNullable<Awaited<ReturnType<typeof chosenPlan>>> }>();

beforeAll(async () => {
  // Other suites may have seeded the demo shop already, with or without its history.
  let [demo] = await db.select().from(t.shops).where(eq(t.shops.name, "Tallowmere Sign & Keepsake"));
  if (!demo) {
    await seedDemo(db);
    [demo] = await db.select().from(t.shops).where(eq(t.shops.name, "Tallowmere Sign & Keepsake"));
  }
  if ((await db.select().from(t.batchCosts).where(eq(t.batchCosts.shopId, demo.id))).length === 0) await seedDemoHistory(db);
  shopId = demo.id;
  const rows = await db
    .select({ batch: t.batches, orderNumber: t.orders.number })
    .from(t.batches)
    .innerJoin(t.batchLines, eq(t.batchLines.batchId, t.batches.id))
    .innerJoin(t.orderLines, eq(t.orderLines.id, t.batchLines.orderLineId))
    .innerJoin(t.orders, eq(t.orders.id, t.orderLines.orderId))
    .where(and(eq(t.batches.shopId, shopId), inArray(t.orders.number, [990, 991])));
  for (const { batch, orderNumber } of rows) history.set(orderNumber, { batch, plan: (await chosenPlan(shopId, batch.id))! });
});

describe("the demo's history batches", () => {
  it("are cut batches whose chosen plan passes the packing validator, and the seed's engine makes the same plan again from the same job", async () => {
    expect([...history.keys()].sort()).toEqual([990, 991]);
    const shop = await getShop(shopId);
    for (const [number, { batch, plan }] of history) {
      expect(batch.status, `#${number}`).toBe("cut");
      expect(plan, `#${number} has a chosen plan`).not.toBeNull();
      expect(plan.result.plan.unplaced).toEqual([]);
      // The job rebuilt from the batch as the plan runner builds it (sheets are not capped by the count on hand, so drawing them changes nothing).
      const { job } = await buildPackingJob(shop, batch, plan.settings);
      expect(validatePlan(job, plan.result.plan)).toMatchObject({ ok: true });
      // A fixed seed and clock: the plan is the same on every machine.
      const again = await historyEngine()("again", job);
      expect(again.kind).toBe("done");
      expect(again.kind === "done" && again.plan).toEqual(plan.result.plan);
    }
  });

  it("have ledger rows equal to what the ledger code computes from their plans and the offcuts racked", async () => {
    // Parts area by hand from the products (DESIGN.md's demo): 12 plaques of 400 × 150 mm; 6 menu boards of 500 × 350 mm, each with a 500 × 40 mm batten.
    const partsByHand = new Map([
      [990, 12 * 400 * 150], // 720,000 mm²
      [991, 6 * (500 * 350 + 500 * 40)], // 1,170,000 mm²
    ]);
    for (const [number, { batch, plan }] of history) {
      const [row] = await db.select().from(t.batchCosts).where(eq(t.batchCosts.batchId, batch.id));
      const racked = await db.select().from(t.offcuts).where(and(eq(t.offcuts.sourceBatchId, batch.id), eq(t.offcuts.status, "racked")));
      const panels = await db.select().from(t.stockPanels).where(eq(t.stockPanels.materialId, batch.materialId));
      const [order] = await db.select().from(t.orders).where(and(eq(t.orders.shopId, shopId), eq(t.orders.number, number)));
      const { plan: packed, stockRefs } = plan.result;
      const sheets = packed.sheets.map((s) => ({
        kind: stockRefs[s.stockId].kind,
        lengthUm: Math.round(s.length * 1000),
        widthUm: Math.round(s.width * 1000),
        costMinor: stockRefs[s.stockId].costMinor,
        partsAreaMm2: Math.round(s.placements.reduce((a, p) => a + p.length * p.width, 0)),
      }));
      const ledger = batchLedger({
        sheets,
        kerfLossMm2: packed.metrics.kerfLoss,
        racked,
        ratePerMm2: Math.min(...panels.map((p) => p.costMinor / (p.lengthUm * p.widthUm))) * 1e6, // the material's cheapest sheet price per area
        spoiled: [],
        orders: [{ orderId: order.id, orderNumber: number, partsAreaMm2: partsByHand.get(number)! }],
      });
      const { batchId: _b, shopId: _s, materialId: _m, cutAt, panels: keptPanels, allocations, ...figures } = row;
      expect(figures, `#${number}`).toEqual(ledgerFigures(ledger));
      expect(keptPanels).toEqual(sheets);
      expect(allocations).toEqual(ledger.allocations);
      expect(cutAt).toEqual(batch.cutAt);

      // Independent sums: the parts the plan placed are the products' parts; the stock drawn is the panels' catalogue sizes
      // and prices; every mm² of the stock is a part, an offcut on the rack, kerf or scrap; the order carries the whole net cost.
      expect(row.partsAreaMm2).toBe(partsByHand.get(number));
      expect(row.stockAreaMm2).toBe(packed.sheets.reduce((a, s) => a + Math.round((stockRefs[s.stockId].lengthUm * stockRefs[s.stockId].widthUm) / 1e6), 0));
      expect(row.costDrawnMinor).toBe(packed.sheets.reduce((a, s) => a + panels.find((p) => p.id === stockRefs[s.stockId].id)!.costMinor, 0));
      expect(row.rackedAreaMm2).toBe(racked.reduce((a, o) => a + Math.round((o.lengthUm * o.widthUm) / 1e6), 0));
      expect(row.partsAreaMm2 + row.rackedAreaMm2 + row.kerfLossMm2 + row.scrapAreaMm2).toBe(row.stockAreaMm2);
      expect(allocations.reduce((a, x) => a + x.costMinor, 0)).toBe(row.costDrawnMinor - row.valueReturnedMinor);
      expect(row.cutAt.toISOString().slice(0, 7)).toBe(new Date(Date.UTC(new Date().getUTCFullYear(), new Date().getUTCMonth() - 1, 1)).toISOString().slice(0, 7)); // last month
    }
  });

  it("left the stock and the rack as the floor leaves them: sheets drawn off the count on hand, every planned offcut racked", async () => {
    const materials = await db.select().from(t.materials).where(eq(t.materials.shopId, shopId));
    const panels = await db.select().from(t.stockPanels).where(eq(t.stockPanels.shopId, shopId));
    // Every batch of the shop that went to the saw drew its sheets (other suites may release demo batches too).
    const sent = await db.select().from(t.batches).where(and(eq(t.batches.shopId, shopId), inArray(t.batches.status, ["released", "cut", "closed"])));
    const drawn = new Map<string, number>();
    for (const b of sent) for (const [panelId, n] of stockUse((await chosenPlan(shopId, b.id))!.result).panels) drawn.set(panelId, (drawn.get(panelId) ?? 0) + n);
    expect([...drawn.values()].reduce((a, b) => a + b, 0)).toBeGreaterThanOrEqual(2); // the two history batches at least
    for (const opening of DEMO_STOCK) {
      const materialId = materials.find((m) => m.name === opening.material)!.id;
      const panel = panels.find((p) => p.materialId === materialId && p.lengthUm === opening.lengthMm * 1000 && p.widthUm === opening.widthMm * 1000)!;
      expect(panel.onHand, `${opening.material} ${opening.lengthMm} × ${opening.widthMm}`).toBe(opening.onHand - (drawn.get(panel.id) ?? 0));
    }
    for (const [number, { batch, plan }] of history) {
      const made = await db.select().from(t.offcuts).where(eq(t.offcuts.sourceBatchId, batch.id));
      const planned = plan.result.plan.sheets.flatMap((s) => s.offcuts.map((o) => [Math.round(o.length * 1000), Math.round(o.width * 1000)]));
      expect(made.map((o) => [o.lengthUm, o.widthUm]).sort(), `#${number}`).toEqual(planned.sort());
      expect(new Set(made.map((o) => o.status))).toEqual(new Set(["racked"]));
      expect(new Set(made.map((o) => o.location)).size).toBe(made.length); // each in a place of its own
    }
  });

  it("show their plan and set-up sheet on the batch page, and their orders are delivered", async () => {
    const owner = await signIn(server, { email: "owner@tallowmere.example", password: DEMO_PASSWORD });
    for (const [number, { batch, plan }] of history) {
      const page = visible((await request(server).get(`/batches/${batch.id}`).set("Cookie", owner)).text);
      expect(page).not.toContain("No plan is kept");
      expect(page).toMatch(new RegExp(`Plan ${plan.number} <span[^>]*>\\(released\\)</span>`));
      const view = await request(server).get(`/batches/${batch.id}/plans/${batch.chosenPlanId}`).set("Cookie", owner);
      expect(view.status).toBe(200);
      const sheet = await request(server).get(`/batches/${batch.id}/setup-sheet?paper=a4`).set("Cookie", owner);
      expect(sheet.status).toBe(200);
      expect(sheet.headers["content-type"]).toBe("application/pdf");
      const [order] = await db.select().from(t.orders).where(and(eq(t.orders.shopId, shopId), eq(t.orders.number, number)));
      expect(order.status).toBe("delivered");
    }
  });
});
