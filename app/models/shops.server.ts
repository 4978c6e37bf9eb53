import { eq, sql } from "drizzle-orm";
import { shops } from "../../db/schema";
import type { Queryable } from "~/db.server";
import { preparedOnce } from "./prepared.server";

export type ShopSettings = typeof shops.$inferSelect;

// Nearly every page reads the shop's settings.
const shopSettings = preparedOnce((db) => db.select().from(shops).where(eq(shops.id, sql.placeholder("shopId"))).prepare("shop_settings"));

/** The shop's settings; `db` reads them inside a caller's transaction instead of through the prepared statement. */
export async function getShop(shopId: string, db?: Queryable): Promise<ShopSettings> {
  const [shop] = db ? await db.select().from(shops).where(eq(shops.id, shopId)) : await shopSettings().execute({ shopId });
  if (!shop) throw new Error(`shop ${shopId} is gone`);
  return shop;
}
