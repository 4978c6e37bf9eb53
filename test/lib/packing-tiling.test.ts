// The tiling search (tiling.ts) on hand-made tilings, through pack() and on its own.
import { existsSync, readFileSync } from "node:fs";
import path from "node:path";
import { describe, expect, it } from "vitest";
import { pack, prepare } from "~/lib/packing/engine";
import type { BinContext, Orient, Placed } from "~/lib/packing/fill";
import { mulberry32 } from "~/lib/packing/prng";
import { tileExactly, tilePanel, tileToBound } from "~/lib/packing/tiling";
import { validatePlan } from "~/lib/packing/validate";
import { fakeClock, instanceJob, job } from "./packing-helpers";

/** Cuts W × H by random guillotine cuts (at multiples of `step`, pieces at least `min`) into n pieces. */
function guillotinePieces(W: number, H: number, n: number, seed: number, step = 1, min = 1): [number, number][] {
  const rng = mulberry32(seed);
  const pieces: [number, number][] = [[W, H]];
  let guard = 0;
  while (pieces.length < n && guard++ < 10_000) {
    const i = Math.floor(rng() * pieces.length);
    const [w, h] = pieces[i];
    const alongX = rng() < w / (w + h);
    const side = alongX ? w : h;
    const cuts = Math.floor((side - 2 * min) / step);
    if (cuts < 0) continue;
    const at = min + step * Math.floor(rng() * (cuts + 1));
    if (at < min || side - at < min) continue;
    pieces.splice(i, 1, alongX ? [at, h] : [w, at], alongX ? [w - at, h] : [w, h - at]);
  }
  return pieces;
}

/** Shuffled, and every other piece turned. */
function shuffleTurn(pieces: [number, number][], seed: number): [number, number][] {
  const rng = mulberry32(seed);
  const p = pieces.map(([w, h], i): [number, number] => (i % 2 ? [h, w] : [w, h]));
  for (let i = p.length - 1; i > 0; i--) {
    const j = Math.floor(rng() * (i + 1));
    [p[i], p[j]] = [p[j], p[i]];
  }
  return p;
}

function ctxFor(W: number, H: number, parts: [number, number][]): BinContext {
  const orients: Orient[][] = parts.map(([w, h]) => {
    const os: Orient[] = [{ w, h, rot: false }];
    if (w !== h) os.push({ w: h, h: w, rot: true });
    return os.filter((o) => o.w <= W && o.h <= H);
  });
  return { W, H, orients, stripMax: Infinity };
}

/** Placements inside the panel, pairwise disjoint, in allowed orientations. */
function expectSound(ctx: BinContext, placed: Placed[]) {
  for (const p of placed) {
    expect(p.x >= 0 && p.y >= 0 && p.x + p.w <= ctx.W && p.y + p.h <= ctx.H).toBe(true);
    expect(ctx.orients[p.t].some((o) => o.w === p.w && o.h === p.h && o.rot === p.rot)).toBe(true);
  }
  for (let i = 0; i < placed.length; i++)
    for (let j = i + 1; j < placed.length; j++) {
      const a = placed[i];
      const b = placed[j];
      expect(a.x + a.w <= b.x || b.x + b.w <= a.x || a.y + a.h <= b.y || b.y + b.h <= a.y).toBe(true);
    }
}

const panelJob = (L: number, W: number, parts: [number, number][], kerf = 0) =>
  job({
    kerf,
    trim: 0,
    stages: 0,
    timeLimitMs: 400,
    stock: [{ id: "p", length: L, width: W, quantity: null, cost: 1, grain: "none", trimmed: true }],
    parts: parts.map(([l, w], i) => ({ id: `q${i}`, length: l, width: w, quantity: 1, rotate: true })),
  });

describe("tiling search", () => {
  const pieces = shuffleTurn(guillotinePieces(200, 200, 17, 3, 1, 4), 5);

  it("the hand-made instance is what it should be: 17 pieces covering 200 × 200 exactly", () => {
    expect(pieces).toHaveLength(17);
    expect(pieces.reduce((a, [w, h]) => a + w * h, 0)).toBe(40_000);
  });

  it("the exact search puts a 200 × 200 cut into 17 pieces (shuffled, some turned) back onto one panel", () => {
    const ctx = ctxFor(200, 200, pieces);
    const r = tileExactly(ctx, new Int32Array(17).fill(1));
    expect(r.status).toBe("found");
    if (r.status !== "found") return;
    expect(r.placed).toHaveLength(17);
    expect(r.waste).toBe(0);
    expectSound(ctx, r.placed);
  });

  it("pack() plans that instance on one panel, and the plan passes the validator", () => {
    const j = panelJob(200, 200, pieces);
    const plan = pack(j, { now: fakeClock(0.005) });
    expect(validatePlan(j, plan)).toEqual({ ok: true, errors: [] });
    expect(plan.unplaced).toEqual([]);
    expect(plan.metrics.sheets).toBe(1);
  });

  it("refuses a pinwheel: the parts cover 100 × 100 only without a guillotine cut, so one panel is proven impossible", () => {
    // four 60 × 40 blades around a 20 × 20 centre; no straight cut crosses such a panel, and no other
    // arrangement of these parts tiles it either
    const parts: [number, number][] = [[60, 40], [40, 60], [60, 40], [40, 60], [20, 20]];
    const ctx = ctxFor(100, 100, parts);
    expect(tileExactly(ctx, new Int32Array(5).fill(1)).status).toBe("none");
    const clock = fakeClock(0.001);
    expect(tileToBound(ctx, new Int32Array(5).fill(1), 1, clock, clock() + 100, 100_000)).toEqual({ panels: null, bound: 2 });
    const j = panelJob(100, 100, parts);
    const plan = pack(j, { now: fakeClock(0.005) });
    expect(validatePlan(j, plan)).toEqual({ ok: true, errors: [] });
    expect(plan.metrics.sheets).toBe(2);
    expect(plan.metrics.lowerBound).toBe(2);
  });

  it("kerf: parts 3.2 mm smaller than the pieces of a tiling of the kerf-grown 2440 × 1220 panel fill one panel", () => {
    // the engine packs parts grown by one kerf into the panel grown by one kerf (README "Kerf")
    const grown = guillotinePieces(24432, 12232, 12, 11, 1, 400); // tenths of a millimetre
    const parts = shuffleTurn(grown, 2).map(([w, h]): [number, number] => [(w - 32) / 10, (h - 32) / 10]);
    const j = panelJob(2440, 1220, parts, 3.2);
    const prep = prepare(j);
    const clock = fakeClock(0.001);
    const r = tileToBound(prep.slots[0].ctx, prep.demand, 1, clock, clock() + 200, 400_000);
    expect(r.panels).toHaveLength(1);
    expectSound(prep.slots[0].ctx, r.panels![0].placed);
    const plan = pack(j, { now: fakeClock(0.005) });
    expect(validatePlan(j, plan)).toEqual({ ok: true, errors: [] });
    expect(plan.metrics.sheets).toBe(1);
    // the same parts one kerf wider each no longer fit one panel
    const wider = panelJob(2440, 1220, parts.map(([l, w]) => [l + 3.2, w]), 3.2);
    expect(pack(wider, { now: fakeClock(0.005) }).metrics.sheets).toBe(2);
  });

  it("fills two panels one after the other, the waste going where it must", () => {
    // three 100 × 30 and a 100 × 10 tile one panel; four 50 × 40 and a 100 × 19 leave a 100 × 1 sliver
    const parts: [number, number][] = [[100, 30], [50, 40], [100, 30], [50, 40], [100, 10], [100, 19], [50, 40], [100, 30], [50, 40]];
    const ctx = ctxFor(100, 100, parts);
    const clock = fakeClock(0.001);
    const r = tileToBound(ctx, new Int32Array(parts.length).fill(1), 2, clock, clock() + 200, 400_000);
    expect(r.panels).toHaveLength(2);
    const all = r.panels!.flatMap((p) => p.placed.map((q) => q.t)).sort((x, y) => x - y);
    expect(all).toEqual(parts.map((_, i) => i));
    for (const p of r.panels!) expectSound(ctx, p.placed);
    const j = panelJob(100, 100, parts);
    const plan = pack(j, { now: fakeClock(0.005) });
    expect(validatePlan(j, plan)).toEqual({ ok: true, errors: [] });
    expect(plan.metrics.sheets).toBe(2);
  });

  it("the corner search respects its waste allowance", () => {
    // 3 × 100 strips fill 100 × 100 only with a 100 × 1 sliver of waste
    const parts: [number, number][] = Array.from({ length: 33 }, () => [100, 3]);
    const ctx = ctxFor(100, 100, parts);
    const avail = new Int32Array(33).fill(1);
    expect(tilePanel(ctx, avail, { maxWaste: 99 }).status).toBe("none");
    const r = tilePanel(ctx, avail, { maxWaste: 100 });
    expect(r.status === "found" && r.waste).toBe(100);
  });

  it("returns at once where the panels would keep too much waste", () => {
    const parts: [number, number][] = [[50, 50]];
    const clock = fakeClock(1);
    expect(tileToBound(ctxFor(100, 100, parts), new Int32Array([1]), 1, clock, clock() + 10, 1000)).toEqual({ panels: null, bound: 1 });
  });
});

const dir = process.env.STOPWISE_BENCHMARKS ?? path.resolve(__dirname, "../../../shared/benchmarks");
const present = existsSync(dir);

describe.skipIf(!present)("zero-waste sets (../shared/benchmarks, variant 2BP|R|G)", () => {
  type Instance = Parameters<typeof instanceJob>[0] & { id: string };
  const load = (file: string): Instance[] => JSON.parse(readFileSync(path.join(dir, file), "utf8")).instances;

  for (const id of ["c1p1", "c1p3"]) {
    it(`${id} (Hopper & Turton C, hopper_turton_c_zero_waste.json): one bin, as published`, () => {
      const inst = load("hopper_turton_c_zero_waste.json").find((i) => i.id === id)!;
      const j = instanceJob(inst, 1000);
      const plan = pack(j, { now: fakeClock(0.005) });
      expect(validatePlan(j, plan)).toEqual({ ok: true, errors: [] });
      expect(plan.metrics.sheets).toBe(1);
    });
  }

  // Hopper T is listed as guillotine by construction, but the bottom-up search exhausts its tree on
  // these: no guillotine pattern (parts turned or not) tiles 200 × 200 with their sizes, so 2 bins
  // are optimal for 2BP|R|G with the data as given
  for (const id of ["t1a", "t1b", "t1c", "t1d"]) {
    it(`${id} (Hopper T, hopper_tn_zero_waste.json): one bin proven impossible, two found`, () => {
      const inst = load("hopper_tn_zero_waste.json").find((i) => i.id === id)!;
      const j = instanceJob(inst, 1000);
      const plan = pack(j, { now: fakeClock(0.005) });
      expect(validatePlan(j, plan)).toEqual({ ok: true, errors: [] });
      expect(plan.metrics.lowerBound).toBe(2);
      expect(plan.metrics.sheets).toBe(2);
    });
  }
});
