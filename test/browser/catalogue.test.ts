import { and, eq } from "drizzle-orm";
import type { Browser, Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import * as t from "../../db/schema";
import { launchBrowser, signInThroughForm, VIEWPORTS } from "../support/browser";
import { createShop, type TestShop } from "../support/factories";
import { startApp } from "../support/server";
import { getDb } from "~/db.server";

async function signInAs(page: Page, url: string, user: { email: string; password: string }) {
  await signInThroughForm(page, url, user);
  await page.getByRole("heading", { level: 1, name: "From the order to the offcut" }).waitFor();
}

function watchErrors(page: Page): string[] {
  const errors: string[] = [];
  page.on("console", (msg) => msg.type() === "error" && errors.push(msg.text()));
  page.on("pageerror", (err) => errors.push(err.message));
  return errors;
}

const cell = (page: Page, row: number, col: string) => page.locator(`.ag-row[row-index="${row}"] [col-id="${col}"]`);
/** The cell whose editor (input or picker) has the keyboard, waited for: keys sent before it has it are lost. */
const editorOf = (page: Page, row: number, col: string) => cell(page, row, col).locator('input:focus, [role="combobox"]:focus');
async function tabTo(page: Page, row: number, col: string, key = "Tab") {
  await page.keyboard.press(key);
  await editorOf(page, row, col).waitFor();
}
/** Types into the cell's editor; every key must arrive. */
async function typeIn(page: Page, row: number, col: string, text: string) {
  await page.keyboard.type(text);
  expect(await cell(page, row, col).locator("input").first().inputValue()).toBe(text);
}
const focusedCol = (page: Page) => page.evaluate(() => document.activeElement?.closest("[col-id]")?.getAttribute("col-id"));
const isRed = async (page: Page, row: number, col: string) => ((await cell(page, row, col).getAttribute("class")) ?? "").includes("bg-bad-soft");

describe("the catalogue in chromium", () => {
  let app: Awaited<ReturnType<typeof startApp>>;
  let browser: Browser;
  let shop: TestShop;
  let birch: typeof t.materials.$inferSelect;
  let mdf: typeof t.materials.$inferSelect;
  beforeAll(async () => {
    shop = await createShop("Grid");
    [birch, mdf] = await getDb()
      .insert(t.materials)
      .values([
        { shopId: shop.id, name: "Birch 6 mm", kind: "plywood", thicknessUm: 6000 },
        { shopId: shop.id, name: "MDF 6 mm", kind: "mdf", thicknessUm: 6000 },
      ])
      .returning();
    app = await startApp();
    browser = await launchBrowser();
  });
  afterAll(async () => {
    await browser?.close();
    await app?.stop();
  });

  /** The owner on a fresh new-product form at this viewport, its grid running; console errors collected. */
  async function newProductForm(viewport: { width: number; height: number }) {
    const context = await browser.newContext({ viewport });
    const page = await context.newPage();
    const errors = watchErrors(page);
    await signInAs(page, app.url, shop.users.owner);
    await page.goto(`${app.url}/catalogue/products/new`, { waitUntil: "networkidle" });
    await page.locator(".ag-root").waitFor();
    return { context, page, errors };
  }

  it("the owner builds a two-part product with the keyboard, sees a bad width in red, fixes it, saves and finds it after a reload", async () => {
    const productName = `Welcome sign with stand ${Math.random().toString(36).slice(2, 7)}`;
    const { context, page, errors } = await newProductForm(VIEWPORTS.desktop);

    await page.getByLabel("Name").fill(productName);
    await page.getByLabel("Price (EUR)").fill("85.00");
    await page.getByLabel("Lead time (days)").fill("14");

    // Part 1: Add part opens the name cell for typing; Tab walks the row.
    await page.getByRole("button", { name: "Add part" }).focus();
    await tabTo(page, 0, "name", "Enter");
    await typeIn(page, 0, "name", "Sign face");
    await tabTo(page, 0, "length");
    await typeIn(page, 0, "length", "600");
    await tabTo(page, 0, "width");
    await typeIn(page, 0, "width", "0");
    await tabTo(page, 0, "materialId"); // leaving the width, it is read and found wanting
    await expect.poll(() => isRed(page, 0, "width")).toBe(true);
    await page.getByText("Row 1 (Sign face), Width: Must be more than zero.").waitFor();
    expect(await isRed(page, 0, "length")).toBe(false);

    // Back to the width, fix it, Enter to save the cell.
    await tabTo(page, 0, "width", "Shift+Tab");
    await page.keyboard.press("Control+A");
    await page.keyboard.type("400");
    await page.keyboard.press("Enter");
    await expect.poll(() => isRed(page, 0, "width")).toBe(false);
    expect(await page.getByTestId("part-problems").count()).toBe(0);

    // Part 2 in MDF, two per product, grain locked.
    await page.getByRole("button", { name: "Add part" }).focus();
    await tabTo(page, 1, "name", "Enter");
    await typeIn(page, 1, "name", "Stand");
    await tabTo(page, 1, "length");
    await typeIn(page, 1, "length", "150");
    await tabTo(page, 1, "width");
    await typeIn(page, 1, "width", "80");
    await tabTo(page, 1, "materialId");
    await page.keyboard.press("Enter"); // open the material list
    await page.locator('[role="combobox"][aria-expanded="true"]').waitFor();
    await page.keyboard.press("ArrowDown");
    await page.keyboard.press("Enter");
    await page.locator('[role="combobox"][aria-expanded="true"]').waitFor({ state: "detached" });
    // Choosing ends that edit; Tab moves on, and typing into a focused cell starts editing it.
    await page.keyboard.press("Tab");
    await expect.poll(() => focusedCol(page)).toBe("quantity");
    await page.keyboard.type("2");
    await editorOf(page, 1, "quantity").waitFor();
    await tabTo(page, 1, "grainLocked");
    await page.keyboard.press("Space");
    await tabTo(page, 1, "process");
    await page.keyboard.press("Escape");
    expect(await cell(page, 1, "materialId").textContent()).toBe("MDF 6 mm");

    await page.getByRole("button", { name: "Create product" }).focus();
    await page.keyboard.press("Enter");
    await page.waitForURL(/\/catalogue\/products\/[0-9a-f-]{36}\?created=1$/);
    await page.getByText("Product created.").waitFor();

    const [product] = await getDb().select().from(t.products).where(and(eq(t.products.shopId, shop.id), eq(t.products.name, productName)));
    expect(product).toMatchObject({ name: productName, priceMinor: 8500, leadTimeDays: 14 });
    const parts = await getDb().select().from(t.productParts).where(eq(t.productParts.productId, product.id)).orderBy(t.productParts.name);
    expect(parts).toMatchObject([
      { name: "Sign face", lengthUm: 600_000, widthUm: 400_000, materialId: birch.id, quantity: 1, grainLocked: false, process: "saw" },
      { name: "Stand", lengthUm: 150_000, widthUm: 80_000, materialId: mdf.id, quantity: 2, grainLocked: true, process: "saw" },
    ]);

    await page.reload({ waitUntil: "networkidle" });
    await cell(page, 1, "name").waitFor();
    expect(await page.getByLabel("Name").inputValue()).toBe(productName);
    const shown = await page.locator(".ag-row").evaluateAll((rows) =>
      rows
        .sort((a, b) => Number(a.getAttribute("row-index")) - Number(b.getAttribute("row-index")))
        .map((r) => ["name", "length", "width", "materialId", "quantity", "process"].map((c) => r.querySelector(`[col-id="${c}"]`)?.textContent)),
    );
    expect(shown).toEqual([
      ["Sign face", "600 mm", "400 mm", "Birch 6 mm", "1", "Sawn"],
      ["Stand", "150 mm", "80 mm", "MDF 6 mm", "2", "Sawn"],
    ]);
    expect(errors).toEqual([]);
    await context.close();
  });

  it("an empty new product is told about its name, its price and its parts at once", async () => {
    const { context, page } = await newProductForm(VIEWPORTS.phone);
    await page.getByRole("button", { name: "Create product" }).click();
    await page.getByText("Add at least one part.").waitFor();
    await expect.poll(() => page.getByLabel("Name").getAttribute("aria-invalid")).toBe("true");
    expect(await page.getByLabel("Price (EUR)").getAttribute("aria-invalid")).toBe("true");
    await context.close();
  });

  // A slow tablet (the CPU slowed four times) and a typist who never waits for an editor to open: the
  // grid used to lose the first keys typed after Tab or after "Add part".
  it("keeps every key of a fast typist on a slow tablet", async () => {
    const productName = `Place card set ${Math.random().toString(36).slice(2, 7)}`;
    const { context, page, errors } = await newProductForm(VIEWPORTS.tablet);
    await page.getByLabel("Name").fill(productName);
    await page.getByLabel("Price (EUR)").fill("12.00");
    const cdp = await context.newCDPSession(page);
    await cdp.send("Emulation.setCPUThrottlingRate", { rate: 4 });
    const typed = [
      { name: "Card front", length: "90", width: "55" },
      { name: "Card back", length: "90.5", width: "54" },
      { name: "Easel foot", length: "120", width: "18" },
    ];
    for (const [index, part] of typed.entries()) {
      await page.getByRole("button", { name: "Add part" }).focus();
      await page.keyboard.press("Enter");
      await page.keyboard.type(part.name, { delay: index === 2 ? 90 : 0 }); // the last one at a person's pace
      await page.keyboard.press("Tab");
      await page.keyboard.type(part.length, { delay: index === 2 ? 90 : 0 });
      await page.keyboard.press("Tab");
      await page.keyboard.type(part.width, { delay: index === 2 ? 90 : 0 });
      await page.keyboard.press("Enter");
      await expect.poll(() => cell(page, index, "width").textContent(), { timeout: 15_000 }).toBe(part.width); // a slowed CPU on a busy machine
    }
    await cdp.send("Emulation.setCPUThrottlingRate", { rate: 1 });
    await page.getByRole("button", { name: "Create product" }).click();
    await page.getByText("Product created.").waitFor({ timeout: 15_000 });
    const [product] = await getDb().select().from(t.products).where(and(eq(t.products.shopId, shop.id), eq(t.products.name, productName)));
    const parts = await getDb().select().from(t.productParts).where(eq(t.productParts.productId, product.id)).orderBy(t.productParts.name);
    expect(parts.map((p) => [p.name, p.lengthUm, p.widthUm])).toEqual([
      ["Card back", 90_500, 54_000],
      ["Card front", 90_000, 55_000],
      ["Easel foot", 120_000, 18_000],
    ]);
    expect(errors).toEqual([]);
    await context.close();
  });

  it("a part row goes with Delete on its × cell", async () => {
    const [product] = await getDb().insert(t.products).values({ shopId: shop.id, name: "Two cards", priceMinor: 300 }).returning();
    await getDb()
      .insert(t.productParts)
      .values([
        { productId: product.id, materialId: birch.id, name: "Card A", lengthUm: 90_000, widthUm: 55_000 },
        { productId: product.id, materialId: birch.id, name: "Card B", lengthUm: 90_000, widthUm: 55_000 },
      ]);
    const context = await browser.newContext({ viewport: VIEWPORTS.tablet });
    const page = await context.newPage();
    const errors = watchErrors(page);
    await signInAs(page, app.url, shop.users.owner);
    await page.goto(`${app.url}/catalogue/products/${product.id}`, { waitUntil: "networkidle" });
    // Onto Card B's name (a click starts editing; Escape leaves the cell focused), then right to the × cell.
    await cell(page, 1, "name").click();
    await editorOf(page, 1, "name").waitFor();
    await page.keyboard.press("Escape");
    await expect.poll(() => page.evaluate(() => document.activeElement?.getAttribute("col-id"))).toBe("name");
    for (const col of ["length", "width", "materialId", "quantity", "grainLocked", "process", "remove"]) {
      await page.keyboard.press("ArrowRight");
      await expect.poll(() => focusedCol(page)).toBe(col);
    }
    await page.keyboard.press("Delete");
    await expect.poll(() => page.locator(".ag-row").count()).toBe(1);
    await page.getByRole("button", { name: "Save product" }).click();
    await page.getByText("Two cards saved.").waitFor();
    const parts = await getDb().select().from(t.productParts).where(eq(t.productParts.productId, product.id));
    expect(parts.map((p) => p.name)).toEqual(["Card A"]);
    expect(errors).toEqual([]);
    await context.close();
  });

  it("the planner sees the shop settings read-only", async () => {
    const context = await browser.newContext({ viewport: VIEWPORTS.tablet });
    const page = await context.newPage();
    const errors = watchErrors(page);
    await signInAs(page, app.url, shop.users.planner);
    await page.goto(`${app.url}/settings`, { waitUntil: "networkidle" });
    await page.getByRole("heading", { level: 1, name: "Shop settings" }).waitFor();
    await page.getByText("Read only: these are set by the shop's owner.").waitFor();
    await page.getByText("Default kerf").waitFor();
    expect(await page.getByTestId("settings-read-only").locator("dd").first().textContent()).toBe("Millimetres (600 mm)");
    expect(await page.locator("main input, main select").count()).toBe(0);
    expect(await page.getByRole("button", { name: "Save settings" }).count()).toBe(0);
    expect(errors).toEqual([]);
    await context.close();
  });
});
