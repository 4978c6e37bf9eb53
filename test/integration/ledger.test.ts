import { parse } from "csv-parse/sync";
import { eq } from "drizzle-orm";
import request from "supertest";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import * as t from "../../db/schema";
import { appServer, visible } from "../support/app";
import { batchScenario, cutBatch } from "../support/batch-factories";
import { signIn } from "../support/factories";
import { getDb } from "~/db.server";
import { startPlanRunner, stopPlanRunner } from "~/jobs/plan-runner.server";
import { trendMonths } from "~/lib/ledger-trend";
import { monthlyTrend } from "~/models/ledger.server";

const server = await appServer();
const db = getDb();
const thisMonth = new Date().toISOString().slice(0, 7);
let s: Awaited<ReturnType<typeof batchScenario>>;
let batchIds: string[];

beforeAll(async () => {
  await startPlanRunner();
  s = await batchScenario();
  batchIds = [await cutBatch(s, "2027-01-10"), await cutBatch(s, "2027-01-12")];
});
afterAll(() => stopPlanRunner());

describe("the ledger", () => {
  it("a month's totals are the sums of its batches, and each batch's order shares add up to its net cost to the cent", async () => {
    const bookkeeper = await signIn(server, s.shop.users.bookkeeper);
    const res = await request(server).get(`/api/ledger?month=${thisMonth}`).set("Cookie", bookkeeper);
    expect(res.status).toBe(200);
    const rows = await db.select().from(t.batchCosts).where(eq(t.batchCosts.shopId, s.shop.id));
    expect(rows).toHaveLength(2);
    const sum = (k: keyof (typeof rows)[number]) => rows.reduce((a, r) => a + Number(r[k]), 0);
    expect(res.body.summary.total).toMatchObject({
      batches: 2,
      stockAreaMm2: sum("stockAreaMm2"),
      partsAreaMm2: sum("partsAreaMm2"),
      scrapAreaMm2: sum("scrapAreaMm2"),
      costDrawnMinor: sum("costDrawnMinor"),
      valueReturnedMinor: sum("valueReturnedMinor"),
      scrapCostMinor: sum("scrapCostMinor"),
    });
    for (const r of rows) {
      expect(r.allocations.reduce((a, x) => a + x.costMinor, 0)).toBe(r.costDrawnMinor - r.valueReturnedMinor);
      expect(r.stockAreaMm2).toBe(r.partsAreaMm2 + r.rackedAreaMm2 + r.kerfLossMm2 + r.scrapAreaMm2);
      expect(r.costDrawnMinor).toBe(5290); // one full sheet each
    }
    expect(res.body.batches.map((b: { batchId: string }) => b.batchId).sort()).toEqual([...batchIds].sort());
  });

  it("the CSV carries the same rows, with currency and unit in its header, and parses back", async () => {
    const bookkeeper = await signIn(server, s.shop.users.bookkeeper);
    const csv = await request(server).get(`/ledger.csv?month=${thisMonth}`).set("Cookie", bookkeeper);
    expect(csv.status).toBe(200);
    expect(csv.headers["content-type"]).toContain("text/csv");
    const [header, ...rest] = csv.text.split("\r\n");
    expect(header).toBe(`# Stopwise ledger ${thisMonth}; money in EUR; areas in m2`);
    const records = parse(rest.join("\r\n"), { columns: true, skip_empty_lines: true }) as Record<string, string>[];
    const api = (await request(server).get(`/api/ledger?month=${thisMonth}`).set("Cookie", bookkeeper)).body;
    expect(records).toHaveLength(api.batches.length);
    api.batches.forEach((b: { batchCode: string; materialName: string; costDrawnMinor: number; valueReturnedMinor: number; scrapCostMinor: number; stockAreaMm2: number }, i: number) => {
      expect(records[i].batch).toBe(b.batchCode);
      expect(records[i].material).toBe(b.materialName);
      expect(records[i].cost_drawn_EUR).toBe((b.costDrawnMinor / 100).toFixed(2));
      expect(records[i].net_cost_EUR).toBe(((b.costDrawnMinor - b.valueReturnedMinor) / 100).toFixed(2));
      expect(records[i].scrap_cost_EUR).toBe((b.scrapCostMinor / 100).toFixed(2));
      expect(records[i].stock_m2).toBe((b.stockAreaMm2 / 1e6).toFixed(2));
    });
  });

  it("drills down from the month to a batch and its orders; an order shows its material cost and margin", async () => {
    const owner = await signIn(server, s.shop.users.owner);
    const month = await request(server).get(`/ledger?month=${thisMonth}`).set("Cookie", owner);
    expect(visible(month.text)).toContain("Birch plywood 6 mm");
    const detail = await request(server).get(`/ledger/batches/${batchIds[0]}`).set("Cookie", owner);
    expect(detail.status).toBe(200);
    expect(visible(detail.text)).toContain(`#${s.wedding.number}`);
    const order = await request(server).get(`/orders/${s.wedding.id}`).set("Cookie", owner);
    expect(visible(order.text)).toMatch(/Material €[\d.]+ · margin €[\d.]+/);
  });

  it("the bookkeeper reads everything here and changes nothing on the floor; a sawyer has no ledger", async () => {
    const bookkeeper = await signIn(server, s.shop.users.bookkeeper);
    expect((await request(server).get(`/ledger?month=${thisMonth}`).set("Cookie", bookkeeper)).status).toBe(200);
    expect((await request(server).post(`/api/batches/${batchIds[0]}/floor`).set("Cookie", bookkeeper).send({ setupIndex: 0 })).status).toBe(403);
    expect((await request(server).post(`/batches/${batchIds[0]}`).set("Cookie", bookkeeper).type("form").send({ intent: "run-plan" })).status).toBe(403);
    const sawyer = await signIn(server, s.shop.users.sawyer);
    expect((await request(server).get("/ledger").set("Cookie", sawyer)).status).toBe(403);
    expect((await request(server).get("/api/ledger").set("Cookie", sawyer)).status).toBe(403);
    expect((await request(server).get("/ledger.csv").set("Cookie", sawyer)).status).toBe(403);
  });
});

describe("the ledger chart", () => {
  it("draws all twelve months, those without batches as empty, and counts a batch cut months ago in its own month", async () => {
    const months = trendMonths(new Date());
    const [first] = await db.select().from(t.batchCosts).where(eq(t.batchCosts.batchId, batchIds[0]));
    const cutAt = first.cutAt;
    const fourAgo = new Date(`${months[7]}-15T12:00:00Z`);
    await db.update(t.batchCosts).set({ cutAt: fourAgo }).where(eq(t.batchCosts.batchId, batchIds[0]));
    try {
      const trend = await monthlyTrend(s.shop.id);
      expect(trend.map((m) => m.month)).toEqual(months);
      expect(trend.map((m) => m.batches)).toEqual([0, 0, 0, 0, 0, 0, 0, 1, 0, 0, 0, 1]);
      expect(trend[7].scrapCostMinor).toBe(first.scrapCostMinor);
      expect(trend.filter((m) => m.batches === 0).every((m) => m.scrapCostMinor === 0 && m.yield === null)).toBe(true);

      const bookkeeper = await signIn(server, s.shop.users.bookkeeper);
      const page = visible((await request(server).get("/ledger").set("Cookie", bookkeeper)).text);
      const label = page.match(/aria-label="Yield and scrap cost per month: ([^"]*)"/)![1];
      const drawn = label.split(", ");
      expect(drawn.map((d) => d.slice(0, 7))).toEqual(months);
      expect(drawn.filter((d) => d.endsWith("no batches"))).toHaveLength(10);
    } finally {
      await db.update(t.batchCosts).set({ cutAt }).where(eq(t.batchCosts.batchId, batchIds[0]));
    }
  });
});

describe("the ledger's areas on screen and in the CSV", () => {
  it("every area on the page, per material and in total, is the CSV's cells added up; scrap and kerf too", async () => {
    const [a] = await db.select().from(t.batchCosts).where(eq(t.batchCosts.batchId, batchIds[0]));
    const [b] = await db.select().from(t.batchCosts).where(eq(t.batchCosts.batchId, batchIds[1]));
    // One batch alone in its month, with scrap 1.7949 m² and kerf 0.0149 m² (their exact sum would show 1.81).
    const month = "2026-02";
    await db.update(t.batchCosts).set({ cutAt: new Date(`${month}-10T12:00:00Z`), scrapAreaMm2: 1_794_900, kerfLossMm2: 14_900 }).where(eq(t.batchCosts.batchId, a.batchId));
    try {
      const bookkeeper = await signIn(server, s.shop.users.bookkeeper);
      const csv = (await request(server).get(`/ledger.csv?month=${month}`).set("Cookie", bookkeeper)).text;
      const [record] = parse(csv.split("\r\n").slice(1).join("\r\n"), { columns: true, skip_empty_lines: true }) as Record<string, string>[];
      expect([record.scrap_m2, record.kerf_m2]).toEqual(["1.79", "0.01"]);
      const page = visible((await request(server).get(`/ledger?month=${month}`).set("Cookie", bookkeeper)).text);
      const total = page.slice(page.indexOf("<tfoot"), page.indexOf("</tfoot>"));
      const cells = [...total.matchAll(/<td[^>]*>([^<]*)<\/td>/g)].map((m) => m[1]);
      const heads = ["Batches", "Stock drawn", "Parts", "Yield", "Offcuts racked", "Scrap and kerf"];
      expect(cells[heads.indexOf("Scrap and kerf")]).toBe("1.80 m²");
      expect(cells[heads.indexOf("Stock drawn")]).toBe(`${record.stock_m2} m²`);

      // Two batches of 2.9768 m² each: 2.98 + 2.98 in the CSV, so 5.96 on the page (not 5.95 from the exact sum).
      await db.update(t.batchCosts).set({ cutAt: new Date(`${month}-11T12:00:00Z`) }).where(eq(t.batchCosts.batchId, batchIds[1]));
      const records = parse((await request(server).get(`/ledger.csv?month=${month}`).set("Cookie", bookkeeper)).text.split("\r\n").slice(1).join("\r\n"), { columns: true, skip_empty_lines: true }) as Record<string, string>[];
      expect(records).toHaveLength(2);
      const added = (...columns: string[]) => `${(records.reduce((n, r) => n + columns.reduce((m, c) => m + Math.round(Number(r[c]) * 100), 0), 0) / 100).toFixed(2)} m²`;
      const both = visible((await request(server).get(`/ledger?month=${month}`).set("Cookie", bookkeeper)).text);
      for (const section of [both.slice(both.indexOf("<tbody"), both.indexOf("</tbody>")), both.slice(both.indexOf("<tfoot"), both.indexOf("</tfoot>"))]) {
        const shown = [...section.matchAll(/<td[^>]*>([^<]*)<\/td>/g)].map((m) => m[1]);
        expect(shown[heads.indexOf("Stock drawn")]).toBe(added("stock_m2"));
        expect(shown[heads.indexOf("Parts")]).toBe(added("parts_m2"));
        expect(shown[heads.indexOf("Offcuts racked")]).toBe(added("offcuts_racked_m2"));
        expect(shown[heads.indexOf("Scrap and kerf")]).toBe(added("scrap_m2", "kerf_m2"));
      }
    } finally {
      await db.update(t.batchCosts).set({ cutAt: a.cutAt, scrapAreaMm2: a.scrapAreaMm2, kerfLossMm2: a.kerfLossMm2 }).where(eq(t.batchCosts.batchId, a.batchId));
      await db.update(t.batchCosts).set({ cutAt: b.cutAt }).where(eq(t.batchCosts.batchId, b.batchId));
    }
  });
});

describe("the ledger on the shop's clock", () => {
  it("counts a batch cut on a New York evening in that day and month, on the page, in the CSV and in the trend", async () => {
    const [a] = await db.select().from(t.batchCosts).where(eq(t.batchCosts.batchId, batchIds[0]));
    // 03:00 UTC on 1 March 2026 is 22:00 on 28 February in New York (UTC−5 until 8 March, IANA rules).
    await db.update(t.batchCosts).set({ cutAt: new Date("2026-03-01T03:00:00Z") }).where(eq(t.batchCosts.batchId, a.batchId));
    await db.update(t.shops).set({ timeZone: "America/New_York" }).where(eq(t.shops.id, s.shop.id));
    try {
      const bookkeeper = await signIn(server, s.shop.users.bookkeeper);
      const feb = (await request(server).get("/api/ledger?month=2026-02").set("Cookie", bookkeeper)).body;
      expect(feb.batches.map((b: { batchId: string; cutDay: string }) => [b.batchId, b.cutDay])).toEqual([[a.batchId, "2026-02-28"]]);
      expect((await request(server).get("/api/ledger?month=2026-03").set("Cookie", bookkeeper)).body.batches).toEqual([]);
      const csv = (await request(server).get("/ledger.csv?month=2026-02").set("Cookie", bookkeeper)).text;
      const [record] = parse(csv.split("\r\n").slice(1).join("\r\n"), { columns: true, skip_empty_lines: true }) as Record<string, string>[];
      expect(Object.values(record)).toContain("2026-02-28");
      const trend = await monthlyTrend(s.shop.id, new Date("2026-03-15T12:00:00Z"), 12, "America/New_York");
      expect(trend.find((m) => m.month === "2026-02")?.batches).toBe(1);
      expect(trend.find((m) => m.month === "2026-03")?.batches).toBe(0);
      // On UTC the same batch is March's.
      expect((await monthlyTrend(s.shop.id, new Date("2026-03-15T12:00:00Z"), 12)).find((m) => m.month === "2026-03")?.batches).toBe(1);
    } finally {
      await db.update(t.shops).set({ timeZone: "UTC" }).where(eq(t.shops.id, s.shop.id));
      await db.update(t.batchCosts).set({ cutAt: a.cutAt }).where(eq(t.batchCosts.batchId, a.batchId));
    }
  });
});
