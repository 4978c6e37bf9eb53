import { and, count, eq } from "drizzle-orm";
import request from "supertest";
import { describe, expect, it } from "vitest";
import * as t from "../../db/schema";
import { appServer } from "../support/app";
import { createShop, signIn, type TestShop } from "../support/factories";
import { getDb } from "~/db.server";
import type { PartRow } from "~/lib/catalogue";
import { getProduct, saveProduct } from "~/models/catalogue.server";

const server = await appServer();
const db = getDb();

async function shopWithMaterials(unit: "mm" | "in" = "mm") {
  const shop = await createShop("Catalogue");
  await db.update(t.shops).set({ displayUnit: unit, currency: "GBP" }).where(eq(t.shops.id, shop.id));
  const [birch, mdf] = await db
    .insert(t.materials)
    .values([
      { shopId: shop.id, name: "Birch 6", kind: "plywood", thicknessUm: 6000 },
      { shopId: shop.id, name: "MDF 6", kind: "mdf", thicknessUm: 6000 },
    ])
    .returning();
  const [panel] = await db.insert(t.stockPanels).values({ shopId: shop.id, materialId: birch.id, lengthUm: 2_440_000, widthUm: 1_220_000, costMinor: 5290, onHand: 8 }).returning();
  const owner = await signIn(server, shop.users.owner);
  return { shop, birch, mdf, panel, owner };
}

async function productWithParts(shop: TestShop, materialId: string, name = "Sign", parts = [{ name: "Face", lengthUm: 600_000, widthUm: 400_000 }]) {
  const [product] = await db.insert(t.products).values({ shopId: shop.id, name, priceMinor: 8500, leadTimeDays: 14 }).returning();
  await db.insert(t.productParts).values(parts.map((p) => ({ ...p, productId: product.id, materialId })));
  return product;
}

const row = (materialId: string, changes: Partial<PartRow> = {}): PartRow => ({
  key: `new-${Math.random().toString(36).slice(2)}`,
  name: "Sign face",
  length: "600",
  width: "400",
  materialId,
  quantity: 1,
  grainLocked: true,
  process: "saw",
  ...changes,
});

const productForm = (parts: PartRow[], changes: Record<string, string> = {}) => ({ name: "Welcome sign", price: "85.00", leadTime: "14", parts: JSON.stringify(parts), ...changes });

async function partsOf(productId: string) {
  return db.select().from(t.productParts).where(eq(t.productParts.productId, productId)).orderBy(t.productParts.name);
}

async function productCount(shopId: string) {
  const [r] = await db.select({ n: count() }).from(t.products).where(eq(t.products.shopId, shopId));
  return r.n;
}

describe("materials", () => {
  it("adds a material with its thickness read in the shop's unit", async () => {
    const { shop, owner } = await shopWithMaterials("in");
    const res = await request(server).post("/catalogue/materials").set("Cookie", owner).type("form").send({ intent: "add-material", name: "Walnut 1/4", kind: "hardwood", thickness: "1/4", note: "Black walnut" });
    expect(res.status).toBe(200);
    expect(res.text).toContain("Walnut 1/4 added.");
    const [m] = await db.select().from(t.materials).where(and(eq(t.materials.shopId, shop.id), eq(t.materials.name, "Walnut 1/4")));
    expect(m).toMatchObject({ kind: "hardwood", thicknessUm: 6350, note: "Black walnut" });
  });

  it("refuses a bad material with a message per field and keeps what was typed", async () => {
    const { shop, owner } = await shopWithMaterials();
    const res = await request(server).post("/catalogue/materials").set("Cookie", owner).type("form").send({ intent: "add-material", name: "  ", kind: "steel", thickness: "thick", note: "kept note" });
    expect(res.status).toBe(400);
    expect(res.text).toMatch(/id="material-new-name-error"[^>]*>Enter the name\./);
    expect(res.text).toMatch(/id="material-new-kind-error"[^>]*>Choose a kind\./);
    expect(res.text).toMatch(/id="material-new-thickness-error"[^>]*>&quot;thick&quot; is not a length/);
    expect(res.text).toContain('value="kept note"');
    const [r] = await db.select({ n: count() }).from(t.materials).where(eq(t.materials.shopId, shop.id));
    expect(r.n).toBe(2);
  });

  it("edits a material; a thickness too large is refused", async () => {
    const { birch, owner } = await shopWithMaterials();
    const ok = await request(server).post("/catalogue/materials").set("Cookie", owner).type("form").send({ intent: "edit-material", materialId: birch.id, name: "Birch 9", kind: "plywood", thickness: "9 mm", note: "" });
    expect(ok.status).toBe(200);
    const bad = await request(server).post("/catalogue/materials").set("Cookie", owner).type("form").send({ intent: "edit-material", materialId: birch.id, name: "Birch 9", kind: "plywood", thickness: "250", note: "" });
    expect(bad.status).toBe(400);
    expect(bad.text).toMatch(new RegExp(`id="material-${birch.id}-thickness-error"[^>]*>Must be between 0.5 mm and 100 mm\\.`));
    const [m] = await db.select().from(t.materials).where(eq(t.materials.id, birch.id));
    expect(m).toMatchObject({ name: "Birch 9", thicknessUm: 9000 });
  });

  it("refuses to remove a material that product parts use, naming the product; removes an unused one with its panels", async () => {
    const { shop, birch, mdf, owner } = await shopWithMaterials();
    await productWithParts(shop, birch.id, "Welcome sign");
    const refused = await request(server).post("/catalogue/materials").set("Cookie", owner).type("form").send({ intent: "remove-material", materialId: birch.id });
    expect(refused.status).toBe(409);
    expect(refused.text).toContain("Birch 6 is still used by the product “Welcome sign”");
    expect(await db.select().from(t.materials).where(eq(t.materials.id, birch.id))).toHaveLength(1);
    expect(await db.select().from(t.stockPanels).where(eq(t.stockPanels.materialId, birch.id))).toHaveLength(1);

    await db.insert(t.stockPanels).values({ shopId: shop.id, materialId: mdf.id, lengthUm: 1_220_000, widthUm: 1_220_000, costMinor: 1240, onHand: 2, grain: "none" });
    const removed = await request(server).post("/catalogue/materials").set("Cookie", owner).type("form").send({ intent: "remove-material", materialId: mdf.id });
    expect(removed.status).toBe(200);
    expect(await db.select().from(t.materials).where(eq(t.materials.id, mdf.id))).toHaveLength(0);
    expect(await db.select().from(t.stockPanels).where(eq(t.stockPanels.materialId, mdf.id))).toHaveLength(0);
  });

  it("refuses to remove a material with offcuts on the rack", async () => {
    const { shop, mdf, owner } = await shopWithMaterials();
    await db.insert(t.offcuts).values({ shopId: shop.id, materialId: mdf.id, lengthUm: 800_000, widthUm: 300_000 });
    const res = await request(server).post("/catalogue/materials").set("Cookie", owner).type("form").send({ intent: "remove-material", materialId: mdf.id });
    expect(res.status).toBe(409);
    expect(res.text).toContain("MDF 6 has 1 offcut on the rack");
    expect(await db.select().from(t.materials).where(eq(t.materials.id, mdf.id))).toHaveLength(1);
  });

  it("adds, edits and removes stock panels; bad panels get a message per field", async () => {
    const { mdf, owner } = await shopWithMaterials();
    const added = await request(server).post("/catalogue/materials").set("Cookie", owner).type("form").send({ intent: "add-panel", materialId: mdf.id, length: "2440", width: "1220", cost: "21.90", onHand: "5", grain: "none" });
    expect(added.status).toBe(200);
    const [panel] = await db.select().from(t.stockPanels).where(eq(t.stockPanels.materialId, mdf.id));
    expect(panel).toMatchObject({ lengthUm: 2_440_000, widthUm: 1_220_000, costMinor: 2190, onHand: 5, grain: "none" });

    const bad = await request(server).post("/catalogue/materials").set("Cookie", owner).type("form").send({ intent: "add-panel", materialId: mdf.id, length: "2440", width: "0", cost: "cheap", onHand: "-1", grain: "diagonal" });
    expect(bad.status).toBe(400);
    const prefix = `panel-new-${mdf.id}`;
    expect(bad.text).toMatch(new RegExp(`id="${prefix}-width-error"[^>]*>Must be more than zero\\.`));
    expect(bad.text).toMatch(new RegExp(`id="${prefix}-cost-error"[^>]*>Enter the cost as an amount in GBP`));
    expect(bad.text).toMatch(new RegExp(`id="${prefix}-onHand-error"[^>]*>The count on hand must be between 0 and 100000\\.`));
    expect(bad.text).toMatch(new RegExp(`id="${prefix}-grain-error"[^>]*>Choose the grain\\.`));
    expect(bad.text).toContain('value="cheap"');
    expect(await db.select().from(t.stockPanels).where(eq(t.stockPanels.materialId, mdf.id))).toHaveLength(1);

    const edited = await request(server).post("/catalogue/materials").set("Cookie", owner).type("form").send({ intent: "edit-panel", panelId: panel.id, length: "2440 mm", width: "1220 mm", cost: "23.00", onHand: "4", grain: "none" });
    expect(edited.status).toBe(200);
    const [after] = await db.select().from(t.stockPanels).where(eq(t.stockPanels.id, panel.id));
    expect(after).toMatchObject({ costMinor: 2300, onHand: 4 });

    const removed = await request(server).post("/catalogue/materials").set("Cookie", owner).type("form").send({ intent: "remove-panel", panelId: panel.id });
    expect(removed.status).toBe(200);
    expect(await db.select().from(t.stockPanels).where(eq(t.stockPanels.id, panel.id))).toHaveLength(0);
  });

  it("planner and bookkeeper read the materials; nobody but the owner changes them", async () => {
    const { shop, birch, panel } = await shopWithMaterials();
    for (const role of ["planner", "bookkeeper"] as const) {
      const cookie = await signIn(server, shop.users[role]);
      const page = await request(server).get("/catalogue/materials").set("Cookie", cookie);
      expect(page.status, role).toBe(200);
      expect(page.text).toContain("Birch 6");
      expect(page.text).toContain("2440 × 1220 mm");
      expect(page.text).not.toContain("Add a material");
    }
    for (const role of ["planner", "sawyer", "bookkeeper"] as const) {
      const cookie = await signIn(server, shop.users[role]);
      const attempts = [
        { intent: "add-material", name: "Sneaky", kind: "mdf", thickness: "3", note: "" },
        { intent: "remove-material", materialId: birch.id },
        { intent: "edit-panel", panelId: panel.id, length: "1", width: "1", cost: "0", onHand: "0", grain: "none" },
      ];
      for (const body of attempts) {
        const res = await request(server).post("/catalogue/materials").set("Cookie", cookie).type("form").send(body);
        expect(res.status, `${role} ${body.intent}`).toBe(403);
      }
    }
    expect((await request(server).get("/catalogue/materials").set("Cookie", await signIn(server, shop.users.sawyer))).status).toBe(403);
    expect(await db.select().from(t.materials).where(eq(t.materials.shopId, shop.id))).toHaveLength(2);
    const [p] = await db.select().from(t.stockPanels).where(eq(t.stockPanels.id, panel.id));
    expect(p.costMinor).toBe(5290);
  });

  it("another shop's material or panel ids answer 404 and change nothing", async () => {
    const mine = await shopWithMaterials();
    const theirs = await shopWithMaterials();
    const post = (body: Record<string, string>) => request(server).post("/catalogue/materials").set("Cookie", mine.owner).type("form").send(body);
    expect((await post({ intent: "edit-material", materialId: theirs.birch.id, name: "Mine now", kind: "mdf", thickness: "3", note: "" })).status).toBe(404);
    expect((await post({ intent: "remove-material", materialId: theirs.mdf.id })).status).toBe(404);
    expect((await post({ intent: "add-panel", materialId: theirs.mdf.id, length: "100", width: "100", cost: "1", onHand: "1", grain: "none" })).status).toBe(404);
    expect((await post({ intent: "edit-panel", panelId: theirs.panel.id, length: "100", width: "100", cost: "1", onHand: "1", grain: "none" })).status).toBe(404);
    expect((await post({ intent: "remove-panel", panelId: theirs.panel.id })).status).toBe(404);
    const materials = await db.select().from(t.materials).where(eq(t.materials.shopId, theirs.shop.id));
    expect(materials.map((m) => m.name).sort()).toEqual(["Birch 6", "MDF 6"]);
    expect(await db.select().from(t.stockPanels).where(eq(t.stockPanels.shopId, theirs.shop.id))).toEqual([theirs.panel]);
    const page = await request(server).get("/catalogue/materials").set("Cookie", mine.owner);
    expect(page.text).not.toContain(theirs.birch.id);
  });
});

describe("the products list", () => {
  it("searches, filters by material, sorts and pages on the server, and shows only this shop's products", async () => {
    const { shop, birch, mdf, owner } = await shopWithMaterials();
    for (let i = 1; i <= 28; i++) {
      const [p] = await db.insert(t.products).values({ shopId: shop.id, name: `Table number ${String(i).padStart(2, "0")}`, priceMinor: 600 + i, leadTimeDays: 10 }).returning();
      await db.insert(t.productParts).values({ productId: p.id, materialId: i <= 3 ? mdf.id : birch.id, name: "Card", lengthUm: 210_000, widthUm: 150_000 });
    }
    await productWithParts(shop, birch.id, "Welcome sign 600 × 400");
    const other = await shopWithMaterials();
    await productWithParts(other.shop, other.birch.id, "Table number of another shop");

    const first = await request(server).get("/catalogue").set("Cookie", owner);
    expect(first.status).toBe(200);
    expect(first.text).toContain("1–25 of 29");
    expect(first.text).toContain("Table number 01");
    expect(first.text).not.toContain("Welcome sign 600 × 400"); // sorted by name, on page 2
    expect(first.text).not.toContain("another shop");
    expect(first.text).toContain('href="/catalogue/products/new"');

    const second = await request(server).get("/catalogue?page=2").set("Cookie", owner);
    expect(second.text).toContain("26–29 of 29");
    expect(second.text).toContain("Welcome sign 600 × 400");

    const search = await request(server).get("/catalogue?q=welcome").set("Cookie", owner);
    expect(search.text).toContain("1–1 of 1");

    const filtered = await request(server).get(`/catalogue?material=${mdf.id}`).set("Cookie", owner);
    expect(filtered.text).toContain("1–3 of 3");
    expect(filtered.text).toContain("MDF 6");

    const priciest = await request(server).get("/catalogue?sort=price&dir=desc").set("Cookie", owner);
    const names = [...priciest.text.matchAll(/href="\/catalogue\/products\/[0-9a-f-]{36}"[^>]*>([^<]+)</g)].map((m) => m[1]);
    expect(names.slice(0, 2)).toEqual(["Welcome sign 600 × 400", "Table number 28"]);

    // A material id of another shop is not a filter here: the full list comes back.
    const foreign = await request(server).get(`/catalogue?material=${other.birch.id}`).set("Cookie", owner);
    expect(foreign.text).toContain("of 29");
  });

  it("the bookkeeper reads the list but gets no New product link; the sawyer gets 403", async () => {
    const { shop } = await shopWithMaterials();
    const books = await request(server).get("/catalogue").set("Cookie", await signIn(server, shop.users.bookkeeper));
    expect(books.status).toBe(200);
    expect(books.text).not.toContain('href="/catalogue/products/new"');
    expect((await request(server).get("/catalogue").set("Cookie", await signIn(server, shop.users.sawyer))).status).toBe(403);
  });
});

describe("the product editor", () => {
  it("creates a product with its parts in one go, sizes read in the shop's unit", async () => {
    const { shop, birch, mdf, owner } = await shopWithMaterials("in");
    const parts = [row(birch.id, { name: "Face", length: '23 5/8"', width: "15 3/4" }), row(mdf.id, { name: "Batten", length: "600 mm", width: "5 7/8", quantity: "2", grainLocked: false, process: "saw" })];
    const res = await request(server).post("/catalogue/products/new").set("Cookie", owner).type("form").send(productForm(parts, { leadTime: "" }));
    expect(res.status).toBe(302);
    const id = /\/catalogue\/products\/([0-9a-f-]{36})\?created=1$/.exec(res.headers.location)?.[1];
    expect(id).toBeDefined();
    const [product] = await db.select().from(t.products).where(eq(t.products.id, id!));
    expect(product).toMatchObject({ shopId: shop.id, name: "Welcome sign", priceMinor: 8500, leadTimeDays: null });
    expect(await partsOf(id!)).toMatchObject([
      { name: "Batten", lengthUm: 600_000, widthUm: 149_225, quantity: 2, grainLocked: false, materialId: mdf.id, process: "saw" },
      { name: "Face", lengthUm: 600_075, widthUm: 400_050, quantity: 1, grainLocked: true, materialId: birch.id },
    ]);
    const page = await request(server).get(res.headers.location).set("Cookie", owner);
    expect(page.status).toBe(200);
    expect(page.text).toContain("Product created.");
    expect(page.text).toContain("23-5/8 in");
  });

  it("keeps the parts in the order the owner entered them, also after moving one", async () => {
    const { shop, birch, owner } = await shopWithMaterials();
    const entered = ["Sign face", "Stand", "Back brace"].map((name) => row(birch.id, { name }));
    const res = await request(server).post("/catalogue/products/new").set("Cookie", owner).type("form").send(productForm(entered));
    expect(res.status).toBe(302);
    const id = res.headers.location.split("/").pop()!.split("?")[0];
    const shownOrder = async () => (await getProduct(shop.id, id))!.parts.map((p) => p.name);
    expect(await shownOrder()).toEqual(["Sign face", "Stand", "Back brace"]);
    const page = await request(server).get(`/catalogue/products/${id}`).set("Cookie", owner);
    expect(page.text.indexOf("Sign face")).toBeLessThan(page.text.indexOf("Stand"));
    expect(page.text.indexOf("Stand")).toBeLessThan(page.text.indexOf("Back brace"));
    // The brace moved to the top: saved in that order.
    const moved = await request(server).post(`/catalogue/products/${id}`).set("Cookie", owner).type("form").send(productForm([entered[2], entered[0], entered[1]]));
    expect(moved.status).toBe(200);
    expect(await shownOrder()).toEqual(["Back brace", "Sign face", "Stand"]);
  });

  it("a bad part row saves nothing and answers with errors keyed by row and field, keeping everything typed", async () => {
    const { shop, birch, owner } = await shopWithMaterials();
    const good = row(birch.id, { name: "Face" });
    const bad = row(birch.id, { name: "", width: "0", quantity: "1.5", process: "laser", length: "900" });
    const res = await request(server).post("/catalogue/products/new").set("Cookie", owner).type("form").send(productForm([good, bad], { name: "Kept name", price: "12,50" }));
    expect(res.status).toBe(400);
    expect(await productCount(shop.id)).toBe(0);
    expect(res.text).toContain('value="Kept name"');
    expect(res.text).toContain('value="12,50"');
    expect(res.text).toContain("Row 2, Part: Name the part.");
    expect(res.text).toContain("Row 2, Width: Must be more than zero.");
    expect(res.text).toContain("Row 2, Qty: Enter the quantity as a whole number.");
    expect(res.text).not.toContain("Row 1,");
    // The keyed errors travel with the page's data for the grid.
    expect(res.text).toContain(bad.key);
  });

  it("a laser-cut part must fit the laser bed", async () => {
    const { birch, owner } = await shopWithMaterials();
    const res = await request(server).post("/catalogue/products/new").set("Cookie", owner).type("form").send(productForm([row(birch.id, { process: "laser", length: "900", width: "100" })]));
    expect(res.status).toBe(400);
    expect(res.text).toContain("Row 1 (Sign face), Process: Larger than the laser bed");
  });

  it("names each bad product field: name, price, lead time; no parts; a taken name", async () => {
    const { shop, birch, owner } = await shopWithMaterials();
    const res = await request(server).post("/catalogue/products/new").set("Cookie", owner).type("form").send({ name: "", price: "a lot", leadTime: "two weeks", parts: "[]" });
    expect(res.status).toBe(400);
    expect(res.text).toMatch(/id="field-name-error"[^>]*>Enter the name\./);
    expect(res.text).toMatch(/id="field-price-error"[^>]*>Enter the price as an amount in GBP/);
    expect(res.text).toMatch(/id="field-leadTime-error"[^>]*>Enter the lead time in days as a whole number\./);
    expect(res.text).toContain("Add at least one part.");

    await productWithParts(shop, birch.id, "Welcome sign");
    const taken = await request(server).post("/catalogue/products/new").set("Cookie", owner).type("form").send(productForm([row(birch.id)], { name: "welcome SIGN" }));
    expect(taken.status).toBe(400);
    expect(taken.text).toMatch(/id="field-name-error"[^>]*>Another product already has this name\./);

    const garbled = await request(server).post("/catalogue/products/new").set("Cookie", owner).type("form").send({ name: "X", price: "1", leadTime: "", parts: "{not json" });
    expect(garbled.status).toBe(400);
    expect(garbled.text).toContain("The parts did not arrive");
    expect(await productCount(shop.id)).toBe(1);
  });

  it("edits a product, replacing its parts; rounded inch sizes left as shown keep their exact value", async () => {
    const { shop, birch, mdf, owner } = await shopWithMaterials("in");
    const product = await productWithParts(shop, birch.id, "Menu board", [
      { name: "Board", lengthUm: 500_000, widthUm: 350_000 },
      { name: "Batten", lengthUm: 500_000, widthUm: 40_000 },
    ]);
    const [board] = (await partsOf(product.id)).filter((p) => p.name === "Board");
    // As the page shows it: 500 mm is "19-11/16 in" (rounded), 350 mm "13-25/32 in".
    const kept = row(birch.id, { key: board.id, id: board.id, name: "Board", length: "19-11/16 in", width: "13-25/32 in" });
    const added = row(mdf.id, { name: "Easel leg", length: "12", width: "2" });
    const res = await request(server).post(`/catalogue/products/${product.id}`).set("Cookie", owner).type("form").send(productForm([kept, added], { name: "Menu board, easel", price: "45" }));
    expect(res.status).toBe(200);
    expect(res.text).toContain("Menu board, easel saved.");
    const parts = await partsOf(product.id);
    expect(parts.map((p) => [p.name, p.lengthUm, p.widthUm])).toEqual([
      ["Board", 500_000, 350_000],
      ["Easel leg", 304_800, 50_800],
    ]);
    const [after] = await db.select().from(t.products).where(eq(t.products.id, product.id));
    expect(after).toMatchObject({ name: "Menu board, easel", priceMinor: 4500 });
  });

  it("editing with one bad row changes neither the product nor its parts", async () => {
    const { shop, birch, owner } = await shopWithMaterials();
    const product = await productWithParts(shop, birch.id, "Plaque");
    const before = await partsOf(product.id);
    const res = await request(server)
      .post(`/catalogue/products/${product.id}`)
      .set("Cookie", owner)
      .type("form")
      .send(productForm([row(birch.id, { name: "New face" }), row(birch.id, { width: "wide" })], { name: "Renamed" }));
    expect(res.status).toBe(400);
    const [after] = await db.select().from(t.products).where(eq(t.products.id, product.id));
    expect(after.name).toBe("Plaque");
    expect(await partsOf(product.id)).toEqual(before);
  });

  it("a part cut from another shop's material is refused", async () => {
    const { shop, owner } = await shopWithMaterials();
    const theirs = await shopWithMaterials();
    const res = await request(server).post("/catalogue/products/new").set("Cookie", owner).type("form").send(productForm([row(theirs.birch.id)]));
    expect(res.status).toBe(400);
    expect(res.text).toContain("Row 1 (Sign face), Material: Choose one of the shop&#x27;s materials.");
    expect(await productCount(shop.id)).toBe(0);
  });

  it("the write is one transaction: a failure after the product row changed rolls everything back", async () => {
    const { shop, birch } = await shopWithMaterials();
    const product = await productWithParts(shop, birch.id, "Keepsake");
    const before = await partsOf(product.id);
    // 2^31 µm overflows the integer column on the insert of the parts, after the update and delete ran.
    const parts = [{ name: "Too long", lengthUm: 2 ** 31, widthUm: 1000, materialId: birch.id, quantity: 1, grainLocked: false, process: "saw" as const }];
    await expect(saveProduct(shop.id, product.id, { name: "Half saved?", priceMinor: 1, leadTimeDays: null }, parts)).rejects.toThrow();
    const [after] = await db.select().from(t.products).where(eq(t.products.id, product.id));
    expect(after.name).toBe("Keepsake");
    expect(await partsOf(product.id)).toEqual(before);
  });

  it("planner and bookkeeper open a product read-only; only the owner saves; the sawyer cannot open it", async () => {
    const { shop, birch } = await shopWithMaterials();
    const product = await productWithParts(shop, birch.id, "Plaque");
    for (const role of ["planner", "bookkeeper"] as const) {
      const cookie = await signIn(server, shop.users[role]);
      const page = await request(server).get(`/catalogue/products/${product.id}`).set("Cookie", cookie);
      expect(page.status, role).toBe(200);
      expect(page.text).toContain("Read only");
      expect(page.text).not.toContain("Save product");
      expect((await request(server).get("/catalogue/products/new").set("Cookie", cookie)).status, role).toBe(403);
    }
    for (const role of ["planner", "sawyer", "bookkeeper"] as const) {
      const cookie = await signIn(server, shop.users[role]);
      const res = await request(server).post(`/catalogue/products/${product.id}`).set("Cookie", cookie).type("form").send(productForm([row(birch.id)], { name: "Taken over" }));
      expect(res.status, role).toBe(403);
      const created = await request(server).post("/catalogue/products/new").set("Cookie", cookie).type("form").send(productForm([row(birch.id)], { name: "Taken over" }));
      expect(created.status, role).toBe(403);
    }
    expect((await request(server).get(`/catalogue/products/${product.id}`).set("Cookie", await signIn(server, shop.users.sawyer))).status).toBe(403);
    const [after] = await db.select().from(t.products).where(eq(t.products.id, product.id));
    expect(after.name).toBe("Plaque");
    expect(await productCount(shop.id)).toBe(1);
  });

  it("a missing, malformed or other shop's product id answers 404 and changes nothing", async () => {
    const mine = await shopWithMaterials();
    const theirs = await shopWithMaterials();
    const product = await productWithParts(theirs.shop, theirs.birch.id, "Their sign");
    for (const id of [product.id, "00000000-0000-4000-8000-000000000000", "not-a-uuid"]) {
      expect((await request(server).get(`/catalogue/products/${id}`).set("Cookie", mine.owner)).status, id).toBe(404);
      const res = await request(server).post(`/catalogue/products/${id}`).set("Cookie", mine.owner).type("form").send(productForm([row(mine.birch.id)], { name: "Stolen" }));
      expect(res.status, id).toBe(404);
    }
    const [after] = await db.select().from(t.products).where(eq(t.products.id, product.id));
    expect(after.name).toBe("Their sign");
    expect(await partsOf(product.id)).toHaveLength(1);
  });
});
