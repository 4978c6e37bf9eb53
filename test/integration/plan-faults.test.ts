// Plans meet faults: PostgreSQL restarts while a plan runs, and a plan runner is killed mid-plan.
// Either the plan is saved whole once the database is back, or it is marked failed with a reason the
// planner reads; no half-written plan or release is left, and the app recovers without a restart.
import { spawn, type ChildProcess } from "node:child_process";
import { fileURLToPath } from "node:url";
import { and, eq } from "drizzle-orm";
import request from "supertest";
import { afterAll, describe, expect, it } from "vitest";
import * as t from "../../db/schema";
import { appServer, visible } from "../support/app";
import { testCluster } from "../support/database";
import { createShop, signIn, type TestShop } from "../support/factories";
import { getDb } from "~/db.server";
import { startPlanRunner, stopPlanRunner } from "~/jobs/plan-runner.server";
import { stopQueue } from "~/jobs/queue.server";
import { validatePlan } from "~/lib/packing";
import { createBatches } from "~/models/batches.server";
import { createOrder } from "~/models/orders.server";
import { buildPackingJob } from "~/models/plan-job.server";
import { requestPlan, type PlanResult } from "~/models/plans.server";
import { getShop } from "~/models/shops.server";

const root = fileURLToPath(new URL("../..", import.meta.url));
const server = await appServer();
const cluster = testCluster();
const db = getDb();
const mm = (n: number) => n * 1000;
const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));
const children: ChildProcess[] = [];

afterAll(async () => {
  cluster.start(); // a no-op when it runs
  for (const child of children) if (child.exitCode === null) child.kill("SIGKILL");
  await stopPlanRunner().catch(() => {});
  await stopQueue().catch(() => {});
});

/** A batch of many part sizes, so the engine searches for its whole time limit rather than stopping at a bound. */
async function busyBatch(shop: TestShop) {
  const [material] = await db.insert(t.materials).values({ shopId: shop.id, name: "MDF 6 mm", kind: "mdf", thicknessUm: mm(6) }).returning();
  const [panel] = await db.insert(t.stockPanels).values({ shopId: shop.id, materialId: material.id, lengthUm: mm(2440), widthUm: mm(1220), costMinor: 3100, onHand: 40 }).returning();
  const [product] = await db.insert(t.products).values({ shopId: shop.id, name: "Seating chart kit", priceMinor: 9000 }).returning();
  await db.insert(t.productParts).values(
    Array.from({ length: 24 }, (_, i) => ({ productId: product.id, materialId: material.id, name: `Panel ${i + 1}`, lengthUm: mm(137 + i * 23), widthUm: mm(61 + ((i * 37) % 240)), quantity: 1 + (i % 3) })),
  );
  const [customer] = await db.insert(t.customers).values({ shopId: shop.id, name: "Harbourlight café" }).returning();
  const order = await createOrder(shop.id, { customerId: customer.id, eventDate: "2027-02-01", dueDate: "2027-01-20", notes: "" }, [{ productId: product.id, quantity: 6, personalisation: [], notes: "", files: [] }]);
  await db.update(t.orders).set({ status: "confirmed" }).where(eq(t.orders.id, order.id));
  const [batchId] = await createBatches(shop.id, "2027-01-31", [material.id]);
  return { batchId, panel };
}

const settings = (timeLimitMs: number) => ({ kerfMm: 3.2, trimMm: 10, stages: 2 as const, objective: "sheets" as const, timeLimitMs, offcutIds: [], seed: 7 });

async function planRow(planId: string) {
  const [row] = await db.select().from(t.plans).where(eq(t.plans.id, planId));
  return row;
}

/** Polls the plan row until `until` holds (bounded: `seconds`), riding out a database that is away. */
async function waitForPlan(planId: string, until: (row: typeof t.plans.$inferSelect) => boolean, seconds: number) {
  const deadline = Date.now() + seconds * 1000;
  for (;;) {
    const row = await planRow(planId).catch(() => undefined);
    if (row && until(row)) return row;
    if (Date.now() > deadline) throw new Error(`plan ${planId} is still ${row?.status ?? "unreadable"} after ${seconds} s`);
    await sleep(100);
  }
}

describe("a plan runner is killed in the middle of a plan", () => {
  it("marks the plan failed with the reason on the batch page, and another runner plans the next one", async () => {
    const spawnRunner = (env: Record<string, string> = {}) => {
      const child = spawn(`${root}bin/plan-runner`, [], { cwd: root, env: { ...process.env, ...env }, stdio: "ignore" });
      children.push(child);
      return child;
    };
    const shop = await createShop("Runner killed");
    const planner = await signIn(server, shop.users.planner);
    const { batchId } = await busyBatch(shop);

    const first = spawnRunner();
    const planId = await requestPlan(shop.id, batchId, settings(30_000));
    await waitForPlan(planId, (p) => p.status === "running" && (p.progress?.elapsedMs ?? 0) > 300, 30);
    first.kill("SIGKILL"); // the process and its engine thread go at once: no chance to tidy up

    // A runner that counts 2 s without a tick as abandoned finds it.
    const second = spawnRunner({ STOPWISE_PLAN_STALE_SECONDS: "2" });
    const failed = await waitForPlan(planId, (p) => p.status !== "running", 30);
    expect(failed.status).toBe("failed");
    expect(failed.error).toContain("The plan runner stopped while working on this plan");
    expect(failed.result).toBeNull();
    const page = await request(server).get(`/batches/${batchId}`).set("Cookie", planner);
    expect(visible(page.text)).toContain("Nothing was saved; run the plan again.");
    const [batch] = await db.select().from(t.batches).where(and(eq(t.batches.id, batchId), eq(t.batches.shopId, shop.id)));
    expect(batch.status).toBe("open");

    const next = await requestPlan(shop.id, batchId, settings(300));
    expect((await waitForPlan(next, (p) => p.status !== "queued" && p.status !== "running", 30)).status).toBe("done");
    await new Promise((r) => second.once("exit", r).kill("SIGTERM")); // the next test plans in this process
  });
});

describe("PostgreSQL restarts while a plan runs", () => {
  it("answers 503 while it is away, then the plan is saved whole and validated, and releasing and planning work again", async () => {
    await startPlanRunner();
    const shop = await createShop("Plan faults");
    const planner = await signIn(server, shop.users.planner);
    const { batchId, panel } = await busyBatch(shop);
    const planId = await requestPlan(shop.id, batchId, settings(4000));
    await waitForPlan(planId, (p) => p.status === "running" && (p.progress?.elapsedMs ?? 0) > 300, 20);

    cluster.stop();
    const away = await request(server).get(`/api/batches/${batchId}/plans`).set("Cookie", planner);
    const awayPage = await request(server).get(`/batches/${batchId}`).set("Cookie", planner);
    await sleep(4500); // the engine finishes while the database is away; the runner holds the plan until it is back
    cluster.start();

    expect(away.status).toBe(503);
    expect(away.body.error).toContain("Nothing was saved");
    expect(awayPage.status).toBe(503);
    expect(awayPage.text).toContain("cannot reach its database");

    const saved = await waitForPlan(planId, (p) => p.status !== "running", 30);
    expect(saved.status, saved.error ?? "").toBe("done");
    // Whole: the summary columns and the stored plan agree, and the plan passes the validator again.
    const result = saved.result as PlanResult;
    expect(saved.sheets).toBe(result.plan.metrics.sheets);
    const [batch] = await db.select().from(t.batches).where(eq(t.batches.id, batchId));
    const { job } = await buildPackingJob(await getShop(shop.id), batch, saved.settings);
    expect(validatePlan(job, result.plan)).toEqual({ ok: true, errors: [] });
    expect(batch.status).toBe("planned");

    // A release refused while the database is away leaves nothing behind.
    cluster.stop();
    const refused = await request(server).post(`/batches/${batchId}`).set("Cookie", planner).type("form").send({ intent: "release", planId });
    cluster.start();
    expect(refused.status).toBe(503);
    const [stillPlanned] = await db.select().from(t.batches).where(eq(t.batches.id, batchId));
    expect(stillPlanned.status).toBe("planned");
    const [{ onHand }] = await db.select({ onHand: t.stockPanels.onHand }).from(t.stockPanels).where(eq(t.stockPanels.id, panel.id));
    expect(onHand).toBe(40);
    expect(await db.select().from(t.offcuts).where(eq(t.offcuts.sourceBatchId, batchId))).toHaveLength(0);

    // The same runner and app carry on: a new plan is planned, and the first one releases.
    const again = await requestPlan(shop.id, batchId, settings(300));
    const planned = await waitForPlan(again, (p) => p.status !== "queued" && p.status !== "running", 30);
    expect(planned.status, planned.error ?? "").toBe("done");
    const released = await request(server).post(`/batches/${batchId}`).set("Cookie", planner).type("form").send({ intent: "release", planId });
    expect(released.status).toBe(302);
    const [after] = await db.select().from(t.stockPanels).where(eq(t.stockPanels.id, panel.id));
    expect(after.onHand).toBe(40 - result.plan.sheets.length);
    await stopPlanRunner();
  });
});
