import { eq } from "drizzle-orm";
import { execFileSync } from "node:child_process";
import { readFileSync } from "node:fs";
import type { Browser } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import * as t from "../../db/schema";
import { DEMO_PASSWORD, seedDemo, seedDemoHistory } from "../../db/seed";
import { launchBrowser, signInThroughForm, VIEWPORTS } from "../support/browser";
import { startApp } from "../support/server";
import { getDb } from "~/db.server";
import { previousMonth } from "~/lib/ledger-report";

describe("the bookkeeper in chromium", () => {
  let app: Awaited<ReturnType<typeof startApp>>;
  let browser: Browser;
  beforeAll(async () => {
    const db = getDb();
    // Other suites may have seeded the demo shop already, without its history.
    let [demo] = await db.select().from(t.shops).where(eq(t.shops.name, "Tallowmere Sign & Keepsake"));
    if (!demo) {
      await seedDemo(db);
      [demo] = await db.select().from(t.shops).where(eq(t.shops.name, "Tallowmere Sign & Keepsake"));
    }
    const books = await db.select().from(t.batchCosts).where(eq(t.batchCosts.shopId, demo.id));
    if (books.length === 0) await seedDemoHistory(db);
    app = await startApp();
    browser = await launchBrowser();
  });
  afterAll(async () => {
    await browser?.close();
    await app?.stop();
  });

  it("opens last month, sees the demo batches' waste and downloads the CSV", async () => {
    const context = await browser.newContext({ viewport: VIEWPORTS.desktop, acceptDownloads: true });
    const page = await context.newPage();
    const errors: string[] = [];
    page.on("pageerror", (err) => errors.push(err.message));
    await signInThroughForm(page, app.url, { email: "books@tallowmere.example", password: DEMO_PASSWORD }, "/ledger");
    await page.getByRole("heading", { level: 1, name: "Ledger" }).waitFor();

    const month = previousMonth(new Date().toISOString().slice(0, 10));
    const monthName = execFileSync("date", ["-d", `${month}-01`, "+%B %Y"], { env: { ...process.env, LC_ALL: "C" }, encoding: "utf8" }).trim(); // GNU date names it
    await page.getByRole("heading", { name: `${monthName}: per material` }).waitFor(); // last month is the default
    const summary = page.getByTestId("ledger-summary");
    await summary.getByRole("rowheader", { name: "Birch plywood 6 mm" }).waitFor();
    await summary.getByRole("rowheader", { name: "MDF 6 mm" }).waitFor();
    expect(await summary.locator("tfoot td").first().textContent()).toBe("2");
    await page.locator(".recharts-wrapper").waitFor(); // the chart drew

    const [download] = await Promise.all([page.waitForEvent("download"), page.getByRole("link", { name: "Download CSV" }).click()]);
    const csv = readFileSync((await download.path())!, "utf8");
    expect(csv.split("\r\n")[0]).toBe(`# Stopwise ledger ${month}; money in GBP; areas in m2`);
    expect(csv).toContain("Birch plywood 6 mm");
    expect(csv).toContain("MDF 6 mm");

    await page.locator("section", { hasText: "Batches cut" }).getByRole("link", { name: /^B-\d{4}$/ }).first().click();
    await page.getByRole("heading", { name: "Material cost per order" }).waitFor();
    await page.getByRole("link", { name: "#990" }).waitFor();
    expect(errors).toEqual([]);
    await context.close();
  });
});
