import type { Browser, Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { launchBrowser, signInThroughForm, VIEWPORTS } from "../support/browser";
import { createShop, type TestShop } from "../support/factories";
import { startApp } from "../support/server";
import type { Role } from "~/lib/permissions";

async function signInAs(page: Page, url: string, user: { email: string; password: string }) {
  await signInThroughForm(page, url, user);
  await page.getByRole("heading", { level: 1, name: "From the order to the offcut" }).waitFor();
}

// What each role's navigation holds (the permission table of app/lib/permissions.ts, as people see it).
const NAVIGATION: Record<Role, string[]> = {
  owner: ["Orders", "Calendar", "Customers", "Catalogue", "Batches", "Offcut rack", "Saw station", "Sleds & saws", "Ledger", "Deposits", "Team", "Shop settings", "Outbox"],
  planner: ["Orders", "Calendar", "Customers", "Catalogue", "Batches", "Offcut rack", "Saw station", "Sleds & saws", "Shop settings"],
  sawyer: ["Batches", "Offcut rack", "Saw station", "Sleds & saws"],
  bookkeeper: ["Orders", "Calendar", "Customers", "Catalogue", "Batches", "Offcut rack", "Ledger", "Deposits"],
};

describe("in chromium", () => {
  let app: Awaited<ReturnType<typeof startApp>>;
  let browser: Browser;
  let shop: TestShop;
  beforeAll(async () => {
    shop = await createShop("Browser");
    app = await startApp();
    browser = await launchBrowser();
  });
  afterAll(async () => {
    await browser?.close();
    await app?.stop();
  });

  it("the sign-in page loads with IBM Plex Sans served by the app itself, and nothing from elsewhere", async () => {
    const page = await browser.newPage({ viewport: VIEWPORTS.desktop });
    const requests: string[] = [];
    const errors: string[] = [];
    page.on("request", (req) => requests.push(req.url()));
    page.on("console", (msg) => msg.type() === "error" && errors.push(msg.text()));
    page.on("pageerror", (err) => errors.push(err.message));

    const res = await page.goto(`${app.url}/`, { waitUntil: "networkidle" });
    expect(res?.status()).toBe(200);
    expect(page.url()).toBe(`${app.url}/sign-in?redirectTo=%2F`);
    await expect(page.title()).resolves.toBe("Sign in · Stopwise");

    await page.evaluate(() => document.fonts.ready);
    const plexLoaded = await page.evaluate(() => [...document.fonts].some((f) => f.family.replace(/"/g, "") === "IBM Plex Sans" && f.status === "loaded"));
    expect(plexLoaded).toBe(true);
    expect(await page.evaluate(() => getComputedStyle(document.body).fontFamily)).toMatch(/^"?IBM Plex Sans"?/);

    const fontRequests = requests.filter((url) => /\.woff2?(\?|$)/.test(url));
    expect(fontRequests.length).toBeGreaterThan(0);
    for (const url of fontRequests) expect(new URL(url).origin).toBe(app.url);
    expect(requests.filter((url) => !url.startsWith(app.url) && !url.startsWith("data:"))).toEqual([]);
    expect(errors).toEqual([]);
  });

  for (const role of ["owner", "planner", "sawyer", "bookkeeper"] as Role[]) {
    it(`signs in as ${role} and sees only the ${role}'s navigation`, async () => {
      const context = await browser.newContext({ viewport: VIEWPORTS.desktop });
      const page = await context.newPage();
      await signInAs(page, app.url, shop.users[role]);
      const labels = await page.locator("aside nav a").evaluateAll((links) => links.map((a) => a.firstElementChild?.textContent ?? ""));
      expect(labels).toEqual(NAVIGATION[role]);
      await context.close();
    });
  }

  it("on a phone, the menu opens, reaches an area, closes, and signs out", async () => {
    const context = await browser.newContext({ viewport: VIEWPORTS.phone });
    const page = await context.newPage();
    await signInAs(page, app.url, shop.users.planner);
    await page.getByText("Menu", { exact: true }).click();
    await page.locator("header nav").getByRole("link", { name: /Batches/ }).click();
    await page.waitForURL(`${app.url}/batches`);
    await page.getByRole("heading", { level: 1, name: "Batches" }).waitFor();
    expect(await page.locator("header details").getAttribute("open")).toBeNull();
    await page.getByText("Menu", { exact: true }).click();
    await page.locator("header nav").getByRole("button", { name: "Sign out" }).click();
    await page.waitForURL(`${app.url}/sign-in`);
    await context.close();
  });

  it("a sawyer who opens the ledger is told which role it needs, and keeps the navigation", async () => {
    const context = await browser.newContext({ viewport: VIEWPORTS.tablet });
    const page = await context.newPage();
    await signInAs(page, app.url, shop.users.sawyer);
    const res = await page.goto(`${app.url}/ledger`);
    expect(res?.status()).toBe(403);
    await page.getByText("You need the owner or bookkeeper role for this.").waitFor();
    await context.close();
  });
});
