// The exact guillotine test, the fullest fill and the pool search on hand-made panels.
import { describe, expect, it } from "vitest";
import { ExactFit, fullestFill } from "~/lib/packing/exact";
import { fillBin, type BinContext, type Orient, type Placed } from "~/lib/packing/fill";
import { mulberry32 } from "~/lib/packing/prng";
import { fullestConstructive, poolSearch } from "~/lib/packing/pool";
import { constructive, type SearchInput, type Solution } from "~/lib/packing/search";
import { guillotineVariants } from "~/lib/packing/engine";
import { fakeClock } from "./packing-helpers";

/** A panel W × H (already inflated) and part sizes [w, h]; rotate adds the turned orientation. */
function ctxFor(W: number, H: number, parts: [number, number][], rotate = true): BinContext {
  const orients: Orient[][] = parts.map(([w, h]) => {
    const os: Orient[] = [{ w, h, rot: false }];
    if (rotate && w !== h) os.push({ w: h, h: w, rot: true });
    return os.filter((o) => o.w <= W && o.h <= H);
  });
  return { W, H, orients, stripMax: Infinity };
}

/** Placements inside the panel, pairwise disjoint, one per requested part. */
function expectSound(ctx: BinContext, types: number[], placed: Placed[]) {
  expect(placed.map((p) => p.t).sort()).toEqual(types.slice().sort());
  for (const p of placed) {
    expect(p.x).toBeGreaterThanOrEqual(0);
    expect(p.y).toBeGreaterThanOrEqual(0);
    expect(p.x + p.w).toBeLessThanOrEqual(ctx.W);
    expect(p.y + p.h).toBeLessThanOrEqual(ctx.H);
    expect(ctx.orients[p.t].some((o) => o.w === p.w && o.h === p.h && o.rot === p.rot)).toBe(true);
  }
  for (let i = 0; i < placed.length; i++)
    for (let j = i + 1; j < placed.length; j++) {
      const a = placed[i];
      const b = placed[j];
      const apart = a.x + a.w <= b.x || b.x + b.w <= a.x || a.y + a.h <= b.y || b.y + b.h <= a.y;
      expect(apart).toBe(true);
    }
}

describe("exact guillotine test", () => {
  it("fits four 50 × 50 squares into 100 × 100 but not five", () => {
    const ctx = ctxFor(100, 100, [[50, 50]]);
    const ex = new ExactFit(ctx);
    expect(ex.fits([0, 0, 0, 0])).toBe(true);
    expect(ex.fits([0, 0, 0, 0, 0])).toBe(false);
    expectSound(ctx, [0, 0, 0, 0], ex.place([0, 0, 0, 0])!);
  });

  it("refuses the pinwheel: four 3 × 2 and a 1 × 1 tile 5 × 5 only without edge-to-edge cuts", () => {
    const ctx = ctxFor(5, 5, [[3, 2], [1, 1]]);
    const ex = new ExactFit(ctx);
    expect(ex.fits([0, 0, 0, 0, 1])).toBe(false);
    // without the centre square three of them fit (a 5 × 2 strip and a 5 × 3 strip)
    expect(ex.fits([0, 0, 0])).toBe(true);
    expect(ex.place([0, 0, 0, 0, 1])).toBeNull();
  });

  it("finds packings that need rotation and nesting", () => {
    // 60 × 40 twice and 40 × 20 three times in 100 × 80: two 60 × 40 stacked (60 × 80), the three 20 × 40 turned beside them
    const ctx = ctxFor(100, 80, [[60, 40], [40, 20]]);
    const ex = new ExactFit(ctx);
    const types = [0, 0, 1, 1, 1, 1];
    expect(ex.fits(types)).toBe(true);
    expectSound(ctx, types, ex.place(types)!);
    expect(ex.fits([0, 0, 1, 1, 1, 1, 1])).toBe(false);
    // no turning: the 40 × 20 parts stack 4 high beside the 60 × 80 column, a fifth does not fit
    const fixed = new ExactFit(ctxFor(100, 80, [[60, 40], [40, 20]], false));
    expect(fixed.fits(types)).toBe(true);
  });

  it("respects the kerf through inflated sizes: four 610 strips do not come out of 2440 with a 3.2 kerf, three do", () => {
    // inflated: part + kerf, panel + kerf (see fill.ts), in micrometres
    const k = 3200;
    const ctx = ctxFor(2_440_000 + k, 1_220_000 + k, [[610_000 + k, 1_220_000 + k]], false);
    const ex = new ExactFit(ctx);
    expect(ex.fits([0, 0, 0])).toBe(true);
    expect(ex.fits([0, 0, 0, 0])).toBe(false);
  });

  it("agrees with a brute-force check on small random sets", () => {
    const rng = mulberry32(7);
    for (let round = 0; round < 150; round++) {
      const parts: [number, number][] = Array.from({ length: 4 }, () => [1 + Math.floor(rng() * 7), 1 + Math.floor(rng() * 7)]);
      const ctx = ctxFor(8, 8, parts);
      const ex = new ExactFit(ctx);
      const types = [0, 1, 2, 3];
      const got = ex.fits(types);
      expect(got).toBe(bruteForceFits(ctx, types));
      if (got) expectSound(ctx, types, ex.place(types)!);
    }
  });
});

/** Guillotine feasibility by trying every first cut position (integer sizes), recursively. */
function bruteForceFits(ctx: BinContext, types: number[]): boolean {
  const memo = new Map<string, boolean>();
  const go = (w: number, h: number, ts: number[]): boolean => {
    if (ts.length === 0) return true;
    const key = `${w}x${h}:${ts.join(",")}`;
    const hit = memo.get(key);
    if (hit !== undefined) return hit;
    let ok = false;
    if (ts.length === 1) ok = ctx.orients[ts[0]].some((o) => o.w <= w && o.h <= h);
    else {
      const n = ts.length;
      for (let m = 1; m < (1 << n) - 1 && !ok; m++) {
        const a = ts.filter((_, i) => (m >> i) & 1);
        const b = ts.filter((_, i) => !((m >> i) & 1));
        for (let x = 1; x < w && !ok; x++) ok = go(x, h, a) && go(w - x, h, b);
        for (let y = 1; y < h && !ok; y++) ok = go(w, y, a) && go(w, h - y, b);
      }
    }
    memo.set(key, ok);
    return ok;
  };
  return go(ctx.W, ctx.H, types);
}

describe("fullest fill", () => {
  // strips 10 long of widths 5, 4, 3, 3, 3, 2 on a 10 × 10 panel: a panel holds widths adding up to 10
  const widths = [5, 4, 3, 2];
  const ctx = ctxFor(10, 10, widths.map((w): [number, number] => [10, w]), false);
  const weight = new Float64Array(widths.map((w) => 10 * w));
  const pool = () => Int32Array.from([1, 1, 3, 1]);

  it("fills the panel exactly where the largest-first greedy leaves a gap", () => {
    const chosen = fullestFill(new ExactFit(ctx), pool(), weight, 100, 1000);
    expect(chosen.reduce((a, t) => a + weight[t], 0)).toBe(100);
    // the greedy filler, largest first: 5 and 4, then nothing else fits
    const counts = pool();
    const out: Placed[] = [];
    const load = fillBin(ctx, counts, [0, 1, 2, 2, 2, 3], { kind: "guillotine", rectChoice: 0, split: 0, driver: "item" }, weight, out);
    expect(load).toBe(90);
  });

  const input = (): SearchInput => ({
    stocks: [{ ctx, quantity: Infinity, cost: 1, offcut: false, area: 100 }],
    demand: pool(),
    weight,
    dims: widths.map((w) => ({ l: 10, w })),
    variants: guillotineVariants(),
    rng: mulberry32(1),
    now: fakeClock(0.01),
    deadline: 1e9,
    lowerBound: 2,
    offcutsFirst: true,
  });

  it("packs the set into the optimal two panels; the bin-by-bin greedy needs three", () => {
    const full = fullestConstructive(input(), 1000, guillotineVariants()[0], Infinity)!;
    expect(full.bins.length).toBe(2);
    expect(Array.from(full.left)).toEqual([0, 0, 0, 0]);
    const greedy = constructive(input(), [guillotineVariants()[0]], [0], Infinity);
    expect(greedy.bins.length).toBe(3);
  });

  it("the pool search empties a panel of a three-panel start", () => {
    const inp = input();
    const greedy = constructive(inp, [guillotineVariants()[0]], [0], Infinity);
    const out: Solution = poolSearch({ ...inp, deadline: 50 }, greedy, guillotineVariants()[0]);
    expect(out.bins.length).toBe(2);
    for (const b of out.bins) expectSound(ctx, b.placed.map((p) => p.t), b.placed);
    const placed = new Int32Array(4);
    for (const b of out.bins) for (const p of b.placed) placed[p.t]++;
    expect(Array.from(placed)).toEqual([1, 1, 3, 1]);
  });
});
