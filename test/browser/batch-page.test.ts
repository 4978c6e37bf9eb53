// The batch page in chromium: a row's orders are read when the row is opened, and the one move/hold
// form acts on exactly the lines ticked: moved lines land in the other batch, held ones leave.
import type { Browser } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import * as t from "../../db/schema";
import { batchScenario } from "../support/batch-factories";
import { launchBrowser, signInThroughForm, VIEWPORTS } from "../support/browser";
import { startApp } from "../support/server";
import { getDb } from "~/db.server";
import { batchCode } from "~/lib/batches";
import { createBatches, getBatch } from "~/models/batches.server";

describe("the batch page in chromium", () => {
  let app: Awaited<ReturnType<typeof startApp>>;
  let browser: Browser;
  let s: Awaited<ReturnType<typeof batchScenario>>;
  let batchId: string;
  let other: { id: string; number: number };
  beforeAll(async () => {
    s = await batchScenario();
    [batchId] = await createBatches(s.shop.id, "2027-01-15", [s.birch6.id]);
    [other] = await getDb().insert(t.batches).values({ shopId: s.shop.id, number: 900, materialId: s.birch6.id, dueBy: "2027-01-20" }).returning({ id: t.batches.id, number: t.batches.number });
    app = await startApp({ STOPWISE_PLAN_RUNNER: "0" });
    browser = await launchBrowser();
  });
  afterAll(async () => {
    await browser?.close();
    await app?.stop();
  });

  it("opens a part's orders on demand; holds back and moves exactly the ticked lines", async () => {
    const page = await browser.newPage({ viewport: VIEWPORTS.phone });
    const errors: string[] = [];
    page.on("pageerror", (err) => errors.push(err.message));
    await signInThroughForm(page, app.url, s.shop.users.planner, `/batches/${batchId}`);
    const numbers = page.locator('tr[data-part="saw:210000x150000:locked"]');
    await numbers.getByText("5 from 2 orders").click();
    await numbers.getByText(`#${s.party.number} Penhaligon party · Table number · Table B`).waitFor();
    expect(await numbers.locator("li").count()).toBe(5);

    const section = page.locator("section", { has: page.getByRole("heading", { name: "Order lines" }) });
    const lines = section.locator("ul > li");
    expect(await lines.count()).toBe(3);

    // Nothing ticked: the form says so and nothing changes.
    await section.getByRole("button", { name: "Hold back the ticked lines" }).click();
    await section.getByText("Tick one or more lines first.").waitFor();
    expect(await lines.count()).toBe(3);

    await lines.filter({ hasText: "Penhaligon party" }).getByRole("checkbox").check();
    await section.getByRole("button", { name: "Hold back the ticked lines" }).click();
    await lines.filter({ hasText: "Penhaligon party" }).waitFor({ state: "detached" });
    expect(await lines.count()).toBe(2);
    await numbers.getByText("3 from 1 order", { exact: true }).waitFor();

    // The two wedding lines go together to the other batch; the move needs a batch chosen first.
    for (const text of ["3 × Table number", "1 × Welcome sign"]) await lines.filter({ hasText: text }).getByRole("checkbox").check();
    await section.getByRole("button", { name: "Move", exact: true }).click();
    await section.getByText("Choose a batch.").waitFor();
    expect(await lines.locator("input:checked").count()).toBe(2); // the ticks survive the refusal
    await section.getByLabel("Move the ticked lines to").selectOption({ label: batchCode(other.number) });
    await section.getByRole("button", { name: "Move", exact: true }).click();
    await lines.first().waitFor({ state: "detached" });
    expect(await lines.count()).toBe(0);
    expect((await getBatch(s.shop.id, other.id))!.lines.map((l) => `${l.orderNumber} ${l.productName}`).sort()).toEqual([`${s.wedding.number} Table number`, `${s.wedding.number} Welcome sign`]);
    expect(errors).toEqual([]);
  });

  it("a line's order link goes through the router, not a fresh page load", async () => {
    const page = await browser.newPage({ viewport: VIEWPORTS.tablet });
    await signInThroughForm(page, app.url, s.shop.users.planner, `/batches/${other.id}`);
    await page.evaluate(() => ((window as unknown as { stillHere: boolean }).stillHere = true));
    await page.getByRole("link", { name: `#${s.wedding.number}` }).first().click();
    await page.getByRole("heading", { name: `Order #${s.wedding.number}` }).waitFor();
    expect(await page.evaluate(() => (window as unknown as { stillHere?: boolean }).stillHere)).toBe(true);
  });
});
