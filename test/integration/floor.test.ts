import { and, eq } from "drizzle-orm";
import request from "supertest";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import * as t from "../../db/schema";
import { appServer, visible } from "../support/app";
import { batchScenario } from "../support/batch-factories";
import { createShop, signIn } from "../support/factories";
import { getDb } from "~/db.server";
import { startPlanRunner, stopPlanRunner } from "~/jobs/plan-runner.server";
import { itemsOf, mergeBatchParts } from "~/lib/batch-parts";
import { batchSources, createBatches, proposeBatches } from "~/models/batches.server";
import { releasePlan, requestPlan } from "~/models/plans.server";

const server = await appServer();
const db = getDb();

beforeAll(() => startPlanRunner());
afterAll(() => stopPlanRunner());

async function releasedBatch() {
  const s = await batchScenario();
  const [offcut] = await db.insert(t.offcuts).values({ shopId: s.shop.id, materialId: s.birch6.id, lengthUm: 1_300_000, widthUm: 700_000, location: "Rack A" }).returning();
  const [batchId] = await createBatches(s.shop.id, "2027-01-15", [s.birch6.id]);
  const planId = await requestPlan(s.shop.id, batchId, { kerfMm: 3.2, trimMm: 10, stages: 2, objective: "sheets", timeLimitMs: 300, offcutIds: [offcut.id], seed: 3 });
  for (let i = 0; i < 200; i++) {
    const [p] = await db.select().from(t.plans).where(eq(t.plans.id, planId));
    if (p.status === "done") break;
    if (p.status === "failed") throw new Error(p.error ?? "plan failed");
    await new Promise((r) => setTimeout(r, 100));
  }
  await releasePlan(s.shop.id, batchId, planId);
  const [plan] = await db.select().from(t.plans).where(eq(t.plans.id, planId));
  const setups = (plan.result as { plan: { setups: { count: number }[] } }).plan.setups;
  return { ...s, batchId, planId, setups, offcut };
}

describe("the floor", () => {
  it("ticks set-ups through the API (they survive a reload), spoils a part that comes back in the next batch, and closes the batch with the rack in one step", async () => {
    const r = await releasedBatch();
    const sawyer = await signIn(server, r.shop.users.sawyer);
    const api = `/api/batches/${r.batchId}/floor`;

    const page = await request(server).get(`/saw/${r.batchId}`).set("Cookie", sawyer);
    expect(page.status).toBe(200);
    expect(visible(page.text)).toContain(`0 of ${r.setups.length} set-ups done`);
    expect(visible(page.text)).toContain("Offcut 1300 × 700 mm from Rack A");

    const bad = await request(server).post(api).set("Cookie", sawyer).send({ setupIndex: "first" });
    expect(bad.status).toBe(400);
    expect(bad.body.field).toBe("setupIndex");
    expect((await request(server).post(api).set("Cookie", sawyer).send({ setupIndex: 99 })).status).toBe(409);

    const early = await request(server).post(`/saw/${r.batchId}`).set("Cookie", sawyer).type("form").send({ intent: "close" });
    expect(early.status).toBe(409);
    expect(visible(early.text)).toContain(`${r.setups.length} of ${r.setups.length} set-ups are not ticked yet`);

    for (const [i, s] of r.setups.entries()) {
      const res = await request(server).post(api).set("Cookie", sawyer).send({ setupIndex: i, countCut: i === 0 ? s.count - 1 : s.count });
      expect(res.status).toBe(200);
    }
    const state = await request(server).get(api).set("Cookie", sawyer);
    expect(state.body.ticks).toHaveLength(r.setups.length);
    expect(state.body.ticks[0].countCut).toBe(r.setups[0].count - 1);
    const reloaded = await request(server).get(`/saw/${r.batchId}`).set("Cookie", sawyer);
    expect(visible(reloaded.text)).toContain(`${r.setups.length} of ${r.setups.length} set-ups done`);

    const planner = await signIn(server, r.shop.users.planner);
    expect((await request(server).get(api).set("Cookie", planner)).status).toBe(200); // the planner's view follows
    expect(visible((await request(server).get(`/saw/${r.batchId}`).set("Cookie", planner)).text)).toContain("No part reported spoiled yet.");
    expect((await request(server).post(api).set("Cookie", planner).send({ setupIndex: 0 })).status).toBe(403);

    const parts = mergeBatchParts(await batchSources(r.batchId));
    const numberCard = parts.find((p) => p.name === "Number card")!;
    const noReason = await request(server).post(`/saw/${r.batchId}`).set("Cookie", sawyer).type("form").send({ intent: "spoil", part: numberCard.key, quantity: "1", reason: "" });
    expect(noReason.status).toBe(400);
    expect(noReason.text).toContain("Say what went wrong");
    // The sawyer says whose card it was: the second table card, not merely the row's first piece.
    const tableTwo = itemsOf(numberCard.origins).find((i) => i.origin.text === "Table 2")!;
    const spoil = (fields: Record<string, string>) => request(server).post(`/saw/${r.batchId}`).set("Cookie", sawyer).type("form").send({ intent: "spoil", part: numberCard.key, reason: "tear-out on the face", ...fields });
    const noSuchItem = await spoil({ item: "99", quantity: "1" });
    expect(noSuchItem.status).toBe(400);
    expect(visible(noSuchItem.text)).toContain("Which item: choose one of this part"); // the apostrophe comes escaped
    const tooMany = await spoil({ item: String(tableTwo.first), quantity: "2" });
    expect(tooMany.status).toBe(400);
    expect(visible(tooMany.text)).toContain("How many: that item has 1 piece of this part.");
    const moreThanTheBatch = await spoil({ quantity: String(numberCard.quantity + 1) });
    expect(visible(moreThanTheBatch.text)).toContain(`How many: this batch has ${numberCard.quantity} of this part.`);
    expect(await db.select().from(t.recutParts).where(eq(t.recutParts.spoiledInBatchId, r.batchId))).toHaveLength(0);
    const spoiled = await spoil({ item: String(tableTwo.first), quantity: "1" });
    expect(spoiled.status).toBe(302);

    const expected = await db.select().from(t.offcuts).where(and(eq(t.offcuts.sourceBatchId, r.batchId), eq(t.offcuts.status, "expected")));
    expect(expected.length).toBeGreaterThan(0);
    const [keep, ...rest] = expected;
    const form: Record<string, string> = { intent: "close", [`rack-${keep.id}`]: "on", [`length-${keep.id}`]: "900", [`width-${keep.id}`]: "abc", [`location-${keep.id}`]: "Rack B, slot 1" };
    const badSize = await request(server).post(`/saw/${r.batchId}`).set("Cookie", sawyer).type("form").send(form);
    expect(badSize.status).toBe(400);
    expect(badSize.text).toContain("Width");
    form[`width-${keep.id}`] = "351.5";
    const closed = await request(server).post(`/saw/${r.batchId}`).set("Cookie", sawyer).type("form").send(form);
    expect(closed.status).toBe(302);
    const after = visible((await request(server).get(`/saw/${r.batchId}`).set("Cookie", sawyer)).text);
    expect(after).toContain("goes into the next batch");
    expect(after).not.toContain("reported spoiled");

    const [batch] = await db.select().from(t.batches).where(eq(t.batches.id, r.batchId));
    expect(batch.status).toBe("cut");
    const [racked] = await db.select().from(t.offcuts).where(eq(t.offcuts.id, keep.id));
    expect(racked).toMatchObject({ status: "racked", lengthUm: 900_000, widthUm: 351_500, location: "Rack B, slot 1" });
    for (const o of rest) expect((await db.select().from(t.offcuts).where(eq(t.offcuts.id, o.id)))[0].status).toBe("discarded");
    const [used] = await db.select().from(t.offcuts).where(eq(t.offcuts.id, r.offcut.id));
    expect(used.status).toBe("used");
    expect((await request(server).post(api).set("Cookie", sawyer).send({ setupIndex: 0 })).status).toBe(409);

    // The spoiled card comes back, with its table text, for the next batch.
    const proposals = await proposeBatches(r.shop.id, "2027-01-15");
    const six = proposals.find((p) => p.materialId === r.birch6.id)!;
    expect(six.recuts).toHaveLength(1);
    const [next] = await createBatches(r.shop.id, "2027-01-15", [r.birch6.id]);
    const again = mergeBatchParts(await batchSources(next));
    expect(again.map((p) => [p.name, p.quantity, p.origins[0].text, p.origins[0].itemIndex])).toEqual([["Number card", 1, "Table 2", 1]]);
  });

  it("another shop's batch is not at this saw; a bookkeeper has no floor", async () => {
    const r = await releasedBatch();
    const other = await createShop("Other floor");
    const stranger = await signIn(server, other.users.sawyer);
    expect((await request(server).get(`/saw/${r.batchId}`).set("Cookie", stranger)).status).toBe(404);
    expect((await request(server).post(`/api/batches/${r.batchId}/floor`).set("Cookie", stranger).send({ setupIndex: 0 })).status).toBe(404);
    const bookkeeper = await signIn(server, r.shop.users.bookkeeper);
    expect((await request(server).get(`/saw/${r.batchId}`).set("Cookie", bookkeeper)).status).toBe(403);
  });
});
