// The knapsack column filler on its own (app/lib/packing/fill.ts), then through the engine.
import { describe, expect, it } from "vitest";
import { fillBin, type BinContext, type FillParams, type Free, type Placed } from "~/lib/packing/fill";
import { pack } from "~/lib/packing/engine";
import { validatePlan } from "~/lib/packing/validate";
import { fakeClock, job } from "./packing-helpers";

/** parts [length, width], all free to turn, in a square 100 × 100 panel (no kerf) */
function square(parts: [number, number][]): BinContext {
  return {
    W: 100,
    H: 100,
    stripMax: Infinity,
    orients: parts.map(([l, w]) => (l === w ? [{ w: l, h: w, rot: false }] : [{ w: l, h: w, rot: false }, { w, h: l, rot: true }])),
  };
}

const column = (orient: 0 | 1, pick = 0): FillParams => ({ kind: "guillotine", rectChoice: 0, split: 2, driver: "column", orient, pick });

function run(ctx: BinContext, counts: number[], p: FillParams) {
  const c = Int32Array.from(counts);
  const weight = Float64Array.from(ctx.orients.map((os) => os[0].w * os[0].h));
  const out: Placed[] = [];
  const free: Free[] = [];
  const order = counts.flatMap((n, t) => Array<number>(n).fill(t));
  const load = fillBin(ctx, c, order, p, weight, out, free);
  return { out, free, load, left: [...c] };
}

function overlaps(a: { x: number; y: number; w: number; h: number }, b: { x: number; y: number; w: number; h: number }) {
  return a.x < b.x + b.w && b.x < a.x + a.w && a.y < b.y + b.h && b.y < a.y + a.h;
}

describe("column filler", () => {
  // 90 × 35 + 90 × 45 would fill only 80 of the column's 100; greedy by size takes 45 and 35 first
  const parts: [number, number][] = [
    [90, 45],
    [90, 35],
    [90, 30],
    [90, 40],
    [100, 10],
  ];

  it("chooses the long parts whose widths fill the column exactly, and fills the rest of the panel", () => {
    const ctx = square(parts);
    const { out, free, load, left } = run(ctx, [1, 1, 2, 1, 1], column(0, 3));
    const col = out.filter((p) => p.x === 0 && p.w === 90);
    expect(col.map((p) => p.h).sort()).toEqual([30, 30, 40]);
    expect(col.reduce((a, p) => a + p.h, 0)).toBe(100);
    // the 10 mm wide rest of the panel takes the 100 × 10 part standing up
    expect(out).toContainEqual({ t: 4, x: 90, y: 0, w: 10, h: 100, rot: true });
    expect(load).toBe(100 * 100);
    expect(left).toEqual([1, 1, 0, 0, 0]);
    expect(free).toEqual([]);
  });

  it("lays the same column along y when transposed, with turned parts reported as turned", () => {
    const ctx = square(parts);
    const { out, load } = run(ctx, [1, 1, 2, 1, 1], column(1, 3));
    expect(load).toBe(100 * 100);
    const row = out.filter((p) => p.y === 0 && p.h === 90);
    expect(row.map((p) => p.w).sort()).toEqual([30, 30, 40]);
    for (const p of row) expect(p.rot).toBe(true);
    for (const p of out) {
      const o = ctx.orients[p.t].find((q) => q.w === p.w && q.h === p.h);
      expect(o?.rot).toBe(p.rot);
    }
  });

  it("keeps every placement inside the panel and apart from the others, and its free rectangles clear of them", () => {
    const ctx = square([
      [97, 21],
      [83, 44],
      [72, 18],
      [35, 20],
      [12, 9],
      [68, 33],
    ]);
    for (const p of [column(0, 0), column(0, 3), column(1, 1), column(1, 2)]) {
      const { out, free } = run(ctx, [1, 1, 2, 3, 5, 1], p);
      expect(out.length).toBeGreaterThan(0);
      for (const [i, a] of out.entries()) {
        expect(a.x >= 0 && a.y >= 0 && a.x + a.w <= 100 && a.y + a.h <= 100).toBe(true);
        for (const b of out.slice(i + 1)) expect(overlaps(a, b)).toBe(false);
        for (const f of free) expect(overlaps(a, f)).toBe(false);
      }
    }
  });

  it("gives the engine a plan the validator accepts for a job of mostly long thin parts (where the column filler joins)", () => {
    const j = job({
      kerf: 3.2,
      trim: 10,
      stages: 0,
      timeLimitMs: 200,
      seed: 3,
      stock: [{ id: "ply", length: 1220, width: 1220, quantity: null, cost: 30, grain: "none", trimmed: true }],
      parts: [
        { id: "rail", length: 1100, width: 290, quantity: 4, rotate: true },
        { id: "slat", length: 980, width: 120, quantity: 6, rotate: true },
        { id: "cleat", length: 180, width: 90, quantity: 4, rotate: true },
      ],
    });
    const plan = pack(j, { now: fakeClock() });
    expect(validatePlan(j, plan).ok).toBe(true);
    expect(plan.unplaced).toEqual([]);
    expect(plan.metrics.sheets).toBeGreaterThanOrEqual(plan.metrics.lowerBound);
  });
});
