// The validator rejects hand-made bad plans and accepts sound ones.
import { describe, expect, it } from "vitest";
import { validatePlan } from "~/lib/packing/validate";
import type { Placement, Plan } from "~/lib/packing/types";
import { job } from "./packing-helpers";

function planOf(placements: Omit<Placement, "partId" | "rotated">[][], partId = "p"): Plan {
  const sheets = placements.map((ps) => ({
    stockId: "s",
    length: 100,
    width: 100,
    trimmed: true,
    placements: ps.map((p) => ({ partId, rotated: false, ...p })),
    cuts: [],
    offcuts: [],
    scrap: [],
  }));
  return {
    sheets,
    unplaced: [],
    setups: [],
    metrics: { sheets: sheets.length, stockArea: 0, partsArea: 0, yield: 0, offcutArea: 0, scrapArea: 0, kerfLoss: 0, setups: 0, lowerBound: 0, elapsedMs: 0 },
  };
}

describe("validatePlan", () => {
  it("accepts a sound grid with the kerf between parts", () => {
    const j = job({
      kerf: 3,
      stock: [{ id: "s", length: 100, width: 100, quantity: null, cost: 1, grain: "none", trimmed: true }],
      parts: [{ id: "p", length: 20, width: 30, quantity: 4, rotate: false }],
    });
    const plan = planOf([
      [
        { x: 0, y: 0, length: 20, width: 30 },
        { x: 23, y: 0, length: 20, width: 30 },
        { x: 0, y: 33, length: 20, width: 30 },
        { x: 23, y: 33, length: 20, width: 30 },
      ],
    ]);
    expect(validatePlan(j, plan)).toEqual({ ok: true, errors: [] });
  });

  it("rejects overlapping placements", () => {
    const j = job({ kerf: 0, stock: [{ id: "s", length: 100, width: 100 }], parts: [{ id: "p", length: 10, width: 10, quantity: 2 }] });
    const r = validatePlan(j, planOf([[{ x: 0, y: 0, length: 10, width: 10 }, { x: 5, y: 5, length: 10, width: 10 }]]));
    expect(r.ok).toBe(false);
    expect(r.errors.join("\n")).toMatch(/overlap/);
  });

  it("rejects parts closer than the kerf where they face each other, but not diagonal neighbours", () => {
    const j = job({ kerf: 3.2, stock: [{ id: "s", length: 100, width: 100 }], parts: [{ id: "p", length: 10, width: 10, quantity: 2 }] });
    const tooThin = validatePlan(j, planOf([[{ x: 0, y: 0, length: 10, width: 10 }, { x: 13, y: 0, length: 10, width: 10 }]]));
    expect(tooThin.ok).toBe(false);
    expect(tooThin.errors[0]).toMatch(/3 mm apart, less than the kerf/);
    const exact = validatePlan(j, planOf([[{ x: 0, y: 0, length: 10, width: 10 }, { x: 13.2, y: 0, length: 10, width: 10 }]]));
    expect(exact.ok).toBe(true);
    // separated along y by a full kerf: their x gap does not matter
    const diagonal = validatePlan(j, planOf([[{ x: 0, y: 0, length: 10, width: 10 }, { x: 11, y: 13.2, length: 10, width: 10 }]]));
    expect(diagonal.ok).toBe(true);
  });

  it("rejects a part inside the edge trim", () => {
    const j = job({ kerf: 0, trim: 10, stock: [{ id: "s", length: 100, width: 100 }], parts: [{ id: "p", length: 10, width: 10, quantity: 1 }] });
    const r = validatePlan(j, planOf([[{ x: 5, y: 20, length: 10, width: 10 }]]));
    expect(r.errors).toEqual(["sheet 1 (s), placement 1 (p): outside the trimmed panel"]);
    expect(validatePlan(j, planOf([[{ x: 80, y: 80, length: 10, width: 10 }]])).ok).toBe(true);
    expect(validatePlan(j, planOf([[{ x: 81, y: 80, length: 10, width: 10 }]])).ok).toBe(false);
  });

  it("rejects a pinwheel, which no edge-to-edge cut can separate", () => {
    // four 60 × 40 blades around a 20 × 20 centre: every straight line through the panel cuts a part
    const pin = job({
      kerf: 0,
      stock: [{ id: "s", length: 100, width: 100 }],
      parts: [
        { id: "a", length: 60, width: 40, quantity: 1, rotate: false },
        { id: "b", length: 40, width: 60, quantity: 1, rotate: false },
        { id: "c", length: 60, width: 40, quantity: 1, rotate: false },
        { id: "d", length: 40, width: 60, quantity: 1, rotate: false },
        { id: "e", length: 20, width: 20, quantity: 1, rotate: false },
      ],
    });
    const plan = planOf([[]]);
    plan.sheets[0].placements = [
      { partId: "a", x: 0, y: 0, length: 60, width: 40, rotated: false },
      { partId: "b", x: 60, y: 0, length: 40, width: 60, rotated: false },
      { partId: "c", x: 40, y: 60, length: 60, width: 40, rotated: false },
      { partId: "d", x: 0, y: 40, length: 40, width: 60, rotated: false },
      { partId: "e", x: 40, y: 40, length: 20, width: 20, rotated: false },
    ];
    const r = validatePlan(pin, plan);
    expect(r.ok).toBe(false);
    expect(r.errors).toEqual(["sheet 1 (s): no guillotine cutting exists for the placements"]);
  });

  it("rejects a layout that needs a third stage when the job allows two", () => {
    const parts = [
      { id: "low", length: 50, width: 25, quantity: 2, rotate: false },
      { id: "big", length: 50, width: 50, quantity: 1, rotate: false },
    ];
    const placements = [
      { partId: "low", x: 0, y: 0, length: 50, width: 25, rotated: false },
      { partId: "low", x: 0, y: 25, length: 50, width: 25, rotated: false },
      { partId: "big", x: 50, y: 0, length: 50, width: 50, rotated: false },
    ];
    const plan = planOf([[]]);
    plan.sheets[0].placements = placements;
    const two = validatePlan(job({ kerf: 0, stages: 2, stock: [{ id: "s", length: 100, width: 100 }], parts }), plan);
    expect(two.errors).toEqual(["sheet 1 (s): no guillotine cutting within 2 stages exists for the placements"]);
    // breakdown at x = 50, then a rip at y = 25: fine in 3 stages
    expect(validatePlan(job({ kerf: 0, stages: 3, stock: [{ id: "s", length: 100, width: 100 }], parts }), plan).ok).toBe(true);
    expect(validatePlan(job({ kerf: 0, stages: 0, stock: [{ id: "s", length: 100, width: 100 }], parts }), plan).ok).toBe(true);
  });

  it("rejects wrong counts, a grain-locked part turned, and over-used stock", () => {
    const j = job({
      kerf: 0,
      stock: [{ id: "s", length: 100, width: 100, quantity: 1, grain: "length" }],
      parts: [{ id: "p", length: 30, width: 10, quantity: 2, rotate: false }],
    });
    const plan = planOf([[{ x: 0, y: 0, length: 10, width: 30 }], []]);
    plan.sheets[0].placements[0].rotated = true;
    const r = validatePlan(j, plan);
    expect(r.errors).toEqual([
      "sheet 1 (s), placement 1 (p): grain-locked part turned across the grain",
      "stock s: 2 panels used, only 1 in stock",
      "part p: 1 placed + 0 unplaced, but 2 demanded",
    ]);
  });
});
