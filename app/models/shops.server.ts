import { eq } from "drizzle-orm";
import { shops } from "../../db/schema";
import { getDb } from "~/db.server";

export type ShopSettings = typeof shops.$inferSelect;

export async function getShop(shopId: string): Promise<ShopSettings> {
  const [shop] = await getDb().select().from(shops).where(eq(shops.id, shopId));
  if (!shop) throw new Error(`shop ${shopId} is gone`);
  return shop;
}
