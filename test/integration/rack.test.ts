// The offcut rack's order: oldest first, offcuts racked at one moment (a release makes several)
// biggest first, and of one size by place in number order, so the list reads the same on every visit.
import { describe, expect, it } from "vitest";
import * as t from "../../db/schema";
import { createShop } from "../support/factories";
import { getDb } from "~/db.server";
import { rackOverview } from "~/models/rack.server";

const mm = (n: number) => n * 1000;

describe("the offcut rack", () => {
  it("lists oldest first, offcuts racked together biggest first, and one size by place in number order", async () => {
    const db = getDb();
    const shop = await createShop("Rack order");
    const [birch] = await db.insert(t.materials).values({ shopId: shop.id, name: "Birch 6 mm", kind: "plywood", thicknessUm: mm(6) }).returning();
    const together = new Date("2026-11-20T10:00:00Z");
    await db.insert(t.offcuts).values([
      { shopId: shop.id, materialId: birch.id, lengthUm: mm(400), widthUm: mm(150), location: "slot 11", createdAt: together },
      { shopId: shop.id, materialId: birch.id, lengthUm: mm(400), widthUm: mm(150), location: "slot 9", createdAt: together },
      { shopId: shop.id, materialId: birch.id, lengthUm: mm(400), widthUm: mm(150), location: "Slot 10", createdAt: together },
      { shopId: shop.id, materialId: birch.id, lengthUm: mm(900), widthUm: mm(300), location: "slot 10", createdAt: together },
      { shopId: shop.id, materialId: birch.id, lengthUm: mm(400), widthUm: mm(250), location: "slot 7", createdAt: together },
      { shopId: shop.id, materialId: birch.id, lengthUm: mm(300), widthUm: mm(300), location: "slot 1", createdAt: new Date("2026-10-01T10:00:00Z") },
    ]);
    const [material] = await rackOverview(shop.id);
    expect(material.offcuts.map((o) => [o.lengthUm / 1000, o.widthUm / 1000, o.location])).toEqual([
      [300, 300, "slot 1"],
      [900, 300, "slot 10"],
      [400, 250, "slot 7"],
      [400, 150, "slot 9"],
      [400, 150, "Slot 10"],
      [400, 150, "slot 11"],
    ]);
  });
});
