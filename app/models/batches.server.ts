import { and, asc, count, desc, eq, inArray, isNull, lte, notExists, sql } from "drizzle-orm";
import { batches, batchLines, customers, heldLines, kerfMeasurements, materials, offcuts, orderLines, orders, plans, productParts, products, recutParts, saws, shops, sleds } from "../../db/schema";
import { getDb, type Queryable, type Transaction, type WriteContext } from "~/db.server";
import type { BatchSource } from "~/lib/batch-parts";
import { batchCode, PROPOSAL_PREVIEW_LINES } from "~/lib/batches";
import { preparedOnce } from "./prepared.server";

export class BatchStateError extends Error {}

/** Order lines that no batch cuts yet, one row per line and material of its parts, due by a date. */
function unbatchedLines(db: Queryable, shopId: string, dueBy: string) {
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

/** A spoiled part no batch cuts again yet. */
const recutWaiting = (shopId: string) => and(eq(recutParts.shopId, shopId), isNull(recutParts.batchId));

/** Spoiled parts waiting to be cut again, whatever their due date: they are late already. */
function openRecuts(db: Queryable, shopId: string) {
  return db
    .select({ id: recutParts.id, materialId: recutParts.materialId, materialName: materials.name, partName: recutParts.partName, reason: recutParts.reason, origin: recutParts.origin })
    .from(recutParts)
    .innerJoin(materials, eq(materials.id, recutParts.materialId))
    .where(recutWaiting(shopId))
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

type Line = ProposedBatch["lines"][number];
type Recut = ProposedBatch["recuts"][number];
export type ProposalPreview = { materialId: string; materialName: string; lines: Line[]; recuts: Recut[]; lineCount: number; itemCount: number; recutCount: number; notListed: number };

/** The unbatched lines of unbatchedLines, in SQL: one row per line and material of its parts. */
const lineMaterialsDue = (shopId: string, dueBy: string) => sql`
  select ol.id as line_id, pm.material_id, o.id as order_id, o.number as order_number, o.customer_id,
         ol.product_id, ol.quantity, o.due_date
  from ${orderLines} ol
  join ${orders} o on o.id = ol.order_id
  join (select distinct product_id, material_id from ${productParts}) pm on pm.product_id = ol.product_id
  where o.shop_id = ${shopId} and o.status in ('confirmed', 'in_production') and o.due_date <= ${dueBy}
    and not exists (select 1 from ${batchLines} bl where bl.order_line_id = ol.id and bl.material_id = pm.material_id)
    and not exists (select 1 from ${heldLines} hl where hl.order_line_id = ol.id and hl.material_id = pm.material_id)`;

/** How many line-and-material rows proposeBatches would take by `dueBy`, and how many spoiled parts wait to be cut again. */
export async function unbatchedCounts(shopId: string, dueBy: string): Promise<{ lines: number; recuts: number }> {
  const [[lines], [recuts]] = await Promise.all([
    getDb().execute<{ n: number }>(sql`select count(*)::int as n from (${lineMaterialsDue(shopId, dueBy)}) lm`),
    getDb().select({ n: count() }).from(recutParts).where(recutWaiting(shopId)),
  ]);
  return { lines: Number(lines.n), recuts: recuts.n };
}

/**
 * What the batches page shows of the proposals: per material the counts of every unbatched line due
 * by `dueBy` and only its first `limit` lines (the same order and rows as proposeBatches, then
 * proposalPreview). Counted and cut down in PostgreSQL, so a busy season's thousands of lines are not
 * sent to the app only to be dropped; creating batches still takes every line (proposeBatches).
 */
export async function proposalPreviews(shopId: string, dueBy: string, limit = PROPOSAL_PREVIEW_LINES): Promise<ProposalPreview[]> {
  const db = getDb();
  const [rows, recuts] = await Promise.all([
    db.execute<Record<string, unknown>>(sql`
      with line_materials as (${lineMaterialsDue(shopId, dueBy)}), ranked as (
        select lm.*, p.name as product_name,
               row_number() over (partition by lm.material_id order by lm.due_date, lm.order_number, p.name, lm.line_id) as rank,
               count(*) over (partition by lm.material_id) as line_count,
               sum(lm.quantity) over (partition by lm.material_id) as item_count
        from line_materials lm join ${products} p on p.id = lm.product_id
      )
      select r.line_id, r.material_id, m.name as material_name, r.order_id, r.order_number, c.name as customer_name,
             r.product_name, r.quantity, r.due_date, r.line_count, r.item_count
      from ranked r join ${materials} m on m.id = r.material_id join ${customers} c on c.id = r.customer_id
      where r.rank <= ${limit}
      order by m.name, r.rank`),
    openRecuts(db, shopId),
  ]);
  const previews = new Map<string, ProposalPreview>();
  const previewOf = (materialId: string, materialName: string) => {
    let p = previews.get(materialId);
    if (!p) previews.set(materialId, (p = { materialId, materialName, lines: [], recuts: [], lineCount: 0, itemCount: 0, recutCount: 0, notListed: 0 }));
    return p;
  };
  for (const r of rows) {
    const p = previewOf(String(r.material_id), String(r.material_name));
    p.lineCount = Number(r.line_count);
    p.itemCount = Number(r.item_count);
    p.lines.push({ lineId: String(r.line_id), materialId: p.materialId, materialName: p.materialName, orderId: String(r.order_id), orderNumber: Number(r.order_number), customerName: String(r.customer_name), productName: String(r.product_name), quantity: Number(r.quantity), dueDate: String(r.due_date) });
  }
  for (const recut of recuts) {
    const p = previewOf(recut.materialId, recut.materialName);
    p.recutCount++;
    if (p.lines.length + p.recuts.length < limit) p.recuts.push(recut);
  }
  for (const p of previews.values()) p.notListed = p.lineCount + p.recutCount - p.lines.length - p.recuts.length;
  return [...previews.values()];
}

/** Creates the proposed batches afresh inside one transaction; lines another planner batched meanwhile are skipped. */
export async function createBatches(shopId: string, dueBy: string, materialIds?: string[], { db = getDb(), now }: WriteContext = {}): Promise<string[]> {
  return db.transaction(async (tx) => {
    await tx.select({ id: shops.id }).from(shops).where(eq(shops.id, shopId)).for("update");
    const groups = groupByMaterial(await unbatchedLines(tx, shopId, dueBy), await openRecuts(tx, shopId)).filter((g) => !materialIds || materialIds.includes(g.materialId));
    const [{ last }] = await tx.select({ last: sql<number>`coalesce(max(${batches.number}), 0)` }).from(batches).where(eq(batches.shopId, shopId));
    const ids: string[] = [];
    for (const [i, group] of groups.entries()) {
      const [batch] = await tx.insert(batches).values({ shopId, number: last + i + 1, materialId: group.materialId, dueBy, createdAt: now }).returning({ id: batches.id });
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

const batchHeaderColumns = {
  id: batches.id,
  number: batches.number,
  status: batches.status,
  dueBy: batches.dueBy,
  chosenPlanId: batches.chosenPlanId,
  releasedAt: batches.releasedAt,
  cutAt: batches.cutAt,
  materialId: materials.id,
  materialName: materials.name,
  thicknessUm: materials.thicknessUm,
};
const byBatchAndShop = and(eq(batches.id, sql.placeholder("batchId")), eq(batches.shopId, sql.placeholder("shopId")));

const batchHeader = preparedOnce((db) => db.select(batchHeaderColumns).from(batches).innerJoin(materials, eq(materials.id, batches.materialId)).where(byBatchAndShop).prepare("batch_header"));

const lineColumns = { lineId: orderLines.id, orderId: orders.id, orderNumber: orders.number, customerName: customers.name, productName: products.name, quantity: orderLines.quantity, dueDate: orders.dueDate };

const batchLineRows = preparedOnce((db) =>
  db
    .select(lineColumns)
    .from(batchLines)
    .innerJoin(orderLines, eq(orderLines.id, batchLines.orderLineId))
    .innerJoin(orders, eq(orders.id, orderLines.orderId))
    .innerJoin(customers, eq(customers.id, orders.customerId))
    .innerJoin(products, eq(products.id, orderLines.productId))
    .where(eq(batchLines.batchId, sql.placeholder("batchId")))
    .orderBy(asc(orders.number), asc(products.name), asc(orderLines.id))
    .prepare("batch_lines"),
);

export type BatchLine = Awaited<ReturnType<ReturnType<typeof batchLineRows>["execute"]>>[number];

export async function getBatch(shopId: string, batchId: string) {
  // Both reads at once; the lines count only when the batch is this shop's.
  const [[batch], lines] = await Promise.all([batchHeader().execute({ batchId, shopId }), batchLineRows().execute({ batchId })]);
  if (!batch) return null;
  return { ...batch, code: batchCode(batch.number), lines };
}

/**
 * Each line of the batch with each of its product's parts of the batch's material (a line whose
 * product lost them meanwhile comes once, part columns null). Without texts, for what only counts.
 */
function contentsQuery(db: Queryable, withTexts = true) {
  return db
    .select({
      ...lineColumns,
      personalisation: withTexts ? orderLines.personalisation : sql<string[]>`'[]'::jsonb`,
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
    .leftJoin(productParts, and(eq(productParts.productId, products.id), eq(productParts.materialId, batchLines.materialId)))
    .where(eq(batchLines.batchId, sql.placeholder("batchId")))
    .orderBy(asc(orders.number), asc(products.name), asc(orderLines.id), asc(productParts.name))
    .prepare(withTexts ? "batch_contents" : "batch_contents_counted");
}

function recutsQuery(db: Queryable) {
  return db.select().from(recutParts).where(eq(recutParts.batchId, sql.placeholder("batchId"))).orderBy(asc(recutParts.createdAt)).prepare("batch_recuts");
}

const poolContents = preparedOnce((db) => contentsQuery(db));
const poolContentsWithoutTexts = preparedOnce((db) => contentsQuery(db, false));
const poolRecuts = preparedOnce(recutsQuery);

/**
 * The batch's lines and, one row per part of each line, its sources for merging into the cut list;
 * one read for both. `withTexts: false` leaves the lines' personalisation out (recuts keep theirs):
 * counting parts and blanks needs none, and a hundred lines' texts cost time to read.
 */
export async function batchContents(batchId: string, db?: Queryable, { withTexts = true } = {}): Promise<{ lines: BatchLine[]; sources: BatchSource[] }> {
  const contents = db ? contentsQuery(db, withTexts) : withTexts ? poolContents() : poolContentsWithoutTexts();
  // One after the other on purpose: the plan runner's first reads after a database restart must not
  // take a second pooled connection that has not yet noticed the restart (plan-faults.test.ts).
  const rows = await contents.execute({ batchId });
  const recuts = await (db ? recutsQuery(db) : poolRecuts()).execute({ batchId });
  const lines: BatchLine[] = [];
  const sources: BatchSource[] = [];
  for (const row of rows) {
    if (lines.at(-1)?.lineId !== row.lineId) lines.push({ lineId: row.lineId, orderId: row.orderId, orderNumber: row.orderNumber, customerName: row.customerName, productName: row.productName, quantity: row.quantity, dueDate: row.dueDate });
    if (row.partName === null) continue;
    sources.push({
      orderId: row.orderId,
      orderNumber: row.orderNumber,
      customerName: row.customerName,
      lineId: row.lineId,
      productName: row.productName,
      lineQuantity: row.quantity,
      personalisation: row.personalisation,
      partName: row.partName,
      lengthUm: row.lengthUm!,
      widthUm: row.widthUm!,
      quantityPerItem: row.quantityPerItem!,
      grainLocked: row.grainLocked!,
      process: row.process!,
    });
  }
  // A part to cut again is one item of its own, carrying the origin it had.
  for (const r of recuts) {
    sources.push({
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
    });
  }
  return { lines, sources };
}

/** The product parts of the batch's material, one row per part of each line, for merging into the cut list. */
export async function batchSources(batchId: string, db?: Queryable): Promise<BatchSource[]> {
  return (await batchContents(batchId, db)).sources;
}

/**
 * What the batch page reads on every view, at once: the batch with its shop's settings, its lines
 * and its sources without the lines' texts (the page counts parts; a row's texts come from the
 * origins API when opened). Null: not this shop's.
 */
export async function batchPage(shopId: string, batchId: string) {
  const [[header], contents] = await Promise.all([batchWithShop().execute({ batchId, shopId }), batchContents(batchId, undefined, { withTexts: false })]);
  if (!header) return null;
  const { shop, ...batch } = header;
  return { batch: { ...batch, code: batchCode(batch.number) }, shop, ...contents };
}

const batchWithShop = preparedOnce((db) =>
  db
    .select({ ...batchHeaderColumns, shop: shops })
    .from(batches)
    .innerJoin(materials, eq(materials.id, batches.materialId))
    .innerJoin(shops, eq(shops.id, batches.shopId))
    .where(byBatchAndShop)
    .prepare("batch_with_shop"),
);

/** Locks the batches (in id order, so two planners moving lines both ways cannot deadlock); null when one is not found in this shop. */
async function lockOpenBatches(tx: Transaction, shopId: string, batchIds: string[]) {
  const rows = await tx
    .select({ id: batches.id, status: batches.status, materialId: batches.materialId })
    .from(batches)
    .where(and(inArray(batches.id, batchIds), eq(batches.shopId, shopId)))
    .orderBy(asc(batches.id))
    .for("update");
  if (rows.length !== new Set(batchIds).size) return null;
  if (rows.some((b) => b.status !== "open" && b.status !== "planned")) throw new BatchStateError("This batch has gone to the saw; its lines no longer change.");
  return batchIds.map((id) => rows.find((b) => b.id === id)!);
}

// A batch whose lines change no longer matches its plans: they go, and it is open again.
async function discardPlans(tx: Transaction, batchId: string) {
  await tx.delete(plans).where(eq(plans.batchId, batchId));
  await tx.update(batches).set({ status: "open", chosenPlanId: null }).where(eq(batches.id, batchId));
}

/** Thrown inside a transaction to undo it when a line is not in the batch; the caller answers "not found". */
class LineNotInBatch extends Error {}

async function unlessMissing(work: Promise<boolean>): Promise<boolean> {
  try {
    return await work;
  } catch (error) {
    if (error instanceof LineNotInBatch) return false;
    throw error;
  }
}

/**
 * Moves lines to another open batch of the same material, all or none. False: a batch or one of
 * the lines is not found here (nothing moved).
 */
export async function moveLines(shopId: string, batchId: string, lineIds: string[], targetBatchId: string): Promise<boolean> {
  const ids = [...new Set(lineIds)];
  return unlessMissing(
    getDb().transaction(async (tx) => {
      const locked = await lockOpenBatches(tx, shopId, [batchId, targetBatchId]);
      if (!locked || !ids.length) return false;
      const [from, to] = locked;
      if (from.materialId !== to.materialId) throw new BatchStateError("Lines move only between batches of the same material.");
      const moved = await tx
        .update(batchLines)
        .set({ batchId: to.id })
        .where(and(eq(batchLines.batchId, from.id), inArray(batchLines.orderLineId, ids)))
        .returning({ id: batchLines.orderLineId });
      if (moved.length !== ids.length) throw new LineNotInBatch();
      await discardPlans(tx, from.id);
      await discardPlans(tx, to.id);
      return true;
    }),
  );
}

/** Holds lines back, all or none: out of this batch and out of proposals until the hold is lifted. */
export async function holdLines(shopId: string, batchId: string, lineIds: string[]): Promise<boolean> {
  const ids = [...new Set(lineIds)];
  return unlessMissing(
    getDb().transaction(async (tx) => {
      const locked = await lockOpenBatches(tx, shopId, [batchId]);
      if (!locked || !ids.length) return false;
      const removed = await tx
        .delete(batchLines)
        .where(and(eq(batchLines.batchId, batchId), inArray(batchLines.orderLineId, ids)))
        .returning({ lineId: batchLines.orderLineId, materialId: batchLines.materialId });
      if (removed.length !== ids.length) throw new LineNotInBatch();
      await tx
        .insert(heldLines)
        .values(removed.map((r) => ({ shopId, orderLineId: r.lineId, materialId: r.materialId })))
        .onConflictDoNothing();
      await discardPlans(tx, batchId);
      return true;
    }),
  );
}

export async function releaseHold(shopId: string, lineId: string, materialId: string): Promise<boolean> {
  const rows = await getDb()
    .delete(heldLines)
    .where(and(eq(heldLines.shopId, shopId), eq(heldLines.orderLineId, lineId), eq(heldLines.materialId, materialId)))
    .returning({ id: heldLines.orderLineId });
  return rows.length > 0;
}

/**
 * What changing an open batch offers, in one round trip: the other open batches of its material
 * (where lines may move), the material's racked offcuts largest first, each saw with its latest
 * measured kerf, and each sled's stop range.
 */
const changeChoicesQuery = preparedOnce((db) => {
  const shopId = sql.placeholder("shopId");
  const materialId = sql.placeholder("materialId");
  const latestKerf = sql`(select ${kerfMeasurements.kerfUm} from ${kerfMeasurements} where ${kerfMeasurements.sawId} = ${saws.id} and ${kerfMeasurements.shopId} = ${saws.shopId} order by ${kerfMeasurements.measuredAt} desc, ${kerfMeasurements.id} desc limit 1)`;
  return db
    .select({
      siblings: sql<{ id: string; number: number }[]>`(select coalesce(json_agg(json_build_object('id', ${batches.id}, 'number', ${batches.number}) order by ${batches.number}), '[]')
        from ${batches} where ${batches.shopId} = ${shopId} and ${batches.materialId} = ${materialId} and ${batches.status} in ('open', 'planned') and ${batches.id} <> ${sql.placeholder("batchId")})`,
      offcuts: sql<{ id: string; lengthUm: number; widthUm: number; location: string }[]>`(select coalesce(json_agg(json_build_object('id', ${offcuts.id}, 'lengthUm', ${offcuts.lengthUm}, 'widthUm', ${offcuts.widthUm}, 'location', ${offcuts.location}) order by ${offcuts.lengthUm}::bigint * ${offcuts.widthUm} desc), '[]')
        from ${offcuts} where ${offcuts.shopId} = ${shopId} and ${offcuts.materialId} = ${materialId} and ${offcuts.status} = 'racked')`,
      saws: sql<{ id: string; name: string; latestKerfUm: number | null }[]>`(select coalesce(json_agg(json_build_object('id', ${saws.id}, 'name', ${saws.name}, 'latestKerfUm', ${latestKerf}) order by ${saws.name}, ${saws.id}), '[]')
        from ${saws} where ${saws.shopId} = ${shopId})`,
      sleds: sql<{ id: string; name: string; stopMinUm: number; stopMaxUm: number }[]>`(select coalesce(json_agg(json_build_object('id', ${sleds.id}, 'name', ${sleds.name}, 'stopMinUm', ${sleds.stopMinUm}, 'stopMaxUm', ${sleds.stopMaxUm}) order by ${sleds.name}, ${sleds.id}), '[]')
        from ${sleds} where ${sleds.shopId} = ${shopId})`,
    })
    .from(shops)
    .where(eq(shops.id, shopId))
    .prepare("batch_change_choices");
});

export async function changeChoices(shopId: string, batch: { id: string; materialId: string }) {
  const [row] = await changeChoicesQuery().execute({ shopId, materialId: batch.materialId, batchId: batch.id });
  return { ...row, siblings: row.siblings.map((b) => ({ ...b, code: batchCode(b.number) })) };
}
