import { and, asc, count, desc, eq, inArray, sql } from "drizzle-orm";
import { batches, offcuts, plans, stockPanels, users, type PlanProgress, type PlanSettings } from "../../db/schema";
import { getDb, type WriteContext } from "~/db.server";
import { PLAN_QUEUE, queue, type PlanJobData } from "~/jobs/queue.server";
import type { Plan } from "~/lib/packing/types";
import type { SheetSize } from "~/lib/stock-names";
import { preparedOnce } from "./prepared.server";
import type { StockRef } from "./plan-job.server";

export class PlanStateError extends Error {}

/** What a finished plan keeps: the engine's plan and which panel or offcut each stock id was. */
export type PlanResult = { plan: Plan; stockRefs: Record<string, StockRef>; blanks: number };

export type PlanSummary = {
  id: string;
  number: number;
  status: "queued" | "running" | "done" | "failed" | "cancelled";
  settings: PlanSettings;
  progress: PlanProgress | null;
  sheets: number | null;
  offcutsUsed: number | null;
  sheetSizes: SheetSize[] | null;
  yieldPermille: number | null;
  costMinor: number | null;
  rackCreditMinor: number | null;
  setups: number | null;
  offcutAreaMm2: number | null;
  error: string | null;
  createdAt: Date;
  finishedAt: Date | null;
};

const summaryColumns = {
  id: plans.id,
  number: plans.number,
  status: plans.status,
  settings: plans.settings,
  progress: plans.progress,
  sheets: plans.sheets,
  offcutsUsed: plans.offcutsUsed,
  sheetSizes: plans.sheetSizes,
  yieldPermille: plans.yieldPermille,
  costMinor: plans.costMinor,
  rackCreditMinor: plans.rackCreditMinor,
  setups: plans.setups,
  offcutAreaMm2: plans.offcutAreaMm2,
  error: plans.error,
  createdAt: plans.createdAt,
  finishedAt: plans.finishedAt,
};

const batchPlans = preparedOnce((db) =>
  db
    .select(summaryColumns)
    .from(plans)
    .where(and(eq(plans.shopId, sql.placeholder("shopId")), eq(plans.batchId, sql.placeholder("batchId"))))
    .orderBy(desc(plans.number))
    .prepare("batch_plans"),
);

export async function listPlans(shopId: string, batchId: string): Promise<PlanSummary[]> {
  return batchPlans().execute({ shopId, batchId });
}

export async function getPlan(shopId: string, batchId: string, planId: string) {
  const [row] = await getDb()
    .select({ ...summaryColumns, result: plans.result })
    .from(plans)
    .where(and(eq(plans.id, planId), eq(plans.batchId, batchId), eq(plans.shopId, shopId)));
  return row ? { ...row, result: row.result as PlanResult | null } : null;
}

/** Adds a queued plan of the batch (its next number) and returns its id; requestPlan then hands it to the runners. */
export async function addPlan(shopId: string, batchId: string, settings: PlanSettings, { db = getDb(), now }: WriteContext = {}): Promise<string> {
  return db.transaction(async (tx) => {
    const [batch] = await tx.select({ id: batches.id, status: batches.status }).from(batches).where(and(eq(batches.id, batchId), eq(batches.shopId, shopId))).for("update");
    if (!batch) throw new PlanStateError("No such batch in this shop.");
    if (batch.status !== "open" && batch.status !== "planned") throw new PlanStateError("This batch has gone to the saw; it takes no new plans.");
    const [{ last }] = await tx.select({ last: sql<number>`coalesce(max(${plans.number}), 0)` }).from(plans).where(eq(plans.batchId, batch.id));
    const [plan] = await tx.insert(plans).values({ shopId, batchId: batch.id, number: last + 1, settings, progress: { elapsedMs: 0, bestSheets: null }, createdAt: now }).returning({ id: plans.id });
    return plan.id;
  });
}

/** Queues a plan of the batch. The job carries only the plan's id; the runner reads the rest. */
export async function requestPlan(shopId: string, batchId: string, settings: PlanSettings): Promise<string> {
  const planId = await addPlan(shopId, batchId, settings);
  const boss = await queue();
  const jobId = await boss.send(PLAN_QUEUE, { planId } satisfies PlanJobData);
  await getDb().update(plans).set({ jobId }).where(eq(plans.id, planId));
  return planId;
}

/** Cancels a queued or running plan; the runner sees it within a moment and stops the engine. */
export async function cancelPlan(shopId: string, batchId: string, planId: string): Promise<boolean> {
  const rows = await getDb()
    .update(plans)
    .set({ status: "cancelled", finishedAt: new Date(), error: "Cancelled by the planner." })
    .where(and(eq(plans.id, planId), eq(plans.batchId, batchId), eq(plans.shopId, shopId), inArray(plans.status, ["queued", "running"])))
    .returning({ jobId: plans.jobId });
  if (!rows.length) return false;
  if (rows[0].jobId) await (await queue()).cancel(PLAN_QUEUE, rows[0].jobId).catch(() => {});
  return true;
}

/** Counts of full sheets per stock panel and the offcuts a plan uses. */
export function stockUse(result: PlanResult) {
  const panels = new Map<string, number>();
  const offcutIds: string[] = [];
  for (const sheet of result.plan.sheets) {
    const ref = result.stockRefs[sheet.stockId];
    if (!ref) throw new PlanStateError(`The plan names a stock item that is not recorded (${sheet.stockId}).`);
    if (ref.kind === "offcut") offcutIds.push(ref.id);
    else panels.set(ref.id, (panels.get(ref.id) ?? 0) + 1);
  }
  return { panels, offcutIds };
}

/**
 * Releases a plan to the saw in one transaction: takes the full sheets off the count on hand,
 * reserves the racked offcuts (a conditional update, so of two planners releasing at once only one
 * gets an offcut; the other's transaction rolls back whole), records the offcuts the plan will
 * make, and marks the batch released with this plan.
 */
export async function releasePlan(shopId: string, batchId: string, planId: string, { db = getDb(), now = new Date() }: WriteContext = {}): Promise<{ code: number; sheets: number; setups: number }> {
  return db.transaction(async (tx) => {
    const [batch] = await tx.select().from(batches).where(and(eq(batches.id, batchId), eq(batches.shopId, shopId))).for("update");
    if (!batch) throw new PlanStateError("No such batch in this shop.");
    if (batch.status !== "open" && batch.status !== "planned") throw new PlanStateError("This batch was already released.");
    const [plan] = await tx.select({ status: plans.status, result: plans.result }).from(plans).where(and(eq(plans.id, planId), eq(plans.batchId, batch.id)));
    if (!plan) throw new PlanStateError("No such plan for this batch.");
    if (plan.status !== "done" || !plan.result) throw new PlanStateError("Only a finished plan can be released.");
    const result = plan.result as PlanResult;
    const { panels, offcutIds } = stockUse(result);

    if (offcutIds.length) {
      const reserved = await tx
        .update(offcuts)
        .set({ status: "reserved", reservedBatchId: batch.id })
        .where(and(eq(offcuts.shopId, shopId), inArray(offcuts.id, offcutIds), eq(offcuts.status, "racked")))
        .returning({ id: offcuts.id });
      if (reserved.length !== offcutIds.length) {
        throw new PlanStateError("An offcut this plan uses has been taken by another batch or is no longer on the rack. Nothing was released; run the plan again.");
      }
    }
    for (const [panelId, needed] of panels) {
      const taken = await tx
        .update(stockPanels)
        .set({ onHand: sql`${stockPanels.onHand} - ${needed}` })
        .where(and(eq(stockPanels.id, panelId), eq(stockPanels.shopId, shopId), sql`${stockPanels.onHand} >= ${needed}`))
        .returning({ id: stockPanels.id });
      if (!taken.length) {
        const [panel] = await tx.select().from(stockPanels).where(eq(stockPanels.id, panelId));
        throw new PlanStateError(
          `The plan needs ${needed} sheets of ${panel ? `${panel.lengthUm / 1000} × ${panel.widthUm / 1000} mm` : "a stock size"} but only ${panel?.onHand ?? 0} are on hand. Nothing was released; add the stock first.`,
        );
      }
    }
    const made = result.plan.sheets.flatMap((sheet) =>
      // Kept as cut: length along the panel's length, so the grain direction stays true.
      sheet.offcuts.map((o) => ({ shopId, materialId: batch.materialId, lengthUm: Math.round(o.length * 1000), widthUm: Math.round(o.width * 1000), grain: result.stockRefs[sheet.stockId].grain, status: "expected" as const, sourceBatchId: batch.id, createdAt: now })),
    );
    if (made.length) await tx.insert(offcuts).values(made);
    await tx.update(batches).set({ status: "released", chosenPlanId: planId, releasedAt: now }).where(eq(batches.id, batch.id));
    return { code: batch.number, sheets: result.plan.metrics.sheets, setups: result.plan.metrics.setups };
  });
}

export async function sawyersOf(shopId: string) {
  return getDb().select({ email: users.email, name: users.name }).from(users).where(and(eq(users.shopId, shopId), eq(users.role, "sawyer"))).orderBy(asc(users.name));
}

export async function runningPlanCount(shopId: string): Promise<number> {
  const [row] = await getDb().select({ n: count() }).from(plans).where(and(eq(plans.shopId, shopId), inArray(plans.status, ["queued", "running"])));
  return row.n;
}
