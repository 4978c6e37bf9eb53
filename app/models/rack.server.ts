import { and, asc, eq, inArray } from "drizzle-orm";
import { batches, materials, offcuts, stockPanels } from "../../db/schema";
import { getDb } from "~/db.server";
import { byRackOrder } from "~/lib/rack-order";

/** The rack and the sheet stock, per material. */
export async function rackOverview(shopId: string) {
  const db = getDb();
  const [mats, rack, panels] = await Promise.all([
    db.select({ id: materials.id, name: materials.name }).from(materials).where(eq(materials.shopId, shopId)).orderBy(asc(materials.name)),
    db
      .select({ id: offcuts.id, materialId: offcuts.materialId, lengthUm: offcuts.lengthUm, widthUm: offcuts.widthUm, grain: offcuts.grain, location: offcuts.location, status: offcuts.status, sourceBatch: batches.number, createdAt: offcuts.createdAt })
      .from(offcuts)
      .leftJoin(batches, eq(batches.id, offcuts.sourceBatchId))
      .where(and(eq(offcuts.shopId, shopId), inArray(offcuts.status, ["racked", "reserved", "expected"])))
      .then((rows) => rows.sort(byRackOrder)),
    db.select().from(stockPanels).where(eq(stockPanels.shopId, shopId)),
  ]);
  return mats.map((m) => ({
    ...m,
    offcuts: rack.filter((o) => o.materialId === m.id),
    panels: panels.filter((p) => p.materialId === m.id).sort((a, b) => b.lengthUm * b.widthUm - a.lengthUm * a.widthUm),
  }));
}

export async function addOffcut(shopId: string, input: { materialId: string; lengthUm: number; widthUm: number; location: string; grain: "length" | "none" }): Promise<boolean> {
  const [material] = await getDb().select({ id: materials.id }).from(materials).where(and(eq(materials.id, input.materialId), eq(materials.shopId, shopId)));
  if (!material) return false;
  await getDb().insert(offcuts).values({ shopId, ...input });
  return true;
}

export async function updateOffcut(shopId: string, offcutId: string, change: { location?: string; status?: "discarded" }): Promise<boolean> {
  const rows = await getDb()
    .update(offcuts)
    .set(change)
    .where(and(eq(offcuts.id, offcutId), eq(offcuts.shopId, shopId), eq(offcuts.status, "racked")))
    .returning({ id: offcuts.id });
  return rows.length > 0;
}
