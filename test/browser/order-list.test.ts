// The order list in chromium: the first view makes no second read of the list (the loader's copy is
// fresh), and its sort, page and order links move through the router without reloading the page.
import type { Browser } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { launchBrowser, signInThroughForm, VIEWPORTS } from "../support/browser";
import { createShop, type TestShop } from "../support/factories";
import { createCatalogue } from "../support/order-factories";
import { startApp } from "../support/server";
import { createOrder } from "~/models/orders.server";

describe("the order list in chromium", () => {
  let app: Awaited<ReturnType<typeof startApp>>;
  let browser: Browser;
  let shop: TestShop;
  let numbers: number[];
  beforeAll(async () => {
    shop = await createShop("Order list");
    const catalogue = await createCatalogue(shop.id);
    numbers = [];
    for (let i = 0; i < 30; i++) {
      const day = String(i + 1).padStart(2, "0");
      const order = await createOrder(shop.id, { customerId: catalogue.customer.id, eventDate: `2027-05-${day}`, dueDate: `2027-04-${day}`, notes: "" }, [
        { productId: catalogue.tableNumber.id, quantity: 2, personalisation: [], notes: "", files: [] },
      ]);
      numbers.push(order.number);
    }
    app = await startApp({ STOPWISE_PLAN_RUNNER: "0" });
    browser = await launchBrowser();
  });
  afterAll(async () => {
    await browser?.close();
    await app?.stop();
  });

  it("shows the loader's list without reading it again, then sorts, pages and opens an order in place", async () => {
    const page = await browser.newPage({ viewport: VIEWPORTS.desktop });
    const errors: string[] = [];
    page.on("pageerror", (err) => errors.push(err.message));
    const listReads: string[] = [];
    page.on("request", (req) => {
      if (new URL(req.url()).pathname === "/api/orders") listReads.push(req.url());
    });
    await signInThroughForm(page, app.url, shop.users.owner, "/orders");
    await page.getByText("1–25 of 30").waitFor();
    await page.waitForLoadState("networkidle");
    expect(listReads).toEqual([]);

    await page.evaluate(() => ((window as unknown as { stillHere: boolean }).stillHere = true));
    const rows = page.locator("tbody > tr");
    await page.getByRole("link", { name: "Order", exact: true }).click();
    await page.locator('th[aria-sort="ascending"]', { hasText: "Order" }).waitFor();
    expect(await rows.first().getByRole("link").textContent()).toBe(`#${Math.min(...numbers)}`);
    await page.getByRole("link", { name: "Next →" }).click();
    await page.getByText("26–30 of 30").waitFor();
    expect(await rows.count()).toBe(5);
    const last = Math.max(...numbers);
    await rows.getByRole("link", { name: `#${last}` }).click();
    await page.getByRole("heading", { name: `Order #${last}` }).waitFor();
    expect(await page.evaluate(() => (window as unknown as { stillHere?: boolean }).stillHere)).toBe(true);
    expect(errors).toEqual([]);
  });
});
