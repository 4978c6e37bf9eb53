// Catalogue and customers for order tests, made straight in the database.
import * as t from "../../db/schema";
import { getDb } from "~/db.server";

export async function createCatalogue(shopId: string) {
  const db = getDb();
  const [birch] = await db.insert(t.materials).values({ shopId, name: "Birch 6 mm", kind: "plywood", thicknessUm: 6000 }).returning();
  const [sign, tableNumber, placeCard] = await db
    .insert(t.products)
    .values([
      { shopId, name: "Welcome sign", priceMinor: 8500, leadTimeDays: 14 },
      { shopId, name: "Table number", priceMinor: 650, leadTimeDays: 10 },
      { shopId, name: "Place card", priceMinor: 180, leadTimeDays: null },
    ])
    .returning();
  await db.insert(t.productParts).values([
    { productId: sign.id, materialId: birch.id, name: "Face", lengthUm: 600_000, widthUm: 400_000 },
    { productId: tableNumber.id, materialId: birch.id, name: "Card", lengthUm: 210_000, widthUm: 150_000 },
    { productId: placeCard.id, materialId: birch.id, name: "Card", lengthUm: 90_000, widthUm: 55_000, process: "laser" },
  ]);
  const [customer] = await db.insert(t.customers).values({ shopId, name: "Ardent–Vasquez wedding", email: `couple-${shopId.slice(0, 8)}@example.com` }).returning();
  return { sign, tableNumber, placeCard, customer };
}
