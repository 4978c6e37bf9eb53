import { and, asc, desc, eq, inArray, isNull, lte, notExists, sql } from "drizzle-orm";
import { batches, batchLines, customers, heldLines, materials, orderLines, orders, plans, productParts, products, recutParts, shops } from "../../db/schema";
import { getDb } from "~/db.server";
import type { BatchSource } from "~/lib/batch-parts";
import { batchCode } from "~/lib/batches";

export class BatchStateError extends Error {}

type Tx = Parameters<Parameters<ReturnType<typeof getDb>["transaction"]>[0]>[0];
type Db = ReturnType<typeof getDb> | Tx;

/** Order lines that no batch cuts yet, one row per line and material of its parts, due by a date. */
function unbatchedLines(db: Db, shopId: string, dueBy: string) {
  return db
    .selectDistinct({
      lineId: orderLines.id,
      materialId: productParts.materialId,
      materialName: materials.name,
      orderId: orders.id,
      orderNumber: orders.number,
      customerName: customers.name,
      productName: products.name,
      quantity: orderLines.quantity,
      dueDate: orders.dueDate,
    })
    .from(orderLines)
    .innerJoin(orders, eq(orders.id, orderLines.orderId))
    .innerJoin(customers, eq(customers.id, orders.customerId))
    .innerJoin(products, eq(products.id, orderLines.productId))
    .innerJoin(productParts, eq(productParts.productId, products.id))
    .innerJoin(materials, eq(materials.id, productParts.materialId))
    .where(
      and(
        eq(orders.shopId, shopId),
        inArray(orders.status, ["confirmed", "in_production"]),
        lte(orders.dueDate, dueBy),
        notExists(db.select({ x: sql`1` }).from(batchLines).where(and(eq(batchLines.orderLineId, orderLines.id), eq(batchLines.materialId, productParts.materialId)))),
        notExists(db.select({ x: sql`1` }).from(heldLines).where(and(eq(heldLines.orderLineId, orderLines.id), eq(heldLines.materialId, productParts.materialId)))),
      ),
    )
    .orderBy(asc(materials.name), asc(orders.dueDate), asc(orders.number), asc(products.name));
}

/** Spoiled parts waiting to be cut again, whatever their due date: they are late already. */
function openRecuts(db: Db, shopId: string) {
  return db
    .select({ id: recutParts.id, materialId: recutParts.materialId, materialName: materials.name, partName: recutParts.partName, reason: recutParts.reason, origin: recutParts.origin })
    .from(recutParts)
    .innerJoin(materials, eq(materials.id, recutParts.materialId))
    .where(and(eq(recutParts.shopId, shopId), isNull(recutParts.batchId)))
    .orderBy(asc(recutParts.createdAt));
}

export type ProposedBatch = {
  materialId: string;
  materialName: string;
  lines: Awaited<ReturnType<typeof unbatchedLines>>;
  recuts: Awaited<ReturnType<typeof openRecuts>>;
};

/** One proposed batch per material (a material is one thickness) of the confirmed lines due by `dueBy`, and parts to cut again. */
export async function proposeBatches(shopId: string, dueBy: string): Promise<ProposedBatch[]> {
  const db = getDb();
  return groupByMaterial(await unbatchedLines(db, shopId, dueBy), await openRecuts(db, shopId));
}

function groupByMaterial(rows: Awaited<ReturnType<typeof unbatchedLines>>, recuts: Awaited<ReturnType<typeof openRecuts>>): ProposedBatch[] {
  const byMaterial = new Map<string, ProposedBatch>();
  const group = (materialId: string, materialName: string) => {
    let g = byMaterial.get(materialId);
    if (!g) byMaterial.set(materialId, (g = { materialId, materialName, lines: [], recuts: [] }));
    return g;
  };
  for (const row of rows) group(row.materialId, row.materialName).lines.push(row);
  for (const recut of recuts) group(recut.materialId, recut.materialName).recuts.push(recut);
  return [...byMaterial.values()];
}

/** Creates the proposed batches afresh inside one transaction; lines another planner batched meanwhile are skipped. */
export async function createBatches(shopId: string, dueBy: string, materialIds?: string[]): Promise<string[]> {
  return getDb().transaction(async (tx) => {
    await tx.select({ id: shops.id }).from(shops).where(eq(shops.id, shopId)).for("update");
    const groups = groupByMaterial(await unbatchedLines(tx, shopId, dueBy), await openRecuts(tx, shopId)).filter((g) => !materialIds || materialIds.includes(g.materialId));
    const [{ last }] = await tx.select({ last: sql<number>`coalesce(max(${batches.number}), 0)` }).from(batches).where(eq(batches.shopId, shopId));
    const ids: string[] = [];
    for (const [i, group] of groups.entries()) {
      const [batch] = await tx.insert(batches).values({ shopId, number: last + i + 1, materialId: group.materialId, dueBy }).returning({ id: batches.id });
      if (group.lines.length) {
        await tx
          .insert(batchLines)
          .values(group.lines.map((l) => ({ batchId: batch.id, orderLineId: l.lineId, materialId: group.materialId })))
          .onConflictDoNothing();
      }
      if (group.recuts.length) {
        await tx.update(recutParts).set({ batchId: batch.id }).where(and(inArray(recutParts.id, group.recuts.map((r) => r.id)), isNull(recutParts.batchId)));
      }
      ids.push(batch.id);
    }
    return ids;
  });
}


export async function listBatches(shopId: string) {
  const db = getDb();
  return db
    .select({
      id: batches.id,
      number: batches.number,
      status: batches.status,
      dueBy: batches.dueBy,
      materialName: materials.name,
      lines: db.$count(batchLines, eq(batchLines.batchId, batches.id)),
      plans: db.$count(plans, eq(plans.batchId, batches.id)),
    })
    .from(batches)
    .innerJoin(materials, eq(materials.id, batches.materialId))
    .where(eq(batches.shopId, shopId))
    .orderBy(sql`${batches.status} in ('cut', 'closed')`, desc(batches.number));
}

export async function listHeldLines(shopId: string) {
  return getDb()
    .select({ lineId: heldLines.orderLineId, materialId: heldLines.materialId, materialName: materials.name, orderId: orders.id, orderNumber: orders.number, productName: products.name, quantity: orderLines.quantity })
    .from(heldLines)
    .innerJoin(orderLines, eq(orderLines.id, heldLines.orderLineId))
    .innerJoin(orders, eq(orders.id, orderLines.orderId))
    .innerJoin(products, eq(products.id, orderLines.productId))
    .innerJoin(materials, eq(materials.id, heldLines.materialId))
    .where(eq(heldLines.shopId, shopId))
    .orderBy(asc(orders.number));
}

export async function getBatch(shopId: string, batchId: string) {
  const db = getDb();
  // Both reads at once; the lines count only when the batch is this shop's.
  const [[batch], lines] = await Promise.all([
    db
      .select({
        id: batches.id,
        number: batches.number,
        status: batches.status,
        dueBy: batches.dueBy,
        chosenPlanId: batches.chosenPlanId,
        releasedAt: batches.releasedAt,
        materialId: materials.id,
        materialName: materials.name,
        thicknessUm: materials.thicknessUm,
      })
      .from(batches)
      .innerJoin(materials, eq(materials.id, batches.materialId))
      .where(and(eq(batches.id, batchId), eq(batches.shopId, shopId))),
    db
      .select({ lineId: orderLines.id, orderId: orders.id, orderNumber: orders.number, customerName: customers.name, productName: products.name, quantity: orderLines.quantity, dueDate: orders.dueDate })
      .from(batchLines)
      .innerJoin(orderLines, eq(orderLines.id, batchLines.orderLineId))
      .innerJoin(orders, eq(orders.id, orderLines.orderId))
      .innerJoin(customers, eq(customers.id, orders.customerId))
      .innerJoin(products, eq(products.id, orderLines.productId))
      .where(eq(batchLines.batchId, batchId))
      .orderBy(asc(orders.number), asc(products.name)),
  ]);
  if (!batch) return null;
  return { ...batch, code: batchCode(batch.number), lines };
}

/** The product parts of the batch's material, one row per part of each line, for merging into the cut list. */
export async function batchSources(batchId: string, db: Db = getDb()): Promise<BatchSource[]> {
  const rows = await db
    .select({
      orderId: orders.id,
      orderNumber: orders.number,
      customerName: customers.name,
      lineId: orderLines.id,
      productName: products.name,
      lineQuantity: orderLines.quantity,
      personalisation: orderLines.personalisation,
      partName: productParts.name,
      lengthUm: productParts.lengthUm,
      widthUm: productParts.widthUm,
      quantityPerItem: productParts.quantity,
      grainLocked: productParts.grainLocked,
      process: productParts.process,
    })
    .from(batchLines)
    .innerJoin(orderLines, eq(orderLines.id, batchLines.orderLineId))
    .innerJoin(orders, eq(orders.id, orderLines.orderId))
    .innerJoin(customers, eq(customers.id, orders.customerId))
    .innerJoin(products, eq(products.id, orderLines.productId))
    .innerJoin(productParts, and(eq(productParts.productId, products.id), eq(productParts.materialId, batchLines.materialId)))
    .where(eq(batchLines.batchId, batchId))
    .orderBy(asc(orders.number), asc(orderLines.id), asc(productParts.name));
  // A part to cut again is one item of its own, carrying the origin it had.
  const recuts = await db.select().from(recutParts).where(eq(recutParts.batchId, batchId)).orderBy(asc(recutParts.createdAt));
  return [
    ...rows,
    ...recuts.map((r) => ({
      orderId: r.origin?.orderId ?? r.id,
      orderNumber: r.origin?.orderNumber ?? 0,
      customerName: r.origin?.customerName ?? "Recut",
      lineId: r.origin?.lineId ?? r.id,
      productName: r.origin?.productName ?? r.partName,
      lineQuantity: 1,
      personalisation: r.origin?.text ? [r.origin.text] : [],
      firstItemIndex: r.origin?.itemIndex ?? 0,
      partName: r.partName,
      lengthUm: r.lengthUm,
      widthUm: r.widthUm,
      quantityPerItem: 1,
      grainLocked: r.grainLocked,
      process: r.process,
    })),
  ];
}

async function lockOpenBatch(tx: Tx, shopId: string, batchId: string) {
  const [batch] = await tx.select({ id: batches.id, status: batches.status, materialId: batches.materialId }).from(batches).where(and(eq(batches.id, batchId), eq(batches.shopId, shopId))).for("update");
  if (!batch) return null;
  if (batch.status !== "open" && batch.status !== "planned") throw new BatchStateError("This batch has gone to the saw; its lines no longer change.");
  return batch;
}

// A batch whose lines change no longer matches its plans: they go, and it is open again.
async function discardPlans(tx: Tx, batchId: string) {
  await tx.delete(plans).where(eq(plans.batchId, batchId));
  await tx.update(batches).set({ status: "open", chosenPlanId: null }).where(eq(batches.id, batchId));
}

/** Moves a line to another open batch of the same material. False: a batch or the line is not found here. */
export async function moveLine(shopId: string, batchId: string, lineId: string, targetBatchId: string): Promise<boolean> {
  return getDb().transaction(async (tx) => {
    const from = await lockOpenBatch(tx, shopId, batchId);
    const to = await lockOpenBatch(tx, shopId, targetBatchId);
    if (!from || !to) return false;
    if (from.materialId !== to.materialId) throw new BatchStateError("Lines move only between batches of the same material.");
    const moved = await tx
      .update(batchLines)
      .set({ batchId: to.id })
      .where(and(eq(batchLines.batchId, from.id), eq(batchLines.orderLineId, lineId)))
      .returning({ id: batchLines.orderLineId });
    if (!moved.length) return false;
    await discardPlans(tx, from.id);
    await discardPlans(tx, to.id);
    return true;
  });
}

/** Holds a line back: out of this batch and out of proposals until the hold is lifted. */
export async function holdLine(shopId: string, batchId: string, lineId: string): Promise<boolean> {
  return getDb().transaction(async (tx) => {
    const batch = await lockOpenBatch(tx, shopId, batchId);
    if (!batch) return false;
    const removed = await tx.delete(batchLines).where(and(eq(batchLines.batchId, batch.id), eq(batchLines.orderLineId, lineId))).returning({ materialId: batchLines.materialId });
    if (!removed.length) return false;
    await tx.insert(heldLines).values({ shopId, orderLineId: lineId, materialId: removed[0].materialId }).onConflictDoNothing();
    await discardPlans(tx, batch.id);
    return true;
  });
}

export async function releaseHold(shopId: string, lineId: string, materialId: string): Promise<boolean> {
  const rows = await getDb()
    .delete(heldLines)
    .where(and(eq(heldLines.shopId, shopId), eq(heldLines.orderLineId, lineId), eq(heldLines.materialId, materialId)))
    .returning({ id: heldLines.orderLineId });
  return rows.length > 0;
}

/** Other batches a line of this batch may move to. */
export async function siblingBatches(shopId: string, batchId: string, materialId: string) {
  const rows = await getDb()
    .select({ id: batches.id, number: batches.number })
    .from(batches)
    .where(and(eq(batches.shopId, shopId), eq(batches.materialId, materialId), inArray(batches.status, ["open", "planned"])))
    .orderBy(asc(batches.number));
  return rows.filter((b) => b.id !== batchId).map((b) => ({ ...b, code: batchCode(b.number) }));
}
