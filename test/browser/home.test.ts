import type { Browser } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { launchBrowser, VIEWPORTS } from "../support/browser";
import { startApp } from "../support/server";

describe("home page in chromium", () => {
  let app: Awaited<ReturnType<typeof startApp>>;
  let browser: Browser;
  beforeAll(async () => {
    app = await startApp();
    browser = await launchBrowser();
  });
  afterAll(async () => {
    await browser?.close();
    await app?.stop();
  });

  it("loads, shows the areas, and takes IBM Plex Sans from the app itself", async () => {
    const page = await browser.newPage({ viewport: VIEWPORTS.desktop });
    const requests: string[] = [];
    const errors: string[] = [];
    page.on("request", (req) => requests.push(req.url()));
    page.on("console", (msg) => msg.type() === "error" && errors.push(msg.text()));
    page.on("pageerror", (err) => errors.push(err.message));

    const res = await page.goto(app.url, { waitUntil: "networkidle" });
    expect(res?.status()).toBe(200);
    await expect(page.title()).resolves.toBe("Stopwise");
    expect(await page.getByRole("heading", { level: 1 }).textContent()).toBe("From the order to the offcut");
    expect(await page.getByRole("navigation", { name: "Areas" }).getByRole("link").count()).toBeGreaterThanOrEqual(10);

    await page.evaluate(() => document.fonts.ready);
    const plexLoaded = await page.evaluate(() =>
      [...document.fonts].some((f) => f.family.replace(/"/g, "") === "IBM Plex Sans" && f.status === "loaded"),
    );
    expect(plexLoaded).toBe(true);
    const bodyFont = await page.evaluate(() => getComputedStyle(document.body).fontFamily);
    expect(bodyFont).toMatch(/^"?IBM Plex Sans"?/);

    const fontRequests = requests.filter((url) => /\.woff2?(\?|$)/.test(url));
    expect(fontRequests.length).toBeGreaterThan(0);
    for (const url of fontRequests) expect(new URL(url).origin).toBe(app.url);
    expect(requests.every((url) => url.startsWith(app.url) || url.startsWith("data:"))).toBe(true);
    expect(errors).toEqual([]);
  });

  it("opens the menu on a phone and reaches an area", async () => {
    const page = await browser.newPage({ viewport: VIEWPORTS.phone });
    await page.goto(app.url, { waitUntil: "networkidle" });
    await page.getByText("Menu", { exact: true }).click();
    await page.locator("header nav").getByRole("link", { name: /Batches/ }).click();
    await page.waitForURL(`${app.url}/batches`);
    await page.getByRole("heading", { level: 1, name: "Batches" }).waitFor();
    expect(await page.locator("header details").getAttribute("open")).toBeNull();
  });
});
