// Checks against published values in ../shared/benchmarks (read at run time; skipped when absent).
import { existsSync, readFileSync } from "node:fs";
import path from "node:path";
import { describe, expect, it } from "vitest";
import { areaBound, dffBound } from "~/lib/packing/bounds";
import { pack } from "~/lib/packing/engine";
import { validatePlan } from "~/lib/packing/validate";
import { fakeClock, instanceJob } from "./packing-helpers";

const dir = process.env.STOPWISE_BENCHMARKS ?? path.resolve(__dirname, "../../../shared/benchmarks");
const present = existsSync(dir);
if (!present) console.log(`packing-benchmarks: skipped, ${dir} not found (set STOPWISE_BENCHMARKS)`);

interface Instance {
  id: string;
  bin: { width: number; height: number };
  items: { width: number; height: number; demand: number }[];
  lower_bounds: Record<string, number>;
  best_known: Record<string, { bins: number | null; lower_bound: number }>;
}

const cache = new Map<string, Instance[]>();
function instance(file: string, id: string): Instance {
  if (!cache.has(file)) cache.set(file, JSON.parse(readFileSync(path.join(dir, file), "utf8")).instances);
  const inst = cache.get(file)!.find((i) => i.id === id);
  if (!inst) throw new Error(`${id} not in ${file}`);
  return inst;
}


const boundItems = (inst: Instance) =>
  inst.items.map((it) => ({ count: it.demand, orients: [[it.width, it.height], [it.height, it.width]] as [number, number][] }));

describe.skipIf(!present)("published benchmark values (../shared/benchmarks, variant 2BP|R|G)", () => {
  // [file, instance id, best-known bins for 2BP|R|G as published in that file]
  const reach: [string, string, number][] = [
    ["class_bw_mv.json", "cl01_020_01", 7],
    ["class_bw_mv.json", "cl02_020_01", 1],
    ["class_bw_mv.json", "cl03_020_01", 5],
    ["class_bw_mv.json", "cl09_020_01", 19],
    ["class_bw_mv.json", "cl04_040_01", 1],
    ["class_bw_mv.json", "cl06_020_02", 1],
  ];
  for (const [file, id, bins] of reach) {
    it(`reaches the best-known ${bins} bin(s) on ${id} (${file})`, () => {
      const inst = instance(file, id);
      expect(inst.best_known["2BP|R|G"].bins).toBe(bins);
      const job = instanceJob(inst, 300);
      const plan = pack(job, { now: fakeClock(0.005) });
      expect(validatePlan(job, plan)).toEqual({ ok: true, errors: [] });
      expect(plan.unplaced).toEqual([]);
      expect(plan.metrics.sheets).toBe(bins);
      expect(plan.metrics.lowerBound).toBeLessThanOrEqual(bins);
    });
  }

  it("area lower bound of cl01_020_01 (class_bw_mv.json): item area 648 in 10 × 10 bins → ceil(6.48) = 7", () => {
    const inst = instance("class_bw_mv.json", "cl01_020_01");
    const area = inst.items.reduce((a, it) => a + it.width * it.height * it.demand, 0);
    expect(area).toBe(648);
    expect(areaBound(boundItems(inst), [{ W: 10, H: 10 }])).toBe(7);
    expect(inst.lower_bounds.area).toBe(7);
  });

  it("area lower bound of cl09_020_01 (class_bw_mv.json): item area 111 282 in 100 × 100 bins → 12; the DFF bound gives the optimum 19", () => {
    const inst = instance("class_bw_mv.json", "cl09_020_01");
    const area = inst.items.reduce((a, it) => a + it.width * it.height * it.demand, 0);
    expect(area).toBe(111_282);
    expect(areaBound(boundItems(inst), [{ W: 100, H: 100 }])).toBe(12);
    expect(inst.lower_bounds.area).toBe(12);
    expect(dffBound(boundItems(inst), { W: 100, H: 100 })).toBe(19);
    expect(inst.lower_bounds.dff_rotation).toBe(19);
  });

  it("our DFF bound never exceeds the published best lower bound on the class instances (class_bw_mv.json)", () => {
    if (!cache.has("class_bw_mv.json")) instance("class_bw_mv.json", "cl01_020_01");
    for (const inst of cache.get("class_bw_mv.json")!) {
      const lb = dffBound(boundItems(inst), { W: inst.bin.width, H: inst.bin.height });
      const best = inst.best_known["2BP|R|G"];
      expect(lb, inst.id).toBeLessThanOrEqual(best.bins ?? Infinity);
      expect(lb, inst.id).toBeGreaterThanOrEqual(inst.lower_bounds.area);
    }
  });
});
