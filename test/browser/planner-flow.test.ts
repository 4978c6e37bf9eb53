import type { Browser } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { batchScenario } from "../support/batch-factories";
import { launchBrowser, signInThroughForm, VIEWPORTS } from "../support/browser";
import { waitForMail } from "../support/outbox";
import { startApp } from "../support/server";

describe("the planner in chromium, on a tablet", () => {
  let app: Awaited<ReturnType<typeof startApp>>;
  let browser: Browser;
  let s: Awaited<ReturnType<typeof batchScenario>>;
  beforeAll(async () => {
    s = await batchScenario();
    app = await startApp(); // runs the plan runner beside the server, as bin/start does
    browser = await launchBrowser();
  });
  afterAll(async () => {
    await browser?.close();
    await app?.stop();
  });

  it("builds the batch, runs a plan and watches it finish, compares it with a second plan, and releases it", async () => {
    const page = await browser.newPage({ viewport: VIEWPORTS.tablet });
    const errors: string[] = [];
    page.on("pageerror", (err) => errors.push(err.message));
    await signInThroughForm(page, app.url, s.shop.users.planner, "/batches");
    await page.getByRole("heading", { level: 1, name: "Batches" }).waitFor();

    await page.getByLabel("Due by").fill("2027-01-15");
    await page.getByRole("button", { name: "Show what is due" }).click();
    await page.locator('[data-proposal="Birch plywood 6 mm"]').waitFor();
    await page.getByRole("button", { name: "Create these 2 batches" }).click();
    await page.getByRole("heading", { name: "All batches" }).waitFor();
    await page.locator("li", { hasText: "Birch plywood 6 mm" }).getByRole("link").click();
    await page.getByRole("heading", { level: 1, name: /^B-\d{4}$/ }).waitFor();
    expect(await page.locator('tr[data-part] td').filter({ hasText: "Number card" }).count()).toBe(1);

    await page.getByLabel("Time to search (seconds)").fill("3");
    await page.getByRole("button", { name: "Run a plan" }).click();
    const first = page.locator('[data-plan="1"]');
    await first.locator('[data-status="running"], [data-status="queued"]').waitFor({ timeout: 10_000 });
    await first.getByText(/best so far/).waitFor();
    await first.locator('[data-status="done"]').waitFor({ timeout: 20_000 });

    await page.getByLabel("Aim for").selectOption("setups");
    await page.getByLabel("Time to search (seconds)").fill("1");
    await page.getByRole("button", { name: "Run a plan" }).click();
    await page.locator('[data-plan="2"] [data-status="done"]').waitFor({ timeout: 20_000 });

    await page.getByLabel("First", { exact: true }).selectOption({ label: "Plan 1" });
    await page.getByLabel("Second", { exact: true }).selectOption({ label: "Plan 2" });
    const table = page.getByTestId("plan-compare");
    await table.waitFor();
    expect(await table.locator("tbody tr").count()).toBe(7); // sheets and racked offcuts on rows of their own, cost and net of offcuts too

    await first.getByRole("link", { name: "View panels" }).click();
    await page.getByRole("heading", { level: 1, name: "Plan 1" }).waitFor();
    const summary = (await page.getByText(/ · yield /).textContent())!;
    const panels = Number(summary.match(/^(\d+) sheets? /)![1]);
    expect(summary).toMatch(panels === 1 ? /^1 sheet \d+ × \d+ mm · / : /^\d+ sheets \d+ × \d+ mm[ ,·]/); // one sheet or two, with their size
    await page.locator('svg [role="button"]').first().click();
    await page.getByText(/Ardent–Vasquez wedding|Penhaligon party/).first().waitFor();
    await page.goBack();

    await page.locator('[data-plan="1"]').getByRole("button", { name: "Release to the saw" }).click();
    await page.getByText("At the saw", { exact: true }).waitFor();
    const mail = await waitForMail(s.shop.users.sawyer.email);
    expect(mail.subject).toContain("is ready for the saw");
    expect(mail.text).toContain(`/saw/${new URL(page.url()).pathname.split("/").pop()}\n`); // the batch's own floor view, not the list
    expect(errors).toEqual([]);
  });
});
