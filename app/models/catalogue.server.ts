// Materials, their stock panels, and products with their bills of parts. Every query names the shop:
// product_parts have no shop column, so they are only reached through a product of this shop.
import { and, asc, count, desc, eq, exists, ilike, inArray, isNotNull, isNull, ne, sql, type SQL } from "drizzle-orm";
import { materials, offcuts, orderLines, orders, productParts, products, stockPanels } from "../../db/schema";
import { getDb } from "~/db.server";
import type { MaterialKind, PartInput } from "~/lib/catalogue";
import { likePattern, type ListQuery } from "~/lib/listing";

// ---- materials and stock panels ----

export type MaterialInput = { name: string; kind: MaterialKind; thicknessUm: number; note: string };
export type PanelInput = { lengthUm: number; widthUm: number; costMinor: number; onHand: number; grain: "length" | "none" };

export async function listMaterials(shopId: string) {
  const db = getDb();
  const [rows, panels] = await Promise.all([
    db.select().from(materials).where(eq(materials.shopId, shopId)).orderBy(asc(materials.name)),
    db.select().from(stockPanels).where(eq(stockPanels.shopId, shopId)).orderBy(desc(stockPanels.lengthUm), desc(stockPanels.widthUm)),
  ]);
  return rows.map((m) => ({ ...m, panels: panels.filter((p) => p.materialId === m.id) }));
}

/** The shop's materials for pickers: id, name, thickness. */
export async function materialOptions(shopId: string) {
  return getDb()
    .select({ id: materials.id, name: materials.name, thicknessUm: materials.thicknessUm })
    .from(materials)
    .where(eq(materials.shopId, shopId))
    .orderBy(asc(materials.name));
}

export async function getMaterial(shopId: string, materialId: string) {
  const [row] = await getDb().select().from(materials).where(and(eq(materials.id, materialId), eq(materials.shopId, shopId)));
  return row ?? null;
}

export async function getPanel(shopId: string, panelId: string) {
  const [row] = await getDb().select().from(stockPanels).where(and(eq(stockPanels.id, panelId), eq(stockPanels.shopId, shopId)));
  return row ?? null;
}

export async function createMaterial(shopId: string, input: MaterialInput) {
  const [row] = await getDb().insert(materials).values({ shopId, ...input }).returning({ id: materials.id });
  return row.id;
}

/** False when the material is not this shop's. */
export async function updateMaterial(shopId: string, materialId: string, input: MaterialInput): Promise<boolean> {
  const rows = await getDb().update(materials).set(input).where(and(eq(materials.id, materialId), eq(materials.shopId, shopId))).returning({ id: materials.id });
  return rows.length > 0;
}

export class MaterialInUseError extends Error {}

/**
 * Removes a material and its stock panels. Refused while product parts are cut from it, or while
 * offcuts of it sit on the rack: those would go with it. Returns false when it is not this shop's.
 */
export async function removeMaterial(shopId: string, materialId: string): Promise<boolean> {
  return getDb().transaction(async (tx) => {
    const [material] = await tx
      .select({ id: materials.id, name: materials.name })
      .from(materials)
      .where(and(eq(materials.id, materialId), eq(materials.shopId, shopId)))
      .for("update");
    if (!material) return false;
    const using = await tx
      .selectDistinct({ name: products.name })
      .from(productParts)
      .innerJoin(products, eq(products.id, productParts.productId))
      .where(and(eq(productParts.materialId, materialId), eq(products.shopId, shopId)))
      .orderBy(asc(products.name));
    if (using.length) {
      const names = using.slice(0, 3).map((p) => `“${p.name}”`).join(", ");
      const more = using.length > 3 ? ` and ${using.length - 3} more` : "";
      throw new MaterialInUseError(
        `${material.name} is still used by ${using.length === 1 ? "the product" : `${using.length} products`} ${names}${more}. Change their parts to another material first.`,
      );
    }
    const [racked] = await tx
      .select({ n: count() })
      .from(offcuts)
      .where(and(eq(offcuts.materialId, materialId), eq(offcuts.shopId, shopId), inArray(offcuts.status, ["racked", "reserved"])));
    if (racked.n > 0) {
      throw new MaterialInUseError(`${material.name} has ${racked.n} offcut${racked.n === 1 ? "" : "s"} on the rack. Use or discard ${racked.n === 1 ? "it" : "them"} first.`);
    }
    await tx.delete(materials).where(and(eq(materials.id, materialId), eq(materials.shopId, shopId)));
    return true;
  });
}

/** False when the material is not this shop's. */
export async function createPanel(shopId: string, materialId: string, input: PanelInput): Promise<boolean> {
  if (!(await getMaterial(shopId, materialId))) return false;
  await getDb().insert(stockPanels).values({ shopId, materialId, ...input });
  return true;
}

export async function updatePanel(shopId: string, panelId: string, input: PanelInput): Promise<boolean> {
  const rows = await getDb().update(stockPanels).set(input).where(and(eq(stockPanels.id, panelId), eq(stockPanels.shopId, shopId))).returning({ id: stockPanels.id });
  return rows.length > 0;
}

export async function removePanel(shopId: string, panelId: string): Promise<boolean> {
  const rows = await getDb().delete(stockPanels).where(and(eq(stockPanels.id, panelId), eq(stockPanels.shopId, shopId))).returning({ id: stockPanels.id });
  return rows.length > 0;
}

// ---- products ----

export const PRODUCT_SORTS = ["name", "price", "leadTime", "parts", "created"] as const;
export type ProductSort = (typeof PRODUCT_SORTS)[number];

// Drizzle leaves columns unqualified inside a select list, so these subqueries name their tables.
const partCount = sql<number>`(select count(*)::int from product_parts pp where pp.product_id = "products"."id")`;
const materialNames = sql<string | null>`(
  select string_agg(distinct m.name, ', ' order by m.name)
  from product_parts pp join materials m on m.id = pp.material_id
  where pp.product_id = "products"."id")`;

export async function listProducts(shopId: string, query: ListQuery<ProductSort>) {
  const db = getDb();
  const where: SQL[] = [eq(products.shopId, shopId)];
  // Current products unless the list asks for the retired ones (or all).
  if (query.filters.show !== "all") where.push(query.filters.show === "retired" ? isNotNull(products.retiredAt) : isNull(products.retiredAt));
  if (query.q) where.push(ilike(products.name, likePattern(query.q)));
  if (query.filters.material) {
    where.push(
      exists(
        db
          .select({ one: sql`1` })
          .from(productParts)
          .where(and(eq(productParts.productId, products.id), eq(productParts.materialId, query.filters.material))),
      ),
    );
  }
  const order = { name: products.name, price: products.priceMinor, leadTime: products.leadTimeDays, parts: partCount, created: products.createdAt }[query.sort];
  const direction = query.dir === "asc" ? asc : desc;
  const [rows, [total]] = await Promise.all([
    db
      .select({ id: products.id, name: products.name, priceMinor: products.priceMinor, leadTimeDays: products.leadTimeDays, retiredAt: products.retiredAt, parts: partCount, materials: materialNames })
      .from(products)
      .where(and(...where))
      .orderBy(query.sort === "leadTime" ? sql`${order} ${sql.raw(query.dir)} nulls last` : direction(order), asc(products.name), asc(products.id))
      .limit(query.size)
      .offset((query.page - 1) * query.size),
    db.select({ n: count() }).from(products).where(and(...where)),
  ]);
  return { rows, total: total.n };
}

/** A product of this shop with its parts in the order the owner entered them, or null. */
export async function getProduct(shopId: string, productId: string) {
  const db = getDb();
  const [product] = await db.select().from(products).where(and(eq(products.id, productId), eq(products.shopId, shopId)));
  if (!product) return null;
  const parts = await db.select().from(productParts).where(eq(productParts.productId, product.id)).orderBy(asc(productParts.position), asc(productParts.name));
  return { ...product, parts };
}

/** How many order lines, on how many orders, name this product (a product that was ordered is never deleted). */
export async function productUse(shopId: string, productId: string) {
  const [row] = await getDb()
    .select({ lines: count(), orders: sql<number>`count(distinct ${orderLines.orderId})::int` })
    .from(orderLines)
    .innerJoin(orders, eq(orders.id, orderLines.orderId))
    .where(and(eq(orders.shopId, shopId), eq(orderLines.productId, productId)));
  return { lines: row.lines, orders: row.orders };
}

/** Retires a product (true) or brings it back (false). Returns false when it is not this shop's. */
export async function setProductRetired(shopId: string, productId: string, retired: boolean): Promise<boolean> {
  const rows = await getDb()
    .update(products)
    // A second retire keeps the first date.
    .set({ retiredAt: retired ? sql`coalesce(${products.retiredAt}, now())` : null })
    .where(and(eq(products.id, productId), eq(products.shopId, shopId)))
    .returning({ id: products.id });
  return rows.length > 0;
}

export class ProductInUseError extends Error {}

/**
 * Deletes a product and its parts for good. Refused once any order line names it: those orders keep
 * their product, so it can only be retired. The product row is locked so an order taken at the same
 * moment either sees it whole or not at all. Returns false when it is not this shop's.
 */
export async function deleteProduct(shopId: string, productId: string): Promise<boolean> {
  return getDb().transaction(async (tx) => {
    const [product] = await tx.select({ id: products.id }).from(products).where(and(eq(products.id, productId), eq(products.shopId, shopId))).for("update");
    if (!product) return false;
    const [used] = await tx.select({ n: count() }).from(orderLines).where(eq(orderLines.productId, productId));
    if (used.n > 0) throw new ProductInUseError(`It is on ${used.n} order line${used.n === 1 ? "" : "s"}, so it stays for those orders: retire it instead.`);
    await tx.delete(products).where(eq(products.id, productId));
    return true;
  });
}

export type ProductInput = { name: string; priceMinor: number; leadTimeDays: number | null };

/**
 * Writes a product and replaces its parts in one transaction: either all of it is saved or none.
 * `productId` null creates one. Returns the id, or null when the product is not this shop's.
 */
export async function saveProduct(shopId: string, productId: string | null, input: ProductInput, parts: PartInput[]): Promise<string | null> {
  return getDb().transaction(async (tx) => {
    // Materials are checked inside the transaction too: the form's list may be older than this write.
    const materialIds = [...new Set(parts.map((p) => p.materialId))];
    const owned = await tx.select({ id: materials.id }).from(materials).where(and(eq(materials.shopId, shopId), inArray(materials.id, materialIds)));
    if (owned.length !== materialIds.length) throw new MaterialGoneError();

    let id = productId;
    if (id === null) {
      const [row] = await tx.insert(products).values({ shopId, ...input }).returning({ id: products.id });
      id = row.id;
    } else {
      const rows = await tx.update(products).set(input).where(and(eq(products.id, id), eq(products.shopId, shopId))).returning({ id: products.id });
      if (rows.length === 0) return null;
      await tx.delete(productParts).where(eq(productParts.productId, id));
    }
    const savedId = id;
    await tx.insert(productParts).values(parts.map((part, position) => ({ ...part, productId: savedId, position })));
    return id;
  });
}

export class MaterialGoneError extends Error {
  constructor() {
    super("A material of these parts was removed meanwhile; choose another.");
  }
}

/** Whether another product of the shop already has this name (names pick products on orders). */
export async function productNameTaken(shopId: string, name: string, exceptId: string | null): Promise<boolean> {
  const where = [eq(products.shopId, shopId), sql`lower(${products.name}) = lower(${name})`];
  if (exceptId) where.push(ne(products.id, exceptId));
  const [row] = await getDb().select({ n: count() }).from(products).where(and(...where));
  return row.n > 0;
}
