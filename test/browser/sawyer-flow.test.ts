import { and, eq } from "drizzle-orm";
import type { Browser } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import * as t from "../../db/schema";
import { batchScenario } from "../support/batch-factories";
import { launchBrowser, signInThroughForm, VIEWPORTS } from "../support/browser";
import { startApp } from "../support/server";
import { getDb } from "~/db.server";
import { createBatches } from "~/models/batches.server";
import { releasePlan, requestPlan } from "~/models/plans.server";

const db = getDb();

describe("the sawyer on a tablet beside the saw", () => {
  let app: Awaited<ReturnType<typeof startApp>>;
  let browser: Browser;
  let s: Awaited<ReturnType<typeof batchScenario>>;
  let batchId: string;
  beforeAll(async () => {
    s = await batchScenario();
    app = await startApp(); // its plan runner plans the batch
    [batchId] = await createBatches(s.shop.id, "2027-01-15", [s.birch6.id]);
    const planId = await requestPlan(s.shop.id, batchId, { kerfMm: 3.2, trimMm: 10, stages: 2, objective: "sheets", timeLimitMs: 500, offcutIds: [], seed: 11 });
    for (let i = 0; i < 200; i++) {
      const [p] = await db.select().from(t.plans).where(eq(t.plans.id, planId));
      if (p.status === "done") break;
      if (p.status === "failed") throw new Error(`the plan failed: ${p.error}`);
      await new Promise((r) => setTimeout(r, 100));
    }
    await releasePlan(s.shop.id, batchId, planId);
    browser = await launchBrowser();
  });
  afterAll(async () => {
    await browser?.close();
    await app?.stop();
  });

  it("ticks every set-up, spoils one part, racks an offcut and closes the batch; the rack and the stock change", async () => {
    const [{ onHand: before }] = await db.select().from(t.stockPanels).where(eq(t.stockPanels.id, s.sheet6.id));
    const page = await browser.newPage({ viewport: VIEWPORTS.tablet });
    const errors: string[] = [];
    page.on("pageerror", (err) => errors.push(err.message));
    await signInThroughForm(page, app.url, s.shop.users.sawyer, "/saw");
    await page.getByRole("heading", { level: 1, name: "Saw station" }).waitFor();
    await page.getByRole("link", { name: /B-\d{4}/ }).click();
    await page.getByText(/0 of \d+ set-ups done/).waitFor();

    const rows = page.locator("li[data-setup]");
    const total = await rows.count();
    expect(total).toBeGreaterThan(1);
    for (let i = 0; i < total; i++) {
      const row = page.locator(`li[data-setup="${i}"]`);
      await row.getByRole("button", { name: "Done" }).click();
      await page.locator(`li[data-setup="${i}"][data-ticked="true"]`).waitFor();
    }
    await page.getByText(`${total} of ${total} set-ups done`).waitFor();
    expect(await page.locator('li[data-setup="0"]').innerText()).toMatch(/cuts? planned · \d+ done/); // the pieces the sawyer counted
    await page.reload();
    await page.getByText(`${total} of ${total} set-ups done`).waitFor(); // the ticks survived

    await page.locator('select[name="part"]').selectOption({ label: "Number card 210 × 150 mm" });
    // Each personalised card is its own item: the sawyer names the one that tore.
    const item = page.locator('select[name="item"]');
    await expect.poll(() => item.isEnabled()).toBe(true);
    const tableTwo = await item.locator("option", { hasText: "Table 2" }).textContent();
    expect(tableTwo).toMatch(/^Table 2 · #\d+ .+, item 2$/);
    await item.selectOption({ label: tableTwo! });
    await page.locator('input[name="reason"]').fill("tear-out on the face");
    await page.getByRole("button", { name: "Record and cut again later" }).click();
    await page.getByText("tear-out on the face").waitFor();

    const offcut = page.locator("li[data-offcut]").first();
    const offcutId = await offcut.getAttribute("data-offcut");
    await offcut.getByLabel(/Where it goes/).fill("Rack C, slot 2");
    await page.getByRole("button", { name: "Close the batch as cut" }).click();
    await page.getByText("on the rack at Rack C, slot 2").waitFor();

    const [batch] = await db.select().from(t.batches).where(eq(t.batches.id, batchId));
    expect(batch.status).toBe("cut");
    const [racked] = await db.select().from(t.offcuts).where(eq(t.offcuts.id, offcutId!));
    expect(racked.status).toBe("racked");
    expect(racked.location).toBe("Rack C, slot 2");
    const recuts = await db.select().from(t.recutParts).where(and(eq(t.recutParts.spoiledInBatchId, batchId)));
    expect(recuts).toHaveLength(1);
    expect(recuts[0].origin).toMatchObject({ text: "Table 2", itemIndex: 1 });
    const [{ onHand: after }] = await db.select().from(t.stockPanels).where(eq(t.stockPanels.id, s.sheet6.id));
    expect(after).toBe(before); // the sheet left the count when the batch was released
    expect(after).toBe(2);
    expect(errors).toEqual([]);
  });
});
