import { and, asc, desc, eq, inArray, sql } from "drizzle-orm";
import { batchCosts, batches, materials, offcuts, plans, recutParts, setupTicks, stockPanels, type RecutOrigin } from "../../db/schema";
import { batchLedger, ledgerFigures } from "~/lib/ledger";
import { batchSources } from "./batches.server";
import { cheapestCostPerArea } from "./plan-job.server";
import { getDb, type Queryable, type Transaction, type WriteContext } from "~/db.server";
import type { Setup } from "~/lib/packing/types";
import type { PlanResult } from "./plans.server";

export class FloorStateError extends Error {}

/** Batches at the saw (released), then the ones cut lately. */
export async function floorBatches(shopId: string) {
  return getDb()
    .select({ id: batches.id, number: batches.number, status: batches.status, dueBy: batches.dueBy, materialName: materials.name, releasedAt: batches.releasedAt, cutAt: batches.cutAt })
    .from(batches)
    .innerJoin(materials, eq(materials.id, batches.materialId))
    .where(and(eq(batches.shopId, shopId), inArray(batches.status, ["released", "cut"])))
    .orderBy(sql`${batches.status} = 'cut'`, asc(batches.dueBy), desc(batches.number))
    .limit(50);
}

/** The released batch's chosen plan, or null when the batch is not at the saw (or not this shop's). */
export async function chosenPlan(shopId: string, batchId: string) {
  const [row] = await getDb()
    .select({ status: batches.status, result: plans.result, settings: plans.settings, number: plans.number })
    .from(batches)
    .innerJoin(plans, eq(plans.id, batches.chosenPlanId))
    .where(and(eq(batches.id, batchId), eq(batches.shopId, shopId)));
  if (!row || (row.status !== "released" && row.status !== "cut" && row.status !== "closed")) return null;
  return { ...row, result: row.result as PlanResult };
}

export type FloorState = {
  ticks: { setupIndex: number; countCut: number; tickedAt: Date }[];
  recuts: { id: string; partName: string; lengthUm: number; widthUm: number; reason: string; text: string | null; orderNumber: number | null }[];
};

export async function floorState(batchId: string): Promise<FloorState> {
  const db = getDb();
  const [ticks, recuts] = await Promise.all([
    db.select({ setupIndex: setupTicks.setupIndex, countCut: setupTicks.countCut, tickedAt: setupTicks.tickedAt }).from(setupTicks).where(eq(setupTicks.batchId, batchId)).orderBy(asc(setupTicks.setupIndex)),
    db.select().from(recutParts).where(eq(recutParts.spoiledInBatchId, batchId)).orderBy(asc(recutParts.createdAt)),
  ]);
  return {
    ticks,
    recuts: recuts.map((r) => ({ id: r.id, partName: r.partName, lengthUm: r.lengthUm, widthUm: r.widthUm, reason: r.reason, text: r.origin?.text ?? null, orderNumber: r.origin?.orderNumber ?? null })),
  };
}

async function lockReleased(tx: Transaction, shopId: string, batchId: string) {
  const [batch] = await tx.select().from(batches).where(and(eq(batches.id, batchId), eq(batches.shopId, shopId))).for("update");
  if (!batch) return null;
  if (batch.status !== "released") throw new FloorStateError(batch.status === "cut" || batch.status === "closed" ? "This batch is already cut." : "This batch is not at the saw yet.");
  return batch;
}

/** Ticks a set-up of the chosen plan with the count actually cut (ticking again corrects it). */
export async function tickSetup(shopId: string, userId: string, batchId: string, setupIndex: number, countCut: number, setups: Setup[], { db = getDb(), now = new Date() }: WriteContext = {}): Promise<boolean> {
  if (!Number.isInteger(setupIndex) || setupIndex < 0 || setupIndex >= setups.length) throw new FloorStateError("No such set-up in this batch's plan.");
  return db.transaction(async (tx) => {
    const batch = await lockReleased(tx, shopId, batchId);
    if (!batch) return false;
    await tx
      .insert(setupTicks)
      .values({ batchId, setupIndex, countCut, tickedBy: userId, tickedAt: now })
      .onConflictDoUpdate({ target: [setupTicks.batchId, setupTicks.setupIndex], set: { countCut, tickedBy: userId, tickedAt: now } });
    return true;
  });
}

export async function untickSetup(shopId: string, batchId: string, setupIndex: number): Promise<boolean> {
  return getDb().transaction(async (tx) => {
    const batch = await lockReleased(tx, shopId, batchId);
    if (!batch) return false;
    await tx.delete(setupTicks).where(and(eq(setupTicks.batchId, batchId), eq(setupTicks.setupIndex, setupIndex)));
    return true;
  });
}

/** Records spoiled pieces; each comes back as an open part of the material for the next batch. */
export async function spoilPart(
  shopId: string,
  userId: string,
  batchId: string,
  part: { partName: string; lengthUm: number; widthUm: number; grainLocked: boolean; process: "saw" | "laser" },
  origins: (RecutOrigin | null)[],
  reason: string,
): Promise<boolean> {
  return getDb().transaction(async (tx) => {
    const batch = await lockReleased(tx, shopId, batchId);
    if (!batch) return false;
    await tx.insert(recutParts).values(origins.map((origin) => ({ shopId, materialId: batch.materialId, spoiledInBatchId: batchId, ...part, reason, origin, recordedBy: userId })));
    return true;
  });
}

export type RackDecision = { offcutId: string; rack: boolean; lengthUm: number; widthUm: number; location: string };

/**
 * Closes a batch as cut, in one transaction with the rack: every set-up must be ticked; the offcuts
 * the plan expected are racked at their measured sizes (or noted as not kept), the racked offcuts the
 * batch drew are used up, and the batch is marked cut.
 */
export async function closeBatchAsCut(shopId: string, batchId: string, decisions: RackDecision[], setupCount: number, { db = getDb(), now: cutAt = new Date() }: WriteContext = {}): Promise<boolean> {
  return db.transaction(async (tx) => {
    const batch = await lockReleased(tx, shopId, batchId);
    if (!batch) return false;
    const ticks = await tx.select({ i: setupTicks.setupIndex }).from(setupTicks).where(eq(setupTicks.batchId, batchId));
    if (ticks.length < setupCount) throw new FloorStateError(`${setupCount - ticks.length} of ${setupCount} set-ups are not ticked yet.`);
    const expected = await tx.select({ id: offcuts.id }).from(offcuts).where(and(eq(offcuts.sourceBatchId, batchId), eq(offcuts.status, "expected")));
    const decided = new Map(decisions.map((d) => [d.offcutId, d]));
    for (const { id } of expected) {
      const d = decided.get(id);
      if (!d) throw new FloorStateError("Say for every offcut whether it goes on the rack.");
      await tx
        .update(offcuts)
        .set(d.rack ? { status: "racked", lengthUm: d.lengthUm, widthUm: d.widthUm, location: d.location } : { status: "discarded" })
        .where(eq(offcuts.id, id));
    }
    await tx.update(offcuts).set({ status: "used" }).where(and(eq(offcuts.reservedBatchId, batchId), eq(offcuts.status, "reserved")));
    await tx.update(batches).set({ status: "cut", cutAt }).where(eq(batches.id, batchId));
    await writeBatchCosts(tx, shopId, batch, cutAt, decisions.filter((d) => d.rack));
    return true;
  });
}

/** The batch's books, fixed at the moment it is cut (app/lib/ledger.ts states the rules). */
async function writeBatchCosts(tx: Transaction, shopId: string, batch: typeof batches.$inferSelect, cutAt: Date, racked: RackDecision[]) {
  const [plan] = await tx.select({ result: plans.result }).from(plans).where(eq(plans.id, batch.chosenPlanId!));
  const result = plan.result as PlanResult;
  const panels = await tx.select().from(stockPanels).where(and(eq(stockPanels.shopId, shopId), eq(stockPanels.materialId, batch.materialId)));
  const ratePerMm2 = cheapestCostPerArea(panels) * 1e6; // per µm² → per mm²
  const sheets = result.plan.sheets.map((sheet) => {
    const ref = result.stockRefs[sheet.stockId];
    return {
      kind: ref.kind,
      lengthUm: Math.round(sheet.length * 1000),
      widthUm: Math.round(sheet.width * 1000),
      costMinor: ref.costMinor,
      partsAreaMm2: Math.round(sheet.placements.reduce((a, p) => a + p.length * p.width, 0)),
    };
  });
  const spoiled = await tx.select({ lengthUm: recutParts.lengthUm, widthUm: recutParts.widthUm }).from(recutParts).where(eq(recutParts.spoiledInBatchId, batch.id));
  const byOrder = new Map<string, { orderId: string; orderNumber: number; partsAreaMm2: number }>();
  for (const s of await batchSources(batch.id, tx)) {
    const o = byOrder.get(s.orderId) ?? { orderId: s.orderId, orderNumber: s.orderNumber, partsAreaMm2: 0 };
    o.partsAreaMm2 += Math.round((s.lineQuantity * s.quantityPerItem * s.lengthUm * s.widthUm) / 1e6);
    byOrder.set(s.orderId, o);
  }
  const ledger = batchLedger({ sheets, kerfLossMm2: result.plan.metrics.kerfLoss, racked, ratePerMm2, spoiled, orders: [...byOrder.values()] });
  await tx.insert(batchCosts).values({
    batchId: batch.id,
    shopId,
    materialId: batch.materialId,
    cutAt,
    ...ledgerFigures(ledger),
    panels: sheets,
    allocations: ledger.allocations,
  });
}

export async function expectedOffcuts(batchId: string, db: Queryable = getDb()) {
  return db
    .select({ id: offcuts.id, lengthUm: offcuts.lengthUm, widthUm: offcuts.widthUm, status: offcuts.status, location: offcuts.location })
    .from(offcuts)
    .where(and(eq(offcuts.sourceBatchId, batchId), inArray(offcuts.status, ["expected", "racked", "discarded"])))
    .orderBy(desc(sql`${offcuts.lengthUm}::bigint * ${offcuts.widthUm}`));
}

/** The panels and racked offcuts to pull for a released batch, with where the offcuts sit. */
export async function reservedOffcuts(batchId: string) {
  return getDb()
    .select({ id: offcuts.id, lengthUm: offcuts.lengthUm, widthUm: offcuts.widthUm, location: offcuts.location })
    .from(offcuts)
    .where(and(eq(offcuts.reservedBatchId, batchId), inArray(offcuts.status, ["reserved", "used"])));
}
