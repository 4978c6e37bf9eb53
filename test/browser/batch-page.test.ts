// The batch page in chromium: a row's orders are read when the row is opened, and "Hold back" (one
// form shared by every line's button) takes exactly the line whose button was pressed.
import type { Browser } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { batchScenario } from "../support/batch-factories";
import { launchBrowser, signInThroughForm, VIEWPORTS } from "../support/browser";
import { startApp } from "../support/server";
import { createBatches } from "~/models/batches.server";

describe("the batch page in chromium", () => {
  let app: Awaited<ReturnType<typeof startApp>>;
  let browser: Browser;
  let s: Awaited<ReturnType<typeof batchScenario>>;
  let batchId: string;
  beforeAll(async () => {
    s = await batchScenario();
    [batchId] = await createBatches(s.shop.id, "2027-01-15", [s.birch6.id]);
    app = await startApp({ STOPWISE_PLAN_RUNNER: "0" });
    browser = await launchBrowser();
  });
  afterAll(async () => {
    await browser?.close();
    await app?.stop();
  });

  it("opens a part's orders on demand, and holds back the one line asked for", async () => {
    const page = await browser.newPage({ viewport: VIEWPORTS.phone });
    const errors: string[] = [];
    page.on("pageerror", (err) => errors.push(err.message));
    await signInThroughForm(page, app.url, s.shop.users.planner, `/batches/${batchId}`);
    const numbers = page.locator('tr[data-part="saw:210000x150000:locked"]');
    await numbers.getByText("5 from 2 orders").click();
    await numbers.getByText(`#${s.party.number} Penhaligon party · Table number · Table B`).waitFor();
    expect(await numbers.locator("li").count()).toBe(5);

    const lines = page.locator("section", { has: page.getByRole("heading", { name: "Order lines" }) }).locator("li");
    expect(await lines.count()).toBe(3);
    await lines.filter({ hasText: "Penhaligon party" }).getByRole("button", { name: "Hold back" }).click();
    await lines.filter({ hasText: "Penhaligon party" }).waitFor({ state: "detached" });
    expect(await lines.count()).toBe(2);
    expect(await lines.filter({ hasText: "Ardent–Vasquez wedding: 3 × Table number" }).count()).toBe(1);
    await numbers.getByText("3 from 1 order", { exact: true }).waitFor();
    expect(errors).toEqual([]);
  });
});
