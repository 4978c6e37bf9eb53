import { and, asc, desc, eq, inArray } from "drizzle-orm";
import { createHash } from "node:crypto";
import { offcuts, sleds, stockPanels, type PlanSettings } from "../../db/schema";
import { getDb, type Queryable } from "~/db.server";
import { mergeBatchParts, type BatchSource, type MergedPart } from "~/lib/batch-parts";
import { nestLaserParts, type LaserBlank } from "~/lib/laser-blanks";
import { umToMm } from "~/lib/packing";
import type { Job, PartInput, StockInput } from "~/lib/packing/types";
import { batchSources } from "./batches.server";
import type { ShopSettings } from "./shops.server";

export const LASER_BLANK_PART = "laser-blank";

export type BatchCutList = { sawn: MergedPart[]; laser: MergedPart[]; blanks: LaserBlank[]; laserUnplaced: { key: string; name: string; quantity: number; reason: string }[] };

// Nesting runs the engine for a few hundred milliseconds; pages ask for the same batch again and
// again, so results are kept per exact input (parts, texts and bed settings).
const nestCache = new Map<string, ReturnType<typeof nestLaserParts>>();
const NEST_CACHE_SIZE = 50;

function nestCached(laser: MergedPart[], shop: ShopSettings) {
  const settings = { bedLengthUm: shop.laserBedLengthUm, bedWidthUm: shop.laserBedWidthUm, spacingUm: shop.laserSpacingUm, marginUm: shop.laserSpacingUm };
  const key = createHash("sha256").update(JSON.stringify([laser, settings])).digest("hex");
  let nested = nestCache.get(key);
  if (!nested) {
    nested = nestLaserParts(laser, settings);
    if (nestCache.size >= NEST_CACHE_SIZE) nestCache.delete(nestCache.keys().next().value!);
    nestCache.set(key, nested);
  }
  return nested;
}

/** What a batch cuts: its merged sawn parts, and its laser items nested onto bed-sized blanks. */
export async function batchCutList(batchId: string, shop: ShopSettings, db?: Queryable): Promise<BatchCutList> {
  return cutListOf(await batchSources(batchId, db), shop);
}

/** The cut list of a batch's sources (from `batchSources`), for callers that read them alongside other queries. */
export function cutListOf(sources: BatchSource[], shop: ShopSettings): BatchCutList {
  const merged = mergeBatchParts(sources);
  const laser = merged.filter((p) => p.process === "laser");
  const nested = laser.length ? nestCached(laser, shop) : { blanks: [], unplaced: [] };
  return { sawn: merged.filter((p) => p.process === "saw"), laser, blanks: nested.blanks, laserUnplaced: nested.unplaced };
}

export type StockRef = { kind: "panel" | "offcut"; id: string; costMinor: number; lengthUm: number; widthUm: number; grain: "length" | "none" };

/**
 * The packing job for a batch: its sawn parts plus one part row for the laser blanks (all the same
 * size, so one fence and one stop setting cut them all), on the material's full sheets and the
 * racked offcuts the planner allowed. Costs are minor units.
 */
export async function buildPackingJob(shop: ShopSettings, batch: { id: string; materialId: string }, settings: PlanSettings, inTransaction?: Queryable) {
  const db = inTransaction ?? getDb();
  const cutList = await batchCutList(batch.id, shop, inTransaction);
  // The sled the planner chose sets the stop range and the widest crosscut; else the shop's settings do.
  const [sled] = settings.sledId ? await db.select().from(sleds).where(and(eq(sleds.id, settings.sledId), eq(sleds.shopId, shop.id))) : [];
  const [panels, rack] = await Promise.all([
    // In a fixed order (largest first), so one batch and seed give one plan however the rows lie on disk.
    db
      .select()
      .from(stockPanels)
      .where(and(eq(stockPanels.shopId, shop.id), eq(stockPanels.materialId, batch.materialId)))
      .orderBy(desc(stockPanels.lengthUm), desc(stockPanels.widthUm), asc(stockPanels.id)),
    settings.offcutIds.length
      ? db.select().from(offcuts).where(and(eq(offcuts.shopId, shop.id), eq(offcuts.materialId, batch.materialId), eq(offcuts.status, "racked"), inArray(offcuts.id, settings.offcutIds))).orderBy(desc(offcuts.lengthUm), desc(offcuts.widthUm), asc(offcuts.id))
      : Promise.resolve([]),
  ]);
  const stockRefs: Record<string, StockRef> = {};
  const stock: StockInput[] = [];
  for (const p of panels) {
    const id = `panel:${p.id}`;
    stockRefs[id] = { kind: "panel", id: p.id, costMinor: p.costMinor, lengthUm: p.lengthUm, widthUm: p.widthUm, grain: p.grain };
    // Sheets can be bought: the plan is not capped by the count on hand; release checks it.
    stock.push({ id, length: umToMm(p.lengthUm), width: umToMm(p.widthUm), quantity: null, cost: p.costMinor, grain: p.grain, trimmed: true });
  }
  const costPerUm2 = cheapestCostPerArea(panels);
  for (const o of rack) {
    const id = `offcut:${o.id}`;
    const costMinor = Math.round(costPerUm2 * o.lengthUm * o.widthUm);
    stockRefs[id] = { kind: "offcut", id: o.id, costMinor, lengthUm: o.lengthUm, widthUm: o.widthUm, grain: o.grain };
    stock.push({ id, length: umToMm(o.lengthUm), width: umToMm(o.widthUm), quantity: 1, cost: costMinor, grain: o.grain, trimmed: false });
  }

  const parts: PartInput[] = cutList.sawn.map((p) => ({ id: p.key, length: umToMm(p.lengthUm), width: umToMm(p.widthUm), quantity: p.quantity, rotate: !p.grainLocked }));
  if (cutList.blanks.length) {
    const grainLocked = cutList.laser.some((p) => p.grainLocked);
    parts.push({ id: LASER_BLANK_PART, length: umToMm(shop.laserBedLengthUm), width: umToMm(shop.laserBedWidthUm), quantity: cutList.blanks.length, rotate: !grainLocked });
  }
  const job: Job = {
    kerf: settings.kerfMm,
    trim: settings.trimMm,
    stages: settings.stages,
    objective: settings.objective,
    timeLimitMs: settings.timeLimitMs,
    seed: settings.seed,
    stock,
    parts,
    minOffcut: { shortSide: umToMm(shop.minOffcutShortUm), area: shop.minOffcutAreaMm2 },
    limits: {
      ripMax: umToMm(shop.ripMaxUm),
      sledWidthMax: umToMm(sled?.widestUm ?? shop.sledWidthMaxUm),
      stopMin: umToMm(sled?.stopMinUm ?? shop.stopMinUm),
      stopMax: umToMm(sled?.stopMaxUm ?? shop.stopMaxUm),
    },
  };
  return { job, stockRefs, cutList };
}

/** Offcuts are valued at the material's cheapest full-sheet price per area (the ledger uses the same rule). */
export function cheapestCostPerArea(panels: { costMinor: number; lengthUm: number; widthUm: number }[]): number {
  const rates = panels.map((p) => p.costMinor / (p.lengthUm * p.widthUm));
  return rates.length ? Math.min(...rates) : 0;
}
