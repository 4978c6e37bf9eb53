// What the set-up sheet and the part labels read: a released batch, its chosen plan, the parts with
// their origins, the reserved offcuts' rack places, and the saw and sled the plan assumed.
import { and, eq, inArray } from "drizzle-orm";
import { offcuts } from "../../db/schema";
import { getDb } from "~/db.server";
import { formatDay } from "~/lib/dates";
import type { SetupSheetInput, SheetPart } from "~/lib/setup-sheet";
import { getBatch } from "./batches.server";
import { batchCutList, LASER_BLANK_PART, type BatchCutList } from "./plan-job.server";
import { getPlan } from "./plans.server";
import { getShop, type ShopSettings } from "./shops.server";
import { getSaw, getSled } from "./sleds.server";

const RELEASED = new Set(["released", "cut", "closed"]);

export type ReleasedBatch = {
  batch: NonNullable<Awaited<ReturnType<typeof getBatch>>>;
  plan: NonNullable<Awaited<ReturnType<typeof getPlan>>>;
  result: NonNullable<NonNullable<Awaited<ReturnType<typeof getPlan>>>["result"]>;
  shop: ShopSettings;
  cutList: BatchCutList;
};

/** A batch of this shop that has gone to the saw, with its chosen plan; null when there is none such. */
export async function releasedBatch(shopId: string, batchId: string): Promise<ReleasedBatch | null> {
  const batch = await getBatch(shopId, batchId);
  if (!batch || !RELEASED.has(batch.status) || !batch.chosenPlanId) return null;
  const plan = await getPlan(shopId, batch.id, batch.chosenPlanId);
  if (!plan?.result) return null;
  const shop = await getShop(shopId);
  return { batch, plan, result: plan.result, shop, cutList: await batchCutList(batch.id, shop) };
}

export async function setupSheetInput({ batch, plan, result, shop, cutList }: ReleasedBatch, now: Date): Promise<SetupSheetInput> {
  const parts: Record<string, SheetPart> = {};
  for (const p of cutList.sawn) parts[p.key] = { name: p.name, lengthUm: p.lengthUm, widthUm: p.widthUm, origins: p.origins };
  if (cutList.blanks.length) {
    parts[LASER_BLANK_PART] = { name: "Laser blank", lengthUm: shop.laserBedLengthUm, widthUm: shop.laserBedWidthUm, origins: cutList.laser.flatMap((p) => p.origins) };
  }
  const offcutIds = Object.values(result.stockRefs).filter((r) => r.kind === "offcut").map((r) => r.id);
  const rack = offcutIds.length
    ? await getDb()
        .select({ id: offcuts.id, lengthUm: offcuts.lengthUm, widthUm: offcuts.widthUm, location: offcuts.location })
        .from(offcuts)
        .where(and(eq(offcuts.shopId, shop.id), eq(offcuts.reservedBatchId, batch.id), inArray(offcuts.id, offcutIds)))
    : [];
  // A batch already cut is shown as it stood that day: the saw's kerf and the sled's check then.
  const asOf = batch.cutAt ?? now;
  const [saw, sled] = await Promise.all([
    plan.settings.sawId ? getSaw(shop.id, plan.settings.sawId, asOf) : null,
    plan.settings.sledId ? getSled(shop.id, plan.settings.sledId, asOf) : null,
  ]);
  return {
    batch: { code: batch.code, materialName: batch.materialName, thicknessUm: batch.thicknessUm, cutOn: batch.cutAt ? formatDay(batch.cutAt.toISOString(), shop.timeZone) : null },
    shop,
    plan: { number: plan.number, kerfMm: plan.settings.kerfMm, plan: result.plan, stockRefs: result.stockRefs },
    parts,
    offcuts: Object.fromEntries(rack.map((o) => [o.id, o])),
    saw: saw ? { name: saw.name, latestKerfUm: saw.latestKerfUm } : null,
    sled,
    now: asOf,
  };
}
