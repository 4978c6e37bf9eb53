import { and, asc, eq, sql } from "drizzle-orm";
import { batchCosts, batches, materials } from "../../db/schema";
import { getDb } from "~/db.server";
import { todayIso } from "~/lib/dates";
import type { LedgerFigures } from "~/lib/ledger";
import { fillTrend, trendMonths, type TrendMonth } from "~/lib/ledger-trend";

export type LedgerRow = LedgerFigures & { batchId: string; batchNumber: number; materialId: string; materialName: string; cutAt: Date };

const columns = {
  batchId: batchCosts.batchId,
  batchNumber: batches.number,
  materialId: batchCosts.materialId,
  materialName: materials.name,
  cutAt: batchCosts.cutAt,
  stockAreaMm2: batchCosts.stockAreaMm2,
  offcutDrawnAreaMm2: batchCosts.offcutDrawnAreaMm2,
  partsAreaMm2: batchCosts.partsAreaMm2,
  kerfLossMm2: batchCosts.kerfLossMm2,
  rackedAreaMm2: batchCosts.rackedAreaMm2,
  scrapAreaMm2: batchCosts.scrapAreaMm2,
  spoiledAreaMm2: batchCosts.spoiledAreaMm2,
  spoiledCount: batchCosts.spoiledCount,
  costDrawnMinor: batchCosts.costDrawnMinor,
  valueReturnedMinor: batchCosts.valueReturnedMinor,
  scrapCostMinor: batchCosts.scrapCostMinor,
  spoiledCostMinor: batchCosts.spoiledCostMinor,
};

/** The start of an ISO day on the shop's clock, as PostgreSQL's instant. */
const dayStart = (day: string, timeZone: string) => sql`(${day}::timestamp at time zone ${timeZone})`;

/** The batches cut in [from, to) (days on the shop's clock), oldest first. */
export async function ledgerBatches(shopId: string, from: string, to: string, timeZone = "UTC"): Promise<LedgerRow[]> {
  return getDb()
    .select(columns)
    .from(batchCosts)
    .innerJoin(batches, eq(batches.id, batchCosts.batchId))
    .innerJoin(materials, eq(materials.id, batchCosts.materialId))
    .where(and(eq(batchCosts.shopId, shopId), sql`${batchCosts.cutAt} >= ${dayStart(from, timeZone)}`, sql`${batchCosts.cutAt} < ${dayStart(to, timeZone)}`))
    .orderBy(asc(batchCosts.cutAt));
}

export async function batchCostDetail(shopId: string, batchId: string) {
  const [row] = await getDb()
    .select({ ...columns, panels: batchCosts.panels, allocations: batchCosts.allocations })
    .from(batchCosts)
    .innerJoin(batches, eq(batches.id, batchCosts.batchId))
    .innerJoin(materials, eq(materials.id, batchCosts.materialId))
    .where(and(eq(batchCosts.batchId, batchId), eq(batchCosts.shopId, shopId)));
  return row ?? null;
}

/** Yield and scrap cost of each of the last `months` months (this one included, on the shop's clock), for the chart: sums in PostgreSQL, exact integers. */
export async function monthlyTrend(shopId: string, now = new Date(), months = 12, timeZone = "UTC"): Promise<TrendMonth[]> {
  const shown = trendMonths(new Date(`${todayIso(now, timeZone)}T00:00:00Z`), months);
  const rows = await getDb()
    .select({
      month: sql<string>`to_char(${batchCosts.cutAt} at time zone ${timeZone}, 'YYYY-MM')`,
      stockAreaMm2: sql<string>`sum(${batchCosts.stockAreaMm2})`,
      partsAreaMm2: sql<string>`sum(${batchCosts.partsAreaMm2})`,
      scrapCostMinor: sql<string>`sum(${batchCosts.scrapCostMinor})`,
      batches: sql<number>`count(*)::int`,
    })
    .from(batchCosts)
    .where(and(eq(batchCosts.shopId, shopId), sql`${batchCosts.cutAt} >= ${dayStart(`${shown[0]}-01`, timeZone)}`))
    .groupBy(sql`1`)
    .orderBy(sql`1`);
  const cut = rows.map((r) => ({ month: r.month, batches: r.batches, yield: Number(r.stockAreaMm2) > 0 ? Number(r.partsAreaMm2) / Number(r.stockAreaMm2) : 0, scrapCostMinor: Number(r.scrapCostMinor) }));
  return fillTrend(shown, cut);
}

/** An order's material cost: its shares of the batches that cut its parts. */
export async function orderMaterialCost(shopId: string, orderId: string): Promise<{ costMinor: number; batches: number } | null> {
  const [row] = await getDb()
    .select({
      cost: sql<string | null>`sum((a->>'costMinor')::bigint)`,
      batches: sql<number>`count(*)::int`,
    })
    .from(sql`${batchCosts}, jsonb_array_elements(${batchCosts.allocations}) a`)
    .where(sql`${batchCosts.shopId} = ${shopId} and a->>'orderId' = ${orderId}`);
  return row && row.batches > 0 ? { costMinor: Number(row.cost ?? 0), batches: row.batches } : null;
}
