import { and, asc, eq, inArray, sql } from "drizzle-orm";
import { alias } from "drizzle-orm/pg-core";
import { batches, batchLines, heldLines, materials, orderLines, productParts, recutParts } from "../../db/schema";
import { getDb } from "~/db.server";
import { lineProgress, type LineBatch, type LineRecut, type ProgressItem } from "~/lib/line-progress";
import type { OrderStatus } from "~/lib/order-status";

/** Where each line of an order is in the shop (see lib/line-progress), by line id; the reads run side by side. */
export async function orderProgress(shopId: string, order: { id: string; status: OrderStatus; lines: { id: string }[] }, timeZone = "UTC"): Promise<Record<string, ProgressItem[]>> {
  const lineIds = order.lines.map((l) => l.id);
  if (lineIds.length === 0 || order.status === "draft" || order.status === "cancelled") return {};
  const db = getDb();
  const again = alias(batches, "again");
  const spoiledIn = alias(batches, "spoiled_in");
  const [needs, inBatches, held, recuts] = await Promise.all([
    db
      .selectDistinct({ lineId: orderLines.id, material: materials.name })
      .from(orderLines)
      .innerJoin(productParts, eq(productParts.productId, orderLines.productId))
      .innerJoin(materials, eq(materials.id, productParts.materialId))
      .where(inArray(orderLines.id, lineIds))
      .orderBy(asc(materials.name)),
    db
      .select({ lineId: batchLines.orderLineId, material: materials.name, batchId: batches.id, number: batches.number, status: batches.status, releasedAt: batches.releasedAt, cutAt: batches.cutAt })
      .from(batchLines)
      .innerJoin(batches, and(eq(batches.id, batchLines.batchId), eq(batches.shopId, shopId)))
      .innerJoin(materials, eq(materials.id, batchLines.materialId))
      .where(inArray(batchLines.orderLineId, lineIds)),
    db
      .select({ lineId: heldLines.orderLineId, material: materials.name })
      .from(heldLines)
      .innerJoin(materials, eq(materials.id, heldLines.materialId))
      .where(and(eq(heldLines.shopId, shopId), inArray(heldLines.orderLineId, lineIds))),
    db
      .select({ lineId: sql<string>`${recutParts.origin}->>'lineId'`, partName: recutParts.partName, spoiledIn: spoiledIn.number, againId: again.id, againNumber: again.number, againStatus: again.status })
      .from(recutParts)
      .innerJoin(spoiledIn, eq(spoiledIn.id, recutParts.spoiledInBatchId))
      .leftJoin(again, eq(again.id, recutParts.batchId))
      .where(and(eq(recutParts.shopId, shopId), sql`${recutParts.origin}->>'orderId' = ${order.id}`))
      .orderBy(asc(recutParts.createdAt)),
  ]);
  const byLine: Record<string, ProgressItem[]> = {};
  for (const lineId of lineIds) {
    const lineBatches: LineBatch[] = inBatches
      .filter((b) => b.lineId === lineId)
      .map((b) => ({ ...b, releasedAt: b.releasedAt?.toISOString() ?? null, cutAt: b.cutAt?.toISOString() ?? null }));
    const lineRecuts: LineRecut[] = recuts
      .filter((r) => r.lineId === lineId)
      .map((r) => ({ partName: r.partName, spoiledIn: r.spoiledIn, again: r.againId && r.againNumber !== null && r.againStatus ? { batchId: r.againId, number: r.againNumber, status: r.againStatus } : null }));
    byLine[lineId] = lineProgress({
      orderStatus: order.status,
      materials: needs.filter((n) => n.lineId === lineId).map((n) => n.material),
      batches: lineBatches,
      held: held.filter((h) => h.lineId === lineId).map((h) => h.material),
      recuts: lineRecuts,
      timeZone,
    });
  }
  return byLine;
}
