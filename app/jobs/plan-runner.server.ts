// Runs queued plans: takes a plan job from the queue, builds the packing job from the batch, runs the
// engine in a worker thread, reports progress to the plan row, and saves the plan once the validator
// passes it. Started by bin/serve.ts next to the web server (and by tests); more runners may run on
// other machines against the same database.
import { and, eq, inArray, isNull, notInArray, or, sql } from "drizzle-orm";
import { Worker } from "node:worker_threads";
import { batches, plans } from "../../db/schema";
import { getDb, isDatabaseUnavailable, type Queryable, type WriteContext } from "~/db.server";
import { checkJobLimits } from "~/lib/packing-limits";
import type { Job, PackOptions, Plan } from "~/lib/packing/types";
import { valueReturned } from "~/lib/ledger";
import { sheetSizes } from "~/lib/stock-names";
import { pack, validatePlan, type ValidationResult } from "~/lib/packing";
import { getShop } from "~/models/shops.server";
import { buildPackingJob, cheapestCostPerArea, type StockRef } from "~/models/plan-job.server";
import type { PlanResult } from "~/models/plans.server";
import { PLAN_QUEUE, queue, type PlanJobData } from "./queue.server";

const PROGRESS_EVERY_MS = 250;
const SWEEP_EVERY_MS = 5000;
const workerUrl = new URL("./pack-worker-entry.mjs", import.meta.url);

// Plans this process is working on: the sweep never fails those, however long the database was away.
const active = new Set<string>();
let sweeper: NodeJS.Timeout | undefined;

/** Seconds without a tick after which a running plan counts as abandoned (its runner died). */
function staleAfterSeconds(): number {
  const value = Number(process.env.STOPWISE_PLAN_STALE_SECONDS);
  return Number.isFinite(value) && value > 0 ? value : 60;
}

export async function startPlanRunner(): Promise<void> {
  const boss = await queue();
  await boss.work<PlanJobData>(PLAN_QUEUE, { pollingIntervalSeconds: 0.5, batchSize: 1 }, async ([job]) => {
    await runPlan(job.data.planId);
  });
  const sweep = () => failAbandonedPlans(staleAfterSeconds()).catch(() => {}); // the database may be away; next time
  await sweep();
  sweeper ??= setInterval(sweep, SWEEP_EVERY_MS);
  sweeper.unref();
}

export async function stopPlanRunner(): Promise<void> {
  clearInterval(sweeper);
  sweeper = undefined;
  const boss = await queue();
  await boss.offWork(PLAN_QUEUE);
}

/**
 * Marks failed, with the reason, the plans no runner is working on any more: running plans whose
 * runner stopped ticking (killed, machine lost), and queued plans whose job never reached the queue.
 * Returns how many it marked.
 */
export async function failAbandonedPlans(staleSeconds: number): Promise<number> {
  const mine = [...active];
  const rows = await getDb()
    .update(plans)
    .set({
      status: "failed",
      finishedAt: new Date(),
      error: sql`case when ${plans.status} = 'running'
        then ${`The plan runner stopped while working on this plan (no word from it for ${staleSeconds} s). Nothing was saved; run the plan again.`}
        else ${"The plan never reached the queue (the database was away). Run the plan again."} end`,
    })
    .where(
      and(
        or(
          and(eq(plans.status, "running"), sql`coalesce((${plans.progress}->>'beatAt')::timestamptz, ${plans.startedAt}) < now() - make_interval(secs => ${staleSeconds})`),
          and(eq(plans.status, "queued"), isNull(plans.jobId), sql`${plans.createdAt} < now() - make_interval(secs => ${staleSeconds})`),
        ),
        mine.length ? notInArray(plans.id, mine) : undefined,
      ),
    )
    .returning({ id: plans.id });
  return rows.length;
}

type Outcome = { kind: "done"; plan: Plan } | { kind: "cancelled" } | { kind: "failed"; reason: string };

/** How a plan's engine runs: in a worker thread (the runner's way), or on the calling thread. */
export type PlanEngine = (planId: string, job: Job) => Promise<Outcome>;

/**
 * The engine on the calling thread, with its own options, judged by the same validator the worker
 * runs. For the demo seed: a fixed clock (`now`) makes the search, and so the plan, the same on
 * every machine, and nothing waits on a queue or a worker.
 */
export function engineOnThisThread(options: PackOptions): PlanEngine {
  return async (_planId, job) => {
    const plan = pack(job, options);
    return judged(plan, validatePlan(job, plan));
  };
}

function judged(plan: Plan, check: ValidationResult): Outcome {
  return check.ok ? { kind: "done", plan } : { kind: "failed", reason: `The engine's plan did not pass the validator: ${check.errors.slice(0, 3).join("; ")}` };
}

type RunOptions = WriteContext & { engine?: PlanEngine };

/**
 * Runs one plan to its end; never throws for a plan's own failure (it is recorded on the plan).
 * The runner calls it with no options; `db`, `now` and `engine` let the demo seed run a plan
 * inside its own transaction, dated in the past, with a fixed clock.
 */
export async function runPlan(planId: string, { db, now, engine = runInWorker }: RunOptions = {}): Promise<void> {
  // Taking the plan waits for the database like the save does: the queue has handed this job over
  // once, and a job whose plan row was never marked would leave the plan queued for good.
  const [plan] = await untilDatabaseAnswers(
    () => (db ?? getDb()).update(plans).set({ status: "running", startedAt: now ?? new Date() }).where(and(eq(plans.id, planId), eq(plans.status, "queued"))).returning(),
    PREPARE_PATIENCE_MS,
  );
  if (!plan) return; // cancelled while queued, or taken by another runner
  active.add(plan.id);
  try {
    await planAndSave(plan, engine, db, now);
  } finally {
    active.delete(plan.id);
  }
}

async function planAndSave(plan: typeof plans.$inferSelect, engine: PlanEngine, inTransaction?: Queryable, now?: Date): Promise<void> {
  const db = inTransaction ?? getDb();
  const planId = plan.id;
  let outcome: Outcome;
  let stockRefs: PlanResult["stockRefs"] = {};
  let blanks = 0;
  try {
    // Only reads: after a restart of PostgreSQL a pooled connection may fail once, so they are retried.
    const built = await untilDatabaseAnswers(async () => {
      const [batch] = await db.select().from(batches).where(eq(batches.id, plan.batchId));
      return buildPackingJob(await getShop(plan.shopId, inTransaction), batch, plan.settings, inTransaction);
    }, PREPARE_PATIENCE_MS);
    stockRefs = built.stockRefs;
    blanks = built.cutList.blanks.length;
    const bounded = checkJobLimits(built.job);
    if (!bounded.ok) outcome = { kind: "failed", reason: `The batch is beyond what one plan can take (${bounded.error}).` };
    else if (built.job.parts.length === 0) outcome = { kind: "failed", reason: "The batch has no parts to cut." };
    else if (built.job.stock.length === 0) outcome = { kind: "failed", reason: "The material has no stock panels: add its sheet sizes in the catalogue first." };
    else {
      // The worker also runs the validator on its plan (see pack-worker.ts); a plan it rejects is never saved.
      outcome = await engine(planId, built.job);
    }
  } catch (error) {
    const reason = isDatabaseUnavailable(error) ? "The database was away while the plan was being prepared. Run the plan again." : error instanceof Error ? error.message : String(error);
    outcome = { kind: "failed", reason };
  }
  await untilDatabaseAnswers(() => finish(db, plan.id, plan.batchId, outcome, stockRefs, blanks, now ?? new Date()), SAVE_PATIENCE_MS);
}

// A plan that took minutes is not thrown away because PostgreSQL restarted as it ended: the save
// waits for the database (bounded), and the sweep fails the plan if this process dies meanwhile.
const SAVE_PATIENCE_MS = 10 * 60_000;
const PREPARE_PATIENCE_MS = 60_000;

async function untilDatabaseAnswers<T>(work: () => Promise<T>, patienceMs: number): Promise<T> {
  const giveUpAt = Date.now() + patienceMs;
  for (let wait = 250; ; wait = Math.min(wait * 2, 5000)) {
    try {
      return await work();
    } catch (error) {
      if (!isDatabaseUnavailable(error) || Date.now() > giveUpAt) throw error;
      await new Promise((r) => setTimeout(r, wait));
    }
  }
}

function runInWorker(planId: string, job: Job): Promise<Outcome> {
  return new Promise((resolve) => {
    const started = Date.now();
    let bestSheets: number | null = null;
    let settled = false;
    const worker = new Worker(workerUrl, { workerData: { job } });
    const done = (outcome: Outcome) => {
      if (settled) return;
      settled = true;
      clearInterval(ticker);
      resolve(outcome);
    };
    // Every tick: write the progress with the database's clock, and stop the engine if the planner
    // cancelled. A tick still waiting on the database (it is away) is not stacked with more.
    let ticking = false;
    const ticker = setInterval(async () => {
      if (ticking) return;
      ticking = true;
      const progress = { elapsedMs: Date.now() - started, bestSheets };
      const [row] = await getDb()
        .update(plans)
        .set({ progress: sql`${JSON.stringify(progress)}::jsonb || jsonb_build_object('beatAt', now())` })
        .where(and(eq(plans.id, planId), eq(plans.status, "running")))
        .returning({ id: plans.id })
        .catch(() => [{ id: planId }]) // a database hiccup is no reason to stop the engine
        .finally(() => (ticking = false));
      if (!row) {
        await worker.terminate();
        done({ kind: "cancelled" });
      }
    }, PROGRESS_EVERY_MS);
    worker.on("message", (message: { type: "progress"; bestSheets: number } | { type: "done"; plan: Plan; check: ValidationResult }) => {
      if (message.type === "progress") bestSheets = message.bestSheets;
      else done(judged(message.plan, message.check));
    });
    worker.on("error", (error) => done({ kind: "failed", reason: `The engine stopped with an error: ${error.message}` }));
    worker.on("exit", (code) => done({ kind: "failed", reason: `The engine's worker ended unexpectedly (exit code ${code}).` }));
  });
}

async function finish(db: Queryable, planId: string, batchId: string, outcome: Outcome, stockRefs: PlanResult["stockRefs"], blanks: number, finishedAt: Date) {
  const stillRunning = and(eq(plans.id, planId), eq(plans.status, "running"));
  if (outcome.kind === "cancelled") return; // the row already says cancelled
  if (outcome.kind === "failed") {
    await db.update(plans).set({ status: "failed", error: outcome.reason, finishedAt }).where(stillRunning);
    return;
  }
  const { plan } = outcome;
  const costMinor = plan.sheets.reduce((sum, sheet) => sum + (stockRefs[sheet.stockId]?.costMinor ?? 0), 0);
  // the offcuts it leaves, at the rate racked offcuts are priced by: the cheapest stock panel per area
  const offcutRatePerMm2 = cheapestCostPerArea(Object.values(stockRefs).filter((ref) => ref.kind === "panel")) * 1e6;
  const result: PlanResult = { plan, stockRefs, blanks };
  await db.transaction(async (tx) => {
    const saved = await tx
      .update(plans)
      .set({
        status: "done",
        result,
        sheets: plan.metrics.sheets,
        offcutsUsed: plan.sheets.filter((sheet) => stockRefs[sheet.stockId]?.kind === "offcut").length,
        sheetSizes: sheetSizes(plan.sheets.map((sheet) => stockRefs[sheet.stockId]).filter((ref): ref is StockRef => ref?.kind === "panel")),
        yieldPermille: Math.round(plan.metrics.yield * 1000),
        costMinor,
        rackCreditMinor: valueReturned(costMinor, Math.round(plan.metrics.offcutArea), offcutRatePerMm2),
        setups: plan.metrics.setups,
        offcutAreaMm2: Math.round(plan.metrics.offcutArea),
        progress: { elapsedMs: Math.round(plan.metrics.elapsedMs), bestSheets: plan.metrics.sheets },
        finishedAt,
        error: plan.unplaced.length ? `${plan.unplaced.reduce((n, u) => n + u.quantity, 0)} parts could not be placed: ${plan.unplaced.map((u) => u.reason).join("; ")}` : null,
      })
      .where(stillRunning)
      .returning({ id: plans.id });
    if (saved.length) await tx.update(batches).set({ status: "planned" }).where(and(eq(batches.id, batchId), inArray(batches.status, ["open"])));
  });
}
