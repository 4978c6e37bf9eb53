// Two app servers and a separate plan runner against one database: a person signs in on one, works on
// the other, and a plan asked on one is planned by the runner and released through the other.
import { spawn, type ChildProcess } from "node:child_process";
import { fileURLToPath } from "node:url";
import { eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import * as t from "../../db/schema";
import { batchScenario } from "../support/batch-factories";
import { startApp } from "../support/server";
import { getDb } from "~/db.server";
import { createBatches } from "~/models/batches.server";

const root = fileURLToPath(new URL("../..", import.meta.url));
let a: Awaited<ReturnType<typeof startApp>>;
let b: Awaited<ReturnType<typeof startApp>>;
let runner: ChildProcess;

beforeAll(async () => {
  [a, b] = await Promise.all([startApp({ STOPWISE_PLAN_RUNNER: "0" }), startApp({ STOPWISE_PLAN_RUNNER: "0" })]);
  runner = spawn(`${root}bin/plan-runner`, [], { cwd: root, env: process.env, stdio: "ignore" });
});
afterAll(async () => {
  runner?.kill("SIGTERM");
  await Promise.all([a?.stop(), b?.stop()]);
});

const form = (fields: Record<string, string>) => new URLSearchParams(fields);

describe("scale-out", () => {
  it("one flow across two servers and a separate runner", async () => {
    const s = await batchScenario();
    const signIn = await fetch(`${a.url}/sign-in`, { method: "POST", body: form({ email: s.shop.users.planner.email, password: s.shop.users.planner.password }), redirect: "manual" });
    expect(signIn.status).toBe(302);
    const cookie = signIn.headers.get("set-cookie")!.split(";")[0];

    // The session made on A is good on B.
    expect((await fetch(`${b.url}/batches`, { headers: { cookie }, redirect: "manual" })).status).toBe(200);
    const [batchId] = await createBatches(s.shop.id, "2027-01-15", [s.birch6.id]);
    const run = await fetch(`${b.url}/batches/${batchId}`, { method: "POST", headers: { cookie, origin: b.url }, body: form({ intent: "run-plan", kerfMm: "3.2", trimMm: "10", seconds: "0.5", stages: "2", objective: "sheets" }), redirect: "manual" });
    expect(run.status).toBe(302);

    let plans: { id: string; status: string }[] = [];
    for (let i = 0; i < 150 && plans[0]?.status !== "done"; i++) {
      plans = (await (await fetch(`${a.url}/api/batches/${batchId}/plans`, { headers: { cookie } })).json()).plans;
      await new Promise((r) => setTimeout(r, 200));
    }
    expect(plans[0].status).toBe("done"); // neither server runs plans: the separate runner did

    const release = await fetch(`${a.url}/batches/${batchId}`, { method: "POST", headers: { cookie, origin: a.url }, body: form({ intent: "release", planId: plans[0].id }), redirect: "manual" });
    expect(release.status).toBe(302);
    const [batch] = await getDb().select().from(t.batches).where(eq(t.batches.id, batchId));
    expect(batch.status).toBe("released");
  });
});
