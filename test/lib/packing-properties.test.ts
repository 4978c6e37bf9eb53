// Property-based checks over random stock and parts (fast-check).
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { pack } from "~/lib/packing/engine";
import { validatePlan } from "~/lib/packing/validate";
import type { Job, Plan } from "~/lib/packing/types";
import { fakeClock } from "./packing-helpers";

const tenth = (lo: number, hi: number) => fc.integer({ min: lo * 10, max: hi * 10 }).map((v) => v / 10);

const stockArb = fc.record({
  length: fc.integer({ min: 200, max: 2440 }),
  width: fc.integer({ min: 150, max: 1220 }),
  quantity: fc.oneof(fc.constant(null), fc.integer({ min: 1, max: 4 })),
  cost: fc.integer({ min: 0, max: 80 }),
  grain: fc.constantFrom("length" as const, "none" as const),
  trimmed: fc.boolean(),
});

const partArb = fc.record({
  length: tenth(10, 1300),
  width: tenth(10, 700),
  quantity: fc.integer({ min: 1, max: 12 }),
  rotate: fc.boolean(),
});

const jobArb: fc.Arbitrary<Job> = fc
  .record({
    kerf: fc.oneof(fc.constantFrom(0, 2.4, 3.2), tenth(0, 5)),
    trim: fc.oneof(fc.constant(0), tenth(0, 15)),
    stages: fc.constantFrom(0 as const, 2 as const, 3 as const),
    objective: fc.constantFrom("sheets" as const, "setups" as const),
    seed: fc.integer({ min: 0, max: 1000 }),
    stock: fc.array(stockArb, { minLength: 1, maxLength: 3 }),
    parts: fc.array(partArb, { minLength: 1, maxLength: 6 }),
    limits: fc.option(fc.record({ ripMax: fc.integer({ min: 100, max: 1300 }), stopMax: fc.integer({ min: 300, max: 2500 }) }), { nil: undefined }),
  })
  .map((r) => ({
    ...r,
    timeLimitMs: 20,
    stock: r.stock.map((s, i) => ({ id: `s${i}`, ...s })),
    parts: r.parts.map((p, i) => ({ id: `p${i}`, ...p })),
  }));

const planFor = (job: Job): Plan => pack(job, { now: fakeClock(0.02) });

describe("packing properties", () => {
  it("every plan passes the validator, areas add up, and the lower bound never exceeds the panels used", () => {
    fc.assert(
      fc.property(jobArb, (job) => {
        const plan = planFor(job);
        const v = validatePlan(job, plan);
        expect(v.errors).toEqual([]);
        const m = plan.metrics;
        // stockArea = partsArea + kerfLoss + offcutArea + scrapArea (scrap includes the edge-trim margins)
        expect(Math.abs(m.stockArea - (m.partsArea + m.kerfLoss + m.offcutArea + m.scrapArea))).toBeLessThan(1e-6 * Math.max(1, m.stockArea));
        expect(m.scrapArea).toBeGreaterThanOrEqual(-1e-6);
        expect(m.lowerBound).toBeLessThanOrEqual(m.sheets);
        const placed = plan.sheets.reduce((a, s) => a + s.placements.length, 0);
        const unplaced = plan.unplaced.reduce((a, u) => a + u.quantity, 0);
        expect(placed + unplaced).toBe(job.parts.reduce((a, p) => a + p.quantity, 0));
        if (placed > 0) expect(m.lowerBound).toBeGreaterThanOrEqual(1);
        const partsArea = plan.sheets.reduce((a, s) => a + s.placements.reduce((b, p) => b + p.length * p.width, 0), 0);
        expect(m.partsArea).toBeCloseTo(partsArea, 3);
        // listed offcuts and scrap rectangles add up to their metrics (scrap plus the trim margins)
        const off = plan.sheets.reduce((a, s) => a + s.offcuts.reduce((b, r) => b + r.length * r.width, 0), 0);
        expect(m.offcutArea).toBeCloseTo(off, 3);
        const trimArea = plan.sheets.reduce((a, s) => {
          const t = s.trimmed ? job.trim : 0;
          return a + s.length * s.width - (s.length - 2 * t) * (s.width - 2 * t);
        }, 0);
        const scrapRects = plan.sheets.reduce((a, s) => a + s.scrap.reduce((b, r) => b + r.length * r.width, 0), 0);
        expect(m.scrapArea).toBeCloseTo(scrapRects + trimArea, 2);
      }),
      { numRuns: 60 },
    );
  });

  it("the same seed gives the same plan", () => {
    fc.assert(
      fc.property(jobArb, (job) => {
        const a = planFor(job);
        const b = planFor(job);
        a.metrics.elapsedMs = b.metrics.elapsedMs = 0;
        expect(a).toEqual(b);
      }),
      { numRuns: 15 },
    );
  });

  // long thin parts, a few per panel: the path with exact fills and the pool search (exact.ts, pool.ts)
  const longThinJob: fc.Arbitrary<Job> = fc
    .record({
      kerf: fc.constantFrom(0, 3.2, 4.5),
      trim: fc.constantFrom(0, 10),
      seed: fc.integer({ min: 0, max: 1000 }),
      parts: fc.array(
        fc.record({
          along: fc.integer({ min: 52, max: 95 }),
          across: fc.integer({ min: 5, max: 45 }),
          quantity: fc.integer({ min: 1, max: 4 }),
          rotate: fc.boolean(),
        }),
        { minLength: 3, maxLength: 12 },
      ),
    })
    .map((r) => ({
      kerf: r.kerf,
      trim: r.trim,
      stages: 0 as const,
      objective: "sheets" as const,
      seed: r.seed,
      timeLimitMs: 200,
      stock: [{ id: "ply", length: 1220, width: 610, quantity: null, cost: 20, grain: "none" as const, trimmed: true }],
      parts: r.parts.map((p, i) => ({ id: `p${i}`, length: (1200 * p.along) / 100, width: (600 * p.across) / 100, quantity: p.quantity, rotate: p.rotate })),
    }));

  it("long thin parts a few per panel: valid plans, every part placed, same plan for the same seed", () => {
    fc.assert(
      fc.property(longThinJob, (job) => {
        // a coarser fake clock: the exact searches do a millisecond or more of real work between
        // readings, so 0.02 ms a reading made some draws run 80 times their budget (over a minute)
        const planLongThin = (j: Job) => pack(j, { now: fakeClock(0.2) });
        const a = planLongThin(job);
        expect(validatePlan(job, a).errors).toEqual([]);
        expect(a.unplaced).toEqual([]);
        expect(a.metrics.lowerBound).toBeLessThanOrEqual(a.metrics.sheets);
        const b = planLongThin(job);
        a.metrics.elapsedMs = b.metrics.elapsedMs = 0;
        expect(a).toEqual(b);
      }),
      { numRuns: 25 },
    );
  });
});
