import type { Browser } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { launchBrowser, signInThroughForm, VIEWPORTS } from "../support/browser";
import { createShop, type TestShop } from "../support/factories";
import { createCatalogue } from "../support/order-factories";
import { waitForMail } from "../support/outbox";
import { startApp } from "../support/server";

describe("the owner takes the wedding order in chromium", () => {
  let app: Awaited<ReturnType<typeof startApp>>;
  let browser: Browser;
  let shop: TestShop;
  beforeAll(async () => {
    shop = await createShop("Wedding");
    await createCatalogue(shop.id);
    app = await startApp();
    browser = await launchBrowser();
  });
  afterAll(async () => {
    await browser?.close();
    await app?.stop();
  });

  it("creates the customer and the order with a guest-list CSV, confirms it, and the customer's e-mail arrives", async () => {
    const page = await browser.newPage({ viewport: VIEWPORTS.desktop });
    const errors: string[] = [];
    page.on("pageerror", (err) => errors.push(err.message));
    await signInThroughForm(page, app.url, shop.users.owner);

    const email = `celia-${Date.now()}@example.com`;
    await page.goto(`${app.url}/customers/new`);
    await page.getByLabel("Name").fill("Ardent–Vasquez wedding (browser)");
    await page.getByLabel("E-mail").fill(email);
    await page.getByRole("button", { name: "Save customer" }).click();
    await page.getByRole("link", { name: /New order for/ }).click();
    await page.getByRole("heading", { name: "New order" }).waitFor();

    await page.getByLabel("Event date").fill("2027-01-16");
    const line = (i: number) => page.locator(`fieldset[data-line="${i}"]`);
    await line(0).getByLabel("Product").selectOption({ label: "Welcome sign · €85.00" });
    await line(0).getByLabel("Personalisation, one text per line").fill("Welcome to the wedding of Celia & Marco");

    await page.getByRole("button", { name: "Add another line" }).click();
    await line(1).getByLabel("Product").selectOption({ label: "Table number · €6.50" });
    await line(1).getByLabel("The quantity follows").check();
    await line(1).getByLabel("Personalisation, one text per line").fill(Array.from({ length: 18 }, (_, i) => `Table ${i + 1}`).join("\n"));

    await page.getByRole("button", { name: "Add another line" }).click();
    await line(2).getByLabel("Product").selectOption({ label: "Place card · €1.80" });
    await line(2).getByLabel("The quantity follows").check();
    const guests = ["Guest", "Zoë Ardent", "Nguyễn Thảo", ...Array.from({ length: 118 }, (_, i) => `Guest ${i + 3}`)].join("\n");
    await line(2).getByLabel(/upload them as CSV/).setInputFiles({ name: "guests.csv", mimeType: "text/csv", buffer: Buffer.from(`\uFEFF${guests}`, "utf8") });
    await line(2).getByLabel(/Column to use/).fill("Guest");
    await line(2).getByText('120 texts under "Guest", from "Zoë Ardent"').waitFor();

    await page.getByRole("button", { name: "Save order" }).click();
    await page.getByRole("heading", { name: /^Order #\d+$/ }).waitFor();
    await page.getByText("120 × Place card").waitFor();
    await page.getByText("18 × Table number").waitFor();
    expect(await page.getByText("€418.00").count()).toBeGreaterThan(0); // 85 + 18 × 6.50 + 120 × 1.80

    await page.getByRole("button", { name: "Confirm and e-mail the customer" }).click();
    await page.getByText(`Confirmation e-mailed to ${email}`).waitFor();
    const mail = await waitForMail(email);
    expect(mail.subject).toMatch(/^Your order #\d+ with .* is confirmed$/);
    expect(mail.text).toContain("120 × Place card");
    expect(mail.text).toMatch(/Total\s+€418\.00/);

    // The couple asks for a name for table 7: the text is corrected on the line, the count kept.
    const tables = page.locator("li[data-line-id]", { hasText: "18 × Table number" });
    await tables.getByText("Correct the texts").click();
    const box = tables.getByLabel("One text per item, 18 in all, in order");
    await box.fill((await box.inputValue()).replace("Table 7", "The Lighthouse"));
    await tables.getByRole("button", { name: "Save texts" }).click();
    await tables.getByText(/18 personalisation texts: Table 1, Table 2, Table 3/).waitFor();
    await tables.getByText("18 personalisation texts").click();
    await tables.locator("ol > li", { hasText: "The Lighthouse" }).waitFor();
    expect(errors).toEqual([]);
  });
});
