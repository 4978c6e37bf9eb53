// The order form's customer picker in chromium: typing asks the server for matches and picking one
// fills the field; with JavaScript off the same form takes the typed name.
import type { Browser } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import * as t from "../../db/schema";
import { launchBrowser, signInThroughForm, VIEWPORTS } from "../support/browser";
import { createShop, type TestShop } from "../support/factories";
import { createCatalogue } from "../support/order-factories";
import { startApp } from "../support/server";
import { getDb } from "~/db.server";

describe("the customer picker in chromium", () => {
  let app: Awaited<ReturnType<typeof startApp>>;
  let browser: Browser;
  let shop: TestShop;
  beforeAll(async () => {
    shop = await createShop("Picker browser");
    await createCatalogue(shop.id);
    await getDb().insert(t.customers).values([
      ...Array.from({ length: 60 }, (_, i) => ({ shopId: shop.id, name: `Guest list ${String(i + 1).padStart(2, "0")}`, email: "" })),
      { shopId: shop.id, name: "Penhaligon party", email: "penhaligon@example.com" },
    ]);
    app = await startApp({ STOPWISE_PLAN_RUNNER: "0" });
    browser = await launchBrowser();
  });
  afterAll(async () => {
    await browser?.close();
    await app?.stop();
  });

  const fillOrder = async (page: import("playwright-core").Page) => {
    await page.getByLabel("Event date").fill("2027-04-10");
    await page.locator('fieldset[data-line="0"]').getByLabel("Product").selectOption({ label: "Welcome sign · €85.00" });
  };

  it("suggests the server's matches as one types, and the order is saved for the one picked", async () => {
    const page = await browser.newPage({ viewport: VIEWPORTS.phone });
    const errors: string[] = [];
    page.on("pageerror", (err) => errors.push(err.message));
    await signInThroughForm(page, app.url, shop.users.owner, "/orders/new");
    const field = page.getByLabel("Customer", { exact: true });
    const suggested = () => page.locator("datalist option").evaluateAll((options) => options.map((o) => (o as HTMLOptionElement).value));
    await field.waitFor();
    await expect.poll(async () => (await suggested()).length).toBe(20); // the page ships the first twenty, not all 61
    const asked = page.waitForResponse((res) => res.url().includes("/api/customers?q=penh") && res.status() === 200);
    await field.pressSequentially("penh");
    await asked;
    await expect.poll(suggested).toEqual(["Penhaligon party (penhaligon@example.com)"]);
    await field.fill("Penhaligon party (penhaligon@example.com)"); // what choosing the suggestion types
    await page.getByText("Chosen: Penhaligon party (penhaligon@example.com).").waitFor();
    await fillOrder(page);
    await page.getByRole("button", { name: "Save order" }).click();
    await page.getByRole("heading", { name: /^Order #\d+$/ }).waitFor();
    await page.getByText("Order · Penhaligon party").waitFor();
    expect(errors).toEqual([]);
  });

  it("with JavaScript off, a typed name makes the order; a part of one is refused and the list suggests the rest", async () => {
    const context = await browser.newContext({ viewport: VIEWPORTS.tablet, javaScriptEnabled: false });
    const page = await context.newPage();
    await signInThroughForm(page, app.url, shop.users.owner, "/orders/new");
    await page.getByLabel("Customer", { exact: true }).fill("Guest list 5");
    await fillOrder(page);
    await page.getByRole("button", { name: "Save order" }).click();
    await page.getByText("No customer is called “Guest list 5”; pick one from the list.").waitFor();
    expect(await page.locator("datalist option").evaluateAll((options) => options.map((o) => (o as HTMLOptionElement).value))).toEqual(["Guest list 50", "Guest list 51", "Guest list 52", "Guest list 53", "Guest list 54", "Guest list 55", "Guest list 56", "Guest list 57", "Guest list 58", "Guest list 59"]);
    await page.getByLabel("Customer", { exact: true }).fill("guest list 57");
    await fillOrder(page);
    await page.getByRole("button", { name: "Save order" }).click();
    await page.getByText("Order · Guest list 57").waitFor();
    await context.close();
  });
});
