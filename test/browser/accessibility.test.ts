// Every main screen and the public pages, at phone and desktop widths, checked by axe-core (WCAG 2.1 A and AA rules:
// contrast, names and labels, ARIA structure, keyboard reach) in chromium, with real data on it.
import { readFileSync } from "node:fs";
import { createRequire } from "node:module";
import { eq } from "drizzle-orm";
import type { Browser, Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import * as t from "../../db/schema";
import { batchScenario } from "../support/batch-factories";
import { launchBrowser, signInThroughForm, VIEWPORTS } from "../support/browser";
import { startApp } from "../support/server";
import { getDb } from "~/db.server";
import { createBatches } from "~/models/batches.server";
import { releasePlan, requestPlan } from "~/models/plans.server";
import { addSaw, addSled, recordKerf, recordSledCheck } from "~/models/sleds.server";

const axeSource = readFileSync(createRequire(import.meta.url).resolve("axe-core/axe.min.js"), "utf8");
const WCAG = ["wcag2a", "wcag2aa", "wcag21a", "wcag21aa"];
const PAY_TOKEN = "accessibility-test-pay-link-0001";
/** Pages anyone may open: signing in and up, a forgotten password, a customer's deposit link. */
const PUBLIC = ["/sign-in", "/sign-up", "/forgot-password", `/pay/${PAY_TOKEN}`];

type Violation = { id: string; impact: string | null; help: string; targets: string[] };

/** axe's WCAG 2.1 A/AA violations on the page as it stands. */
async function violations(page: Page): Promise<Violation[]> {
  await page.evaluate(axeSource);
  return page.evaluate(async (tags) => {
    const axe = (window as unknown as { axe: { run: (ctx: Document, opts: object) => Promise<{ violations: { id: string; impact: string | null; help: string; nodes: { target: string[] }[] }[] }> } }).axe;
    const result = await axe.run(document, { runOnly: { type: "tag", values: tags } });
    return result.violations.map((v) => ({ id: v.id, impact: v.impact, help: v.help, targets: v.nodes.slice(0, 5).map((n) => n.target.join(" ")) }));
  }, WCAG);
}

describe("accessibility of the main screens (axe-core, WCAG 2.1 AA)", () => {
  let app: Awaited<ReturnType<typeof startApp>>;
  let browser: Browser;
  let s: Awaited<ReturnType<typeof batchScenario>>;
  const pages: string[] = [];

  beforeAll(async () => {
    s = await batchScenario();
    const [six] = await createBatches(s.shop.id, "2027-01-15", [s.birch6.id]);
    const sawId = await addSaw(s.shop.id, { name: "Cabinet saw", blade: "thin-kerf 2.4" });
    await recordKerf(s.shop.id, sawId, s.shop.users.sawyer.id, { kerfUm: 2400, note: "test cut" });
    const sledId = (await addSled(s.shop.id, { name: "Big sled", sawId, stopMinUm: 20_000, stopMaxUm: 1_200_000, widestUm: 610_000 }))!;
    await recordSledCheck(s.shop.id, sledId, s.shop.users.sawyer.id, { widthFirstEndUm: 25_020, widthSecondEndUm: 25_000, stripLengthUm: 400_000, pivotDistanceUm: 550_000 });
    app = await startApp();
    browser = await launchBrowser();
    const planId = await requestPlan(s.shop.id, six, { kerfMm: 2.4, trimMm: 10, stages: 2, objective: "sheets", timeLimitMs: 300, offcutIds: [], seed: 3, sawId, sledId });
    const deadline = Date.now() + 30_000;
    for (;;) {
      const [plan] = await getDb().select({ status: t.plans.status }).from(t.plans).where(eq(t.plans.id, planId));
      if (plan.status === "done") break;
      if (plan.status === "failed" || Date.now() > deadline) throw new Error(`the plan did not finish: ${plan.status}`);
      await new Promise((r) => setTimeout(r, 150));
    }
    await releasePlan(s.shop.id, six, planId);
    const [customer] = await getDb().select({ id: t.customers.id }).from(t.customers).where(eq(t.customers.shopId, s.shop.id)).limit(1);
    // the customer's page behind an e-mailed deposit link
    await getDb().insert(t.deposits).values({ shopId: s.shop.id, orderId: s.wedding.id, amountMinor: 6060, currency: "EUR", linkToken: PAY_TOKEN });
    pages.push(
      "/",
      "/orders",
      `/orders/${s.wedding.id}`,
      "/orders/new",
      "/calendar?month=2027-01", // the scenario's orders are due and held in January 2027
      "/customers",
      `/customers/${customer.id}`,
      "/catalogue",
      "/catalogue/materials",
      "/catalogue/products/new",
      "/batches",
      `/batches/${six}`,
      `/batches/${six}/plans/${planId}`,
      "/rack",
      "/saw",
      `/saw/${six}`,
      "/sleds",
      "/ledger",
      "/ledger/deposits",
      "/team",
      "/account",
      "/settings",
    );
  }, 180_000); // the app, a browser and a plan run to its end
  afterAll(async () => {
    await browser?.close();
    await app?.stop();
  });

  for (const width of ["phone", "desktop"] as const) {
    it(`no WCAG 2.1 A or AA violations on the public pages and the owner's screens, ${width} width`, async () => {
      // axe is injected as a script: the app's content security policy rightly refuses inline scripts
      const context = await browser.newContext({ viewport: VIEWPORTS[width], bypassCSP: true });
      const page = await context.newPage();
      const found: Record<string, Violation[]> = {};
      for (const path of PUBLIC) {
        const res = await page.goto(`${app.url}${path}`, { waitUntil: "networkidle" });
        expect(res?.status(), path).toBe(200);
        const v = await violations(page);
        if (v.length) found[path] = v;
      }
      await signInThroughForm(page, app.url, s.shop.users.owner);
      for (const path of pages) {
        const res = await page.goto(`${app.url}${path}`, { waitUntil: "networkidle" });
        expect(res?.status(), path).toBe(200);
        const v = await violations(page);
        if (v.length) found[path] = v;
      }
      expect(found).toEqual({});
      await context.close();
    }, 240_000); // 25 pages: about 25 s here, several times that on a slow, busy machine
  }
});
