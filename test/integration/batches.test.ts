import { readFileSync } from "node:fs";
import { and, eq, inArray, sql } from "drizzle-orm";
import request from "supertest";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import * as t from "../../db/schema";
import { appServer, visible } from "../support/app";
import { batchScenario as scenario, cutBatch } from "../support/batch-factories";
import { createShop, signIn } from "../support/factories";
import { waitForMail } from "../support/outbox";
import { getDb } from "~/db.server";
import { startPlanRunner, stopPlanRunner } from "~/jobs/plan-runner.server";
import { batchSources, createBatches, getBatch, holdLines, moveLines, proposalPreviews, proposeBatches } from "~/models/batches.server";
import { mergeBatchParts } from "~/lib/batch-parts";
import { formatMoney } from "~/lib/money";
import { BATCH_LINES_SHOWN, proposalPreview } from "~/lib/batches";
import { PlanStateError, releasePlan, requestPlan } from "~/models/plans.server";
import { createOrder } from "~/models/orders.server";
import { spoilPart } from "~/models/floor.server";

const server = await appServer();
const db = getDb();
const mm = (n: number) => n * 1000;
const settings = (over: Partial<t.PlanSettings> = {}): t.PlanSettings => ({ kerfMm: 3.2, trimMm: 10, stages: 2, objective: "sheets", timeLimitMs: 300, offcutIds: [], seed: 7, ...over });

beforeAll(async () => {
  await startPlanRunner();
});
afterAll(async () => {
  await stopPlanRunner();
});

async function waitForPlan(planId: string, statuses: string[], timeoutMs = 20_000) {
  const deadline = Date.now() + timeoutMs;
  for (;;) {
    const [row] = await db.select().from(t.plans).where(eq(t.plans.id, planId));
    if (statuses.includes(row.status)) return row;
    if (Date.now() > deadline) throw new Error(`plan still ${row.status} after ${timeoutMs} ms`);
    await new Promise((r) => setTimeout(r, 100));
  }
}

describe("proposing and adjusting batches", () => {
  let s: Awaited<ReturnType<typeof scenario>>;
  beforeAll(async () => {
    s = await scenario();
  });

  it("proposes one batch per material of the confirmed lines due by the date, and no drafts or later orders", async () => {
    const proposals = await proposeBatches(s.shop.id, "2027-01-15");
    expect(proposals.map((p) => p.materialName).sort()).toEqual(["Birch plywood 3 mm", "Birch plywood 6 mm"]);
    const six = proposals.find((p) => p.materialId === s.birch6.id)!;
    expect(six.lines.map((l) => `${l.orderNumber}:${l.productName}`).sort()).toEqual([`${s.party.number}:Table number`, `${s.wedding.number}:Table number`, `${s.wedding.number}:Welcome sign`].sort());
    expect(six.lines.some((l) => l.orderNumber === s.draft.number || l.orderNumber === s.later.number)).toBe(false);
  });

  it("the batches page's preview, counted and cut down in PostgreSQL, equals proposalPreview of every proposed line", async () => {
    for (const limit of [1, 2, 12]) {
      const expected = (await proposeBatches(s.shop.id, "2027-01-15")).map((p) => proposalPreview(p, limit));
      expect(await proposalPreviews(s.shop.id, "2027-01-15", limit)).toEqual(expected);
    }
    const cut = await proposalPreviews(s.shop.id, "2027-01-15", 2);
    const six = cut.find((p) => p.materialId === s.birch6.id)!;
    expect([six.lines.length, six.lineCount, six.notListed]).toEqual([2, 3, 1]);
    const every = (await proposeBatches(s.shop.id, "2027-01-15")).find((p) => p.materialId === s.birch6.id)!;
    expect(six.itemCount).toBe(every.lines.reduce((n, l) => n + l.quantity, 0)); // counts every line, not only those shown
  });

  it("creates the batches; then nothing is left to propose, and the parts merge keeping every origin", async () => {
    const ids = await createBatches(s.shop.id, "2027-01-15");
    expect(ids).toHaveLength(2);
    expect(await proposeBatches(s.shop.id, "2027-01-15")).toEqual([]);
    const six = (await Promise.all(ids.map((id) => getBatch(s.shop.id, id)))).find((b) => b!.materialId === s.birch6.id)!;
    const parts = mergeBatchParts(await batchSources(six.id));
    const numbers = parts.find((p) => p.name === "Number card")!;
    expect(numbers.quantity).toBe(5); // 3 from the wedding + 2 from the party, one row
    expect(numbers.origins.map((o) => `${o.orderNumber}:${o.text}`)).toEqual([
      `${s.wedding.number}:Table 1`, `${s.wedding.number}:Table 2`, `${s.wedding.number}:Table 3`, `${s.party.number}:Table A`, `${s.party.number}:Table B`,
    ]);
    expect(parts.find((p) => p.name === "Sign face")!.quantity).toBe(1);
  });

  it("the batch page ships each row's counts; opening a row reads its copies and texts from the API", async () => {
    const [six] = await db.select().from(t.batches).where(and(eq(t.batches.shopId, s.shop.id), eq(t.batches.materialId, s.birch6.id)));
    const planner = await signIn(server, s.shop.users.planner);
    const page = await request(server).get(`/batches/${six.id}`).set("Cookie", planner);
    expect(visible(page.text)).toContain("5 from 2 orders");
    expect(page.text).not.toContain("Table B"); // neither in the markup nor in the loader's data
    const key = "saw:210000x150000:locked";
    const origins = await request(server).get(`/api/batches/${six.id}/origins?part=${encodeURIComponent(key)}`).set("Cookie", planner);
    expect(origins.status).toBe(200);
    expect(origins.body).toEqual({
      part: key,
      quantity: 5,
      origins: [
        ...["Table 1", "Table 2", "Table 3"].map((text) => `#${s.wedding.number} Ardent–Vasquez wedding · Table number · ${text}`),
        ...["Table A", "Table B"].map((text) => `#${s.party.number} Penhaligon party · Table number · ${text}`),
      ],
    });
    const unknown = await request(server).get(`/api/batches/${six.id}/origins?part=saw:1x1:free`).set("Cookie", planner);
    expect(unknown.status).toBe(404);
    expect(unknown.body.error).toMatch(/^part: /);
    const stranger = await signIn(server, (await createShop("Stranger")).users.planner);
    expect((await request(server).get(`/api/batches/${six.id}/origins?part=${encodeURIComponent(key)}`).set("Cookie", stranger)).status).toBe(404);
  });

  it("moves a line to another batch of the same material, and holds one back out of proposals until released", async () => {
    const [six] = await db.select().from(t.batches).where(and(eq(t.batches.shopId, s.shop.id), eq(t.batches.materialId, s.birch6.id)));
    const [second] = await createBatchFor(s.shop.id, s.birch6.id);
    const [line] = await db.select().from(t.orderLines).where(eq(t.orderLines.orderId, s.party.id));
    expect(await moveLines(s.shop.id, six.id, [line.id], second)).toBe(true);
    expect((await getBatch(s.shop.id, second))!.lines.map((l) => l.lineId)).toEqual([line.id]);

    expect(await holdLines(s.shop.id, second, [line.id])).toBe(true);
    expect((await getBatch(s.shop.id, second))!.lines).toEqual([]);
    expect((await proposeBatches(s.shop.id, "2027-01-15")).flatMap((p) => p.lines)).toEqual([]);
    const owner = await signIn(server, s.shop.users.owner);
    const page = await request(server).get("/batches?dueBy=2027-01-15").set("Cookie", owner);
    expect(visible(page.text)).toContain(`#${s.party.number}: 2 × Table number`);
    // a form without the held line's hidden ids is told so above the page, and releases nothing
    const blank = await request(server).post("/batches").set("Cookie", owner).type("form").send({ intent: "unhold" });
    expect(blank.status).toBe(400);
    expect(blank.text).toMatch(/role="alert"[^>]*>The held line in this form was not recognised\. Reload the page and try again\.</);
    const unknown = await request(server).post("/batches").set("Cookie", owner).type("form").send({ intent: "shred" });
    expect(unknown.status).toBe(400);
    expect(unknown.text).toMatch(/role="alert"[^>]*>Unknown action\.</);
    const released = await request(server).post("/batches").set("Cookie", owner).type("form").send({ intent: "unhold", lineId: line.id, materialId: s.birch6.id });
    expect(released.status).toBe(302);
    expect((await proposeBatches(s.shop.id, "2027-01-15")).flatMap((p) => p.lines.map((l) => l.lineId))).toEqual([line.id]);
  });

  it("a sawyer sees batches but cannot change them; another shop's batch answers 404", async () => {
    const [six] = await db.select().from(t.batches).where(and(eq(t.batches.shopId, s.shop.id), eq(t.batches.materialId, s.birch6.id)));
    const sawyer = await signIn(server, s.shop.users.sawyer);
    expect((await request(server).get(`/batches/${six.id}`).set("Cookie", sawyer)).status).toBe(200);
    expect((await request(server).post(`/batches/${six.id}`).set("Cookie", sawyer).type("form").send({ intent: "run-plan" })).status).toBe(403);
    const other = await createShop("Stranger");
    const stranger = await signIn(server, other.users.owner);
    expect((await request(server).get(`/batches/${six.id}`).set("Cookie", stranger)).status).toBe(404);
    expect((await request(server).post(`/batches/${six.id}`).set("Cookie", stranger).type("form").send({ intent: "run-plan", kerfMm: "3.2", trimMm: "10", seconds: "1", stages: "2", objective: "sheets" })).status).toBe(404);
    expect((await request(server).get(`/api/batches/${six.id}/plans`).set("Cookie", stranger)).status).toBe(404);
  });

  it("a batch recorded as cut without a plan says so, and points those who read the ledger to its figures", async () => {
    const [id] = await createBatchFor(s.shop.id, s.birch6.id);
    const page = async (cookie: string) => visible((await request(server).get(`/batches/${id}`).set("Cookie", cookie)).text);
    const owner = await signIn(server, s.shop.users.owner);
    const planner = await signIn(server, s.shop.users.planner);
    expect(await page(owner)).toContain("No plans yet.");
    await db.update(t.batches).set({ status: "cut", releasedAt: new Date(), cutAt: new Date() }).where(eq(t.batches.id, id));
    const forOwner = await page(owner);
    expect(forOwner).not.toContain("No plans yet.");
    expect(forOwner).toContain("No plan is kept for this batch. Its cost and scrap are in the");
    expect(forOwner).toContain(`href="/ledger/batches/${id}"`);
    const forPlanner = await page(planner);
    expect(forPlanner).toContain("No plan is kept for this batch.");
    expect(forPlanner).not.toContain(`/ledger/batches/${id}`);
  });
});

async function createBatchFor(shopId: string, materialId: string) {
  const [{ n }] = await db.select({ n: t.batches.number }).from(t.batches).where(eq(t.batches.shopId, shopId)).orderBy(t.batches.number);
  const rows = await db.insert(t.batches).values({ shopId, number: n + 100 + Math.floor(Math.random() * 1000), materialId, dueBy: "2027-01-15" }).returning({ id: t.batches.id });
  return rows.map((r) => r.id);
}

describe("the batch page's one move/hold form", () => {
  const post = (cookie: string, batchId: string, fields: [string, string][]) =>
    request(server).post(`/batches/${batchId}`).set("Cookie", cookie).type("form").send(new URLSearchParams(fields).toString());

  it("offers one checkbox per line and one form, and moves the ticked lines together, discarding both batches' plans", async () => {
    const s = await scenario();
    const [six] = await createBatches(s.shop.id, "2027-01-15", [s.birch6.id]);
    const [second] = await createBatchFor(s.shop.id, s.birch6.id);
    const planner = await signIn(server, s.shop.users.planner);
    const page = await request(server).get(`/batches/${six}`).set("Cookie", planner);
    const lines = (await getBatch(s.shop.id, six))!.lines;
    expect(lines).toHaveLength(3);
    for (const l of lines) expect(page.text).toContain(`type="checkbox" name="lineId" value="${l.lineId}"`);
    expect(page.text.match(/name="targetBatchId"/g)).toHaveLength(1);
    expect(page.text.match(/<form/g)!.length).toBeLessThanOrEqual(4); // the line form, the plan form, sign-out twice (rail and phone menu)

    const plan = await requestPlan(s.shop.id, six, settings());
    const wedding = lines.filter((l) => l.orderNumber === s.wedding.number).map((l) => l.lineId);
    expect(wedding).toHaveLength(2);
    const moved = await post(planner, six, [["intent", "move-line"], ...wedding.map((id): [string, string] => ["lineId", id]), ["targetBatchId", second]]);
    expect(moved.status).toBe(302);
    expect((await getBatch(s.shop.id, second))!.lines.map((l) => l.lineId).sort()).toEqual([...wedding].sort());
    expect((await getBatch(s.shop.id, six))!.lines.map((l) => l.orderNumber)).toEqual([s.party.number]);
    expect(await db.select().from(t.plans).where(eq(t.plans.id, plan))).toEqual([]);
  });

  it("names what is missing, and moves or holds nothing when one ticked line is not in the batch", async () => {
    const s = await scenario();
    const [six] = await createBatches(s.shop.id, "2027-01-15", [s.birch6.id]);
    const [three] = await createBatches(s.shop.id, "2027-01-15", [s.birch3.id]);
    const [second] = await createBatchFor(s.shop.id, s.birch6.id);
    const planner = await signIn(server, s.shop.users.planner);
    const lineOf = async (batchId: string) => (await getBatch(s.shop.id, batchId))!.lines.map((l) => l.lineId);
    const sixLines = await lineOf(six);
    const elsewhere = (await lineOf(three))[0];

    const none = await post(planner, six, [["intent", "hold-line"]]);
    expect(none.status).toBe(400);
    expect(visible(none.text)).toContain("Tick one or more lines first.");
    const noTarget = await post(planner, six, [["intent", "move-line"], ["lineId", sixLines[0]], ["targetBatchId", ""]]);
    expect(noTarget.status).toBe(400);
    expect(visible(noTarget.text)).toContain("Choose a batch.");
    const itself = await post(planner, six, [["intent", "move-line"], ["lineId", sixLines[0]], ["targetBatchId", six]]);
    expect(itself.status).toBe(400);
    expect(visible(itself.text)).toContain("Choose another batch");
    const garbled = await post(planner, six, [["intent", "hold-line"], ["lineId", "not-a-line"]]);
    expect(garbled.status).toBe(400);
    expect(visible(garbled.text)).toContain("The ticked lines could not be read.");

    for (const fields of [
      [["intent", "move-line"], ["lineId", sixLines[0]], ["lineId", elsewhere], ["targetBatchId", second]],
      [["intent", "hold-line"], ["lineId", sixLines[0]], ["lineId", elsewhere]],
    ] as [string, string][][]) {
      expect((await post(planner, six, fields)).status).toBe(404);
    }
    expect((await lineOf(six)).sort()).toEqual([...sixLines].sort());
    expect(await lineOf(second)).toEqual([]);
    expect(await db.select().from(t.heldLines).where(eq(t.heldLines.shopId, s.shop.id))).toEqual([]);

    const held = await post(planner, six, [["intent", "hold-line"], ...sixLines.slice(0, 2).map((id): [string, string] => ["lineId", id])]);
    expect(held.status).toBe(302);
    expect(await lineOf(six)).toEqual([sixLines[2]]);
    expect((await db.select().from(t.heldLines).where(eq(t.heldLines.shopId, s.shop.id))).map((h) => h.orderLineId).sort()).toEqual(sixLines.slice(0, 2).sort());
  });

  it("a batch at the saw, or a reader without the right, gets no checkboxes, move form or plan form", async () => {
    const s = await scenario();
    const [six] = await createBatches(s.shop.id, "2027-01-15", [s.birch6.id]);
    const sawyer = await signIn(server, s.shop.users.sawyer);
    const read = await request(server).get(`/batches/${six}`).set("Cookie", sawyer);
    expect(read.status).toBe(200);
    expect(visible(read.text)).toContain(`#${s.party.number}`);
    expect(read.text).not.toContain('name="lineId"');
    await db.update(t.batches).set({ status: "released" }).where(eq(t.batches.id, six));
    const planner = await signIn(server, s.shop.users.planner);
    const released = await request(server).get(`/batches/${six}`).set("Cookie", planner);
    expect(visible(released.text)).toContain(`#${s.party.number}`);
    for (const text of ['name="lineId"', 'name="targetBatchId"', "Run a plan"]) expect(released.text).not.toContain(text);
    const refused = await post(planner, six, [["intent", "hold-line"], ["lineId", (await getBatch(s.shop.id, six))!.lines[0].lineId]]);
    expect(refused.status).toBe(409);
    expect(refused.text).toContain("gone to the saw");
  });
});

describe("the batches page at a busy shop's scale", () => {
  it("lists a proposal's first lines with its counts, yet the batch made from it takes every line", async () => {
    const s = await scenario();
    const [sign] = await db.select().from(t.products).where(and(eq(t.products.shopId, s.shop.id), eq(t.products.name, "Welcome sign")));
    const [customer] = await db.select().from(t.customers).where(eq(t.customers.shopId, s.shop.id)).limit(1);
    for (let i = 0; i < 15; i++) {
      const o = await createOrder(s.shop.id, { customerId: customer.id, eventDate: "2027-01-30", dueDate: "2027-01-11", notes: "" }, [{ productId: sign.id, quantity: 2, personalisation: [], notes: "", files: [] }]);
      await db.update(t.orders).set({ status: "confirmed" }).where(eq(t.orders.id, o.id));
    }
    const planner = await signIn(server, s.shop.users.planner);
    const page = visible((await request(server).get("/batches?dueBy=2027-01-15").set("Cookie", planner)).text);
    // 6 mm: the wedding's table numbers and sign, the party's table numbers, and 15 orders of two signs.
    expect(page).toContain("18 lines, 36 items");
    expect(page).toMatch(/\d+ order lines due by [^.]+ would make 2 batches, one per material/);
    expect(page).not.toContain("to cut again");
    expect(page).toContain("and 6 more, listed on the batch once it is created");
    const created = await request(server).post("/batches").set("Cookie", planner).type("form").send({ intent: "create", dueBy: "2027-01-15" });
    expect(created.status).toBe(302);
    const six = await db.select().from(t.batches).where(and(eq(t.batches.shopId, s.shop.id), eq(t.batches.materialId, s.birch6.id)));
    expect(await db.$count(t.batchLines, eq(t.batchLines.batchId, six[0].id))).toBe(18);
  });

  it("the batch page lists its first lines and the rest on asking; holding from the full list comes back to it", async () => {
    const s = await scenario();
    const [sign] = await db.select().from(t.products).where(and(eq(t.products.shopId, s.shop.id), eq(t.products.name, "Welcome sign")));
    const [customer] = await db.select().from(t.customers).where(eq(t.customers.shopId, s.shop.id)).limit(1);
    for (let i = 0; i < BATCH_LINES_SHOWN; i++) {
      const o = await createOrder(s.shop.id, { customerId: customer.id, eventDate: "2027-01-30", dueDate: "2027-01-11", notes: "" }, [{ productId: sign.id, quantity: 1, personalisation: [], notes: "", files: [] }]);
      await db.update(t.orders).set({ status: "confirmed" }).where(eq(t.orders.id, o.id));
    }
    const [six] = await createBatches(s.shop.id, "2027-01-15", [s.birch6.id]);
    const lines = (await getBatch(s.shop.id, six))!.lines;
    const total = BATCH_LINES_SHOWN + 3;
    expect(lines).toHaveLength(total);
    const planner = await signIn(server, s.shop.users.planner);
    const first = await request(server).get(`/batches/${six}`).set("Cookie", planner);
    expect(first.text.match(/name="lineId"/g)).toHaveLength(BATCH_LINES_SHOWN);
    expect(visible(first.text)).toContain(`${total} order lines`);
    expect(visible(first.text)).toContain(`The first ${BATCH_LINES_SHOWN} of ${total} lines, by order number.`);
    expect(first.text).toContain(`href="/batches/${six}?lines=all" data-discover="true">Show all ${total} lines</a>`);
    const all = await request(server).get(`/batches/${six}?lines=all`).set("Cookie", planner);
    expect(all.text.match(/name="lineId"/g)).toHaveLength(total);
    expect(all.text).toContain(`value="${lines.at(-1)!.lineId}"`);
    expect(visible(all.text)).not.toContain("Show all");

    const held = await request(server).post(`/batches/${six}?lines=all`).set("Cookie", planner).type("form").send({ intent: "hold-line", lineId: lines.at(-1)!.lineId });
    expect(held.status).toBe(302);
    expect(held.headers.location).toBe(`/batches/${six}?lines=all`);
    expect((await getBatch(s.shop.id, six))!.lines).toHaveLength(total - 1);
  });
});

describe("plans on the real queue", () => {
  let s: Awaited<ReturnType<typeof scenario>>;
  let six: string;
  let three: string;
  beforeAll(async () => {
    s = await scenario();
    const ids = await createBatches(s.shop.id, "2027-01-15");
    six = (await db.select().from(t.batches).where(and(eq(t.batches.shopId, s.shop.id), eq(t.batches.materialId, s.birch6.id))))[0].id;
    three = ids.find((id) => id !== six)!;
  });

  it("queued → running → done: the saved plan passed the validator, the batch is planned, and the API shows it", async () => {
    const owner = await signIn(server, s.shop.users.owner);
    const res = await request(server).post(`/batches/${six}`).set("Cookie", owner).type("form").send({ intent: "run-plan", kerfMm: "3.2", trimMm: "10", seconds: "0.5", stages: "2", objective: "sheets" });
    expect(res.status).toBe(302);
    const [queued] = await db.select().from(t.plans).where(eq(t.plans.batchId, six));
    expect(["queued", "running", "done"]).toContain(queued.status);
    expect(queued.jobId).toBeTruthy();
    const done = await waitForPlan(queued.id, ["done", "failed"]);
    expect(done.error).toBeNull();
    expect(done.status).toBe("done");
    expect(done.sheets).toBe(1); // 5 number cards and a sign fit one 2440 × 1220 sheet
    expect(done.costMinor).toBe(5290);
    expect(done.startedAt!.getTime()).toBeLessThanOrEqual(done.finishedAt!.getTime());
    const [batch] = await db.select().from(t.batches).where(eq(t.batches.id, six));
    expect(batch.status).toBe("planned");
    const api = await request(server).get(`/api/batches/${six}/plans`).set("Cookie", owner);
    expect(api.body.plans[0]).toMatchObject({ id: queued.id, status: "done", sheets: 1, setups: expect.any(Number) });
    const view = await request(server).get(`/batches/${six}/plans/${queued.id}`).set("Cookie", owner);
    expect(view.status).toBe(200);
    expect(visible(view.text)).toContain("Panel 1 of 1: stock panel 2440 × 1220 mm");
  });

  it("the saw's latest kerf is the form's default, and the chosen sled's stop range bounds the plan", async () => {
    const [saw] = await db.insert(t.saws).values({ shopId: s.shop.id, name: "Test saw" }).returning();
    await db.insert(t.kerfMeasurements).values({ shopId: s.shop.id, sawId: saw.id, kerfUm: 2600 });
    const [sled] = await db.insert(t.sleds).values({ shopId: s.shop.id, sawId: saw.id, name: "Short sled", stopMinUm: 20_000, stopMaxUm: 500_000, widestUm: 610_000 }).returning();
    const owner = await signIn(server, s.shop.users.owner);
    const page = await request(server).get(`/batches/${six}`).set("Cookie", owner);
    expect(page.text).toMatch(/name="kerfMm"[^>]*value="2.6"/);
    const planId = await requestPlan(s.shop.id, six, settings({ sawId: saw.id, sledId: sled.id, kerfMm: 2.6 }));
    const done = await waitForPlan(planId, ["done", "failed"]);
    const setups = (done.result as { plan: { setups: { kind: string; setting: number; outsideStopRange?: boolean }[] } }).plan.setups;
    const crosscuts = setups.filter((x) => x.kind === "crosscut");
    expect(crosscuts.some((x) => x.setting > 500)).toBe(true); // the 600 mm sign face
    for (const x of crosscuts) expect(Boolean(x.outsideStopRange)).toBe(x.setting > 500);
  });

  it("names bad plan settings", async () => {
    const owner = await signIn(server, s.shop.users.planner);
    const res = await request(server).post(`/batches/${six}`).set("Cookie", owner).type("form").send({ intent: "run-plan", kerfMm: "-1", trimMm: "ten", seconds: "600", stages: "4", objective: "cheapest" });
    expect(res.status).toBe(400);
    for (const text of ["kerf must be between 0 and 10 mm", "edge trim must be a number", "search time must be between 0.2 and 30 seconds", "Choose how the saw works the sheet", "Choose what the plan aims for"]) expect(res.text).toContain(text);
  });

  it("laser items become blanks cut like any part, and each blank downloads as a true-size SVG", async () => {
    const planId = await requestPlan(s.shop.id, three, settings());
    const done = await waitForPlan(planId, ["done", "failed"]);
    expect(done.status).toBe("done");
    const result = done.result as { plan: { sheets: { placements: { partId: string }[] }[] }; blanks: number };
    expect(result.blanks).toBe(3); // 120 cards 90 × 55 at 40 per 600 × 400 bed (see test/lib/laser-blanks.test.ts)
    expect(result.plan.sheets.flatMap((sh) => sh.placements).filter((p) => p.partId === "laser-blank")).toHaveLength(3);
    const owner = await signIn(server, s.shop.users.owner);
    const svg = await request(server).get(`/batches/${three}/blanks/2`).set("Cookie", owner);
    expect(svg.status).toBe(200);
    expect(svg.headers["content-type"]).toContain("image/svg+xml");
    expect(Buffer.from(svg.body).toString("utf8")).toContain('width="600mm"');
    expect((await request(server).get(`/batches/${three}/blanks/4`).set("Cookie", owner)).status).toBe(404);
  });

  it("a cancelled plan stops its engine and stays cancelled", async () => {
    const planId = await requestPlan(s.shop.id, six, settings({ timeLimitMs: 20_000 }));
    await waitForPlan(planId, ["running"]);
    const owner = await signIn(server, s.shop.users.owner);
    const started = Date.now();
    const res = await request(server).post(`/batches/${six}`).set("Cookie", owner).type("form").send({ intent: "cancel-plan", planId });
    expect(res.status).toBe(302);
    const row = await waitForPlan(planId, ["cancelled"]);
    expect(row.error).toBe("Cancelled by the planner.");
    await new Promise((r) => setTimeout(r, 800));
    const [after] = await db.select().from(t.plans).where(eq(t.plans.id, planId));
    expect(after.status).toBe("cancelled");
    expect(after.result).toBeNull();
    expect(Date.now() - started).toBeLessThan(10_000);
  });

  it("a plan that cannot run is marked failed with the reason", async () => {
    const [acrylic] = await db.insert(t.materials).values({ shopId: s.shop.id, name: "Acrylic 3 mm", kind: "acrylic", thicknessUm: mm(3) }).returning();
    const [product] = await db.insert(t.products).values({ shopId: s.shop.id, name: "Acrylic tag", priceMinor: 300 }).returning();
    await db.insert(t.productParts).values({ productId: product.id, materialId: acrylic.id, name: "Tag", lengthUm: mm(80), widthUm: mm(40) });
    const [customer] = await db.select().from(t.customers).where(eq(t.customers.shopId, s.shop.id));
    const o = await createOrder(s.shop.id, { customerId: customer.id, eventDate: "2027-01-20", dueDate: "2027-01-14", notes: "" }, [{ productId: product.id, quantity: 4, personalisation: [], notes: "", files: [] }]);
    await db.update(t.orders).set({ status: "confirmed" }).where(eq(t.orders.id, o.id));
    const [batchId] = await createBatches(s.shop.id, "2027-01-15", [acrylic.id]);
    const planId = await requestPlan(s.shop.id, batchId, settings());
    const failed = await waitForPlan(planId, ["failed", "done"]);
    expect(failed.status).toBe("failed");
    expect(failed.error).toContain("no stock panels");
  });
});

describe("release", () => {
  it("reserves sheets and offcuts, records the offcuts it makes, and mails the sawyers; of two releases racing for one offcut only one wins", async () => {
    const s = await scenario();
    const [offcut] = await db.insert(t.offcuts).values({ shopId: s.shop.id, materialId: s.birch6.id, lengthUm: mm(1300), widthUm: mm(700), location: "Rack A" }).returning();
    const [first] = await createBatches(s.shop.id, "2027-01-10", [s.birch6.id]); // the wedding's 6 mm lines
    const [second] = await createBatches(s.shop.id, "2027-01-12", [s.birch6.id]); // the party's table numbers
    const planA = await requestPlan(s.shop.id, first, settings({ offcutIds: [offcut.id] }));
    const planB = await requestPlan(s.shop.id, second, settings({ offcutIds: [offcut.id] }));
    const [a, b] = await Promise.all([waitForPlan(planA, ["done", "failed"]), waitForPlan(planB, ["done", "failed"])]);
    const usesOffcut = (row: typeof a) => (row.result as { plan: { sheets: { stockId: string }[] } }).plan.sheets.some((sh) => sh.stockId === `offcut:${offcut.id}`);
    expect(usesOffcut(a)).toBe(true); // racked offcuts come before full sheets
    expect(usesOffcut(b)).toBe(true);

    const results = await Promise.allSettled([releasePlan(s.shop.id, first, planA), releasePlan(s.shop.id, second, planB)]);
    expect(results.filter((r) => r.status === "fulfilled")).toHaveLength(1);
    const loser = results.find((r) => r.status === "rejected") as PromiseRejectedResult;
    expect(loser.reason).toBeInstanceOf(PlanStateError);
    expect(loser.reason.message).toContain("taken by another batch");
    const [rackRow] = await db.select().from(t.offcuts).where(eq(t.offcuts.id, offcut.id));
    expect(rackRow.status).toBe("reserved");
    const statuses = (await db.select().from(t.batches).where(eq(t.batches.shopId, s.shop.id))).map((x) => x.status).sort();
    expect(statuses).toEqual(["planned", "released"]);

    // Through the page: the loser sees the message, nothing changes.
    const losingBatch = results[0].status === "rejected" ? first : second;
    const losingPlan = losingBatch === first ? planA : planB;
    const owner = await signIn(server, s.shop.users.planner);
    const page = await request(server).post(`/batches/${losingBatch}`).set("Cookie", owner).type("form").send({ intent: "release", planId: losingPlan });
    expect(page.status).toBe(409);
    expect(page.text).toContain("Nothing was released");
  });

  it("releasing through the page takes sheets off the count, records expected offcuts and e-mails each sawyer", async () => {
    const s = await scenario();
    const [batchId] = await createBatches(s.shop.id, "2027-01-10", [s.birch6.id]);
    const planId = await requestPlan(s.shop.id, batchId, settings());
    await waitForPlan(planId, ["done"]);
    const planner = await signIn(server, s.shop.users.planner);
    const res = await request(server).post(`/batches/${batchId}`).set("Cookie", planner).type("form").send({ intent: "release", planId });
    expect(res.status).toBe(302);
    const [panel] = await db.select().from(t.stockPanels).where(eq(t.stockPanels.id, s.sheet6.id));
    expect(panel.onHand).toBe(2); // 3 on hand, the plan draws one
    const expected = await db.select().from(t.offcuts).where(and(eq(t.offcuts.sourceBatchId, batchId), eq(t.offcuts.status, "expected")));
    expect(expected.length).toBeGreaterThan(0); // a mostly empty 2440 × 1220 leaves rackable offcuts
    const mail = await waitForMail(s.shop.users.sawyer.email);
    expect(mail.subject).toMatch(/^Batch B-\d{4} \(Birch plywood 6 mm\) is ready for the saw$/);
    const again = await request(server).post(`/batches/${batchId}`).set("Cookie", planner).type("form").send({ intent: "release", planId });
    expect(again.status).toBe(409);
    expect(again.text).toContain("already released");
  });
});

describe("plan cards", () => {
  it("count sheets and racked offcuts apart, and say why a plan cuts offcuts", async () => {
    const s = await scenario();
    const [offcut] = await db.insert(t.offcuts).values({ shopId: s.shop.id, materialId: s.birch6.id, lengthUm: mm(1300), widthUm: mm(700), location: "Rack B" }).returning();
    const [batchId] = await createBatches(s.shop.id, "2027-01-10", [s.birch6.id]); // the wedding's sign and three numbers fit the offcut
    const withOffcut = await requestPlan(s.shop.id, batchId, settings({ offcutIds: [offcut.id] }));
    await waitForPlan(withOffcut, ["done"]);
    const sheetsOnly = await requestPlan(s.shop.id, batchId, settings());
    const saved = await waitForPlan(sheetsOnly, ["done"]);
    expect((await waitForPlan(withOffcut, ["done"])).offcutsUsed).toBe(1);
    expect(saved.offcutsUsed).toBe(0);

    const planner = await signIn(server, s.shop.users.planner);
    const html = visible((await request(server).get(`/batches/${batchId}`).set("Cookie", planner)).text);
    const card = (n: number) => html.slice(html.indexOf(`data-plan="${n}"`), html.indexOf("</article>", html.indexOf(`data-plan="${n}"`)));
    expect(card(1)).toContain(">no new sheet · 1 offcut<");
    expect(card(1)).toContain("Offcuts first: the rack is used before new stock whenever that takes no extra sheet, so this plan cuts a racked offcut.");
    expect(card(2)).toContain(">1 sheet 2440 × 1220 mm<"); // the scenario's 6 mm birch comes as 2440 × 1220 only
    expect(card(2)).not.toContain("Offcuts first");
  });

  it("the migration's backfill gives saved plans the sheet sizes the plan runner stores", async () => {
    const s = await scenario();
    const [offcut] = await db.insert(t.offcuts).values({ shopId: s.shop.id, materialId: s.birch6.id, lengthUm: mm(1300), widthUm: mm(700), location: "Rack B" }).returning();
    const [batchId] = await createBatches(s.shop.id, "2027-01-10", [s.birch6.id]);
    const ids = [await requestPlan(s.shop.id, batchId, settings({ offcutIds: [offcut.id] })), await requestPlan(s.shop.id, batchId, settings())];
    const stored = await Promise.all(ids.map((id) => waitForPlan(id, ["done"])));
    expect(stored.map((p) => p.sheetSizes)).toEqual([[], [{ lengthUm: mm(2440), widthUm: mm(1220), count: 1 }]]);
    const migration = readFileSync(new URL("../../db/migrations/0011_plan-sheet-sizes.sql", import.meta.url), "utf8");
    const backfill = migration.slice(migration.indexOf("UPDATE"));
    await db.update(t.plans).set({ sheetSizes: null }).where(inArray(t.plans.id, ids));
    await db.execute(sql.raw(`${backfill.trim().replace(/;$/, "")} AND "id" IN ('${ids.join("','")}')`));
    const again = await db.select({ id: t.plans.id, sheetSizes: t.plans.sheetSizes }).from(t.plans).where(inArray(t.plans.id, ids));
    expect(ids.map((id) => again.find((p) => p.id === id)!.sheetSizes)).toEqual(stored.map((p) => p.sheetSizes));
  });

  it("a plan's net cost takes off its offcuts at the material's cheapest sheet rate, as the ledger does; the migration's backfill agrees", async () => {
    const s = await scenario(); // 6 mm birch: one 2440 × 1220 panel at 52.90
    const [batchId] = await createBatches(s.shop.id, "2027-01-10", [s.birch6.id]);
    const planId = await requestPlan(s.shop.id, batchId, settings());
    const saved = await waitForPlan(planId, ["done"]);
    expect(saved.costMinor).toBe(5290);
    expect(saved.offcutAreaMm2).toBeGreaterThan(0);
    // 52.90 over 2440 × 1220 mm = 2 976 800 mm², times the plan's offcut area
    expect(saved.rackCreditMinor).toBe(Math.round((saved.offcutAreaMm2! * 5290) / 2_976_800));
    const planner = await signIn(server, s.shop.users.planner);
    const html = visible((await request(server).get(`/batches/${batchId}`).set("Cookie", planner)).text);
    const card = html.slice(html.indexOf('data-plan="1"'), html.indexOf("</article>", html.indexOf('data-plan="1"')));
    expect(card).toContain(`>Net of offcuts<`);
    expect(card).toContain(`>${formatMoney(5290 - saved.rackCreditMinor!, "EUR")}<`);

    const migration = readFileSync(new URL("../../db/migrations/0012_plan-rack-credit.sql", import.meta.url), "utf8");
    const backfill = migration.slice(migration.indexOf("UPDATE"));
    await db.update(t.plans).set({ rackCreditMinor: null }).where(eq(t.plans.id, planId));
    await db.execute(sql.raw(`${backfill.trim().replace(/;$/, "")} AND "id" = '${planId}'`));
    const [again] = await db.select({ rackCreditMinor: t.plans.rackCreditMinor }).from(t.plans).where(eq(t.plans.id, planId));
    expect(again.rackCreditMinor).toBe(saved.rackCreditMinor);
  });

  it("the plan view names each panel by its stock, as the catalogue does: a stock panel's size, or a racked offcut", async () => {
    const s = await scenario();
    const [offcut] = await db.insert(t.offcuts).values({ shopId: s.shop.id, materialId: s.birch6.id, lengthUm: mm(1300), widthUm: mm(700), location: "Rack B" }).returning();
    const [six] = await createBatches(s.shop.id, "2027-01-10", [s.birch6.id]);
    const [three] = await createBatches(s.shop.id, "2027-01-10", [s.birch3.id]); // the place cards, on 1220 × 1220 stock only
    const onOffcut = await requestPlan(s.shop.id, six, settings({ offcutIds: [offcut.id] }));
    const onHalf = await requestPlan(s.shop.id, three, settings());
    await Promise.all([waitForPlan(onOffcut, ["done"]), waitForPlan(onHalf, ["done"])]);
    const planner = await signIn(server, s.shop.users.planner);
    const view = async (batchId: string, planId: string) => visible((await request(server).get(`/batches/${batchId}/plans/${planId}`).set("Cookie", planner)).text);
    const offcutView = await view(six, onOffcut);
    expect(offcutView).toContain("Panel 1 of 1: racked offcut 1300 × 700 mm");
    expect(offcutView).toContain("no new sheet · 1 offcut · yield");
    const halfView = await view(three, onHalf);
    expect(halfView).toContain("Panel 1 of 1: stock panel 1220 × 1220 mm");
    expect(halfView).toContain("1 sheet 1220 × 1220 mm · yield"); // a half-sheet never reads as a full one
    expect(halfView + offcutView).not.toMatch(/full sheet/i);
  });
});

describe("the order page tells where each line is", () => {
  it("from no batch, held back or gathered, to cut, and a spoiled part until it is cut again", async () => {
    const s = await scenario();
    const owner = await signIn(server, s.shop.users.owner);
    const lines = await db.select({ id: t.orderLines.id, productId: t.orderLines.productId }).from(t.orderLines).where(eq(t.orderLines.orderId, s.wedding.id));
    const [numbers, , cards] = ["Table number", "Welcome sign", "Place card"].map(async (name) => {
      const [p] = await db.select().from(t.products).where(and(eq(t.products.shopId, s.shop.id), eq(t.products.name, name)));
      return lines.find((l) => l.productId === p.id)!;
    });
    const page = async () => visible((await request(server).get(`/orders/${s.wedding.id}`).set("Cookie", owner)).text).replace(/<[^>]+>/g, "");
    expect(await page()).toContain("Birch plywood 6 mm: in no batch yet");

    const [cardBatch] = await createBatches(s.shop.id, "2027-01-12", [s.birch3.id]);
    const [cardNumber] = (await db.select({ number: t.batches.number }).from(t.batches).where(eq(t.batches.id, cardBatch))).map((b) => `B-${String(b.number).padStart(4, "0")}`);
    expect(await page()).toContain(`Birch plywood 3 mm: in ${cardNumber}, not planned yet`);
    await holdLines(s.shop.id, cardBatch, [(await cards).id]);
    expect(await page()).toContain("Birch plywood 3 mm: held back from batches by the planner");

    const cut = await cutBatch(s, "2027-01-12");
    const [row] = await db.select().from(t.batches).where(eq(t.batches.id, cut));
    const code = `B-${String(row.number).padStart(4, "0")}`;
    const day = new Intl.DateTimeFormat("en-GB", { day: "numeric", month: "short", year: "numeric", timeZone: "UTC" }).format(row.cutAt!);
    expect(await page()).toContain(`Birch plywood 6 mm: cut in ${code} on ${day}`);
    expect((await request(server).get(`/orders/${s.wedding.id}`).set("Cookie", owner)).text).toContain(`href="/batches/${cut}"`);

    // A card spoiled at the saw comes back for the next batch; the order says so until then.
    await db.update(t.batches).set({ status: "released" }).where(eq(t.batches.id, cut));
    const origin = { orderId: s.wedding.id, orderNumber: s.wedding.number, customerName: "Ardent–Vasquez wedding", lineId: (await numbers).id, productName: "Table number", partName: "Number card", itemIndex: 1, text: "Table 2" };
    expect(await spoilPart(s.shop.id, s.shop.users.sawyer.id, cut, { partName: "Number card", lengthUm: mm(210), widthUm: mm(150), grainLocked: true, process: "saw" }, [origin], "chipped edge")).toBe(true);
    expect(await page()).toContain(`Number card spoiled in ${code}: waiting to be cut again`);
    const gather = visible((await request(server).get("/batches?dueBy=2027-01-12").set("Cookie", owner)).text);
    expect(gather).toMatch(/(?<!order lines? and )1 spoiled part to cut again due by [^.]+ would make 1 batch, one per material/);
    // Another shop's reader never sees this order at all.
    const other = await createShop("Other progress");
    expect((await request(server).get(`/orders/${s.wedding.id}`).set("Cookie", await signIn(server, other.users.owner))).status).toBe(404);
  });
});
