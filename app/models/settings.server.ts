import { eq } from "drizzle-orm";
import { shops } from "../../db/schema";
import { getDb } from "~/db.server";
import type { DepositRule } from "~/lib/deposits";
import type { SettingsValues } from "~/lib/shop-settings";

export async function updateShopSettings(shopId: string, values: SettingsValues & Partial<DepositRule>): Promise<void> {
  await getDb().update(shops).set(values).where(eq(shops.id, shopId));
}
