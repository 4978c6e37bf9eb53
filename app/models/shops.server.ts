import { eq, sql } from "drizzle-orm";
import { shops } from "../../db/schema";
import { preparedOnce } from "./prepared.server";

export type ShopSettings = typeof shops.$inferSelect;

// Nearly every page reads the shop's settings.
const shopSettings = preparedOnce((db) => db.select().from(shops).where(eq(shops.id, sql.placeholder("shopId"))).prepare("shop_settings"));

export async function getShop(shopId: string): Promise<ShopSettings> {
  const [shop] = await shopSettings().execute({ shopId });
  if (!shop) throw new Error(`shop ${shopId} is gone`);
  return shop;
}
