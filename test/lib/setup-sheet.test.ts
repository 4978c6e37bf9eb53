import { describe, expect, it } from "vitest";
import type { Cut, Plan, SheetPlan } from "~/lib/packing/types";
import { partLabels } from "~/lib/part-labels";
import { buildSetupSheet, CAUTIONS, type SetupSheetInput } from "~/lib/setup-sheet";

const cut = (kind: Cut["kind"], axis: Cut["axis"], at: number, from: number, to: number, setting: number): Cut => ({ stage: 1, kind, axis, at, from, to, setting, trim: false });

// A 1220 × 1220 mm panel: rips at 800 (wider than a 760 mm fence), 120 and 40 mm; crosscuts of a
// 700 mm-wide piece (wider than the 610 mm sled) at 300 mm, and one at 10 mm (below the 20 mm stop).
const sheet: SheetPlan = {
  stockId: "panel:p1",
  length: 1220,
  width: 1220,
  trimmed: false,
  placements: [
    { partId: "a", x: 0, y: 0, length: 300, width: 700, rotated: false },
    { partId: "b", x: 0, y: 900, length: 10, width: 120, rotated: false },
  ],
  cuts: [cut("rip", "y", 800, 0, 1220, 800), cut("crosscut", "x", 300, 0, 700, 300), cut("rip", "y", 1023.2, 0, 1220, 120), cut("rip", "y", 1166.4, 0, 1220, 40), cut("crosscut", "x", 10, 900, 1020, 10)],
  offcuts: [{ x: 303.2, y: 0, length: 916.8, width: 700 }],
  scrap: [],
};
const plan: Plan = {
  sheets: [sheet],
  unplaced: [],
  setups: [
    { kind: "rip", setting: 800, count: 1 },
    { kind: "rip", setting: 120, count: 1 },
    { kind: "rip", setting: 40, count: 1 },
    { kind: "crosscut", setting: 300, count: 1 },
    { kind: "crosscut", setting: 10, count: 1, outsideStopRange: true },
  ],
  metrics: { sheets: 1, stockArea: 0, partsArea: 0, yield: 0, offcutArea: 0, scrapArea: 0, kerfLoss: 0, setups: 5, lowerBound: 1, elapsedMs: 0 },
};
const origin = (orderNumber: number, text: string) => ({ orderNumber, customerName: "Zoë Nguyễn", productName: "Sign", text });
const input: SetupSheetInput = {
  batch: { code: "B-0009", materialName: "Birch plywood 6 mm", thicknessUm: 6000 },
  shop: { name: "Test", displayUnit: "mm", sledToleranceUmPerM: 150, ripMaxUm: 760_000, sledWidthMaxUm: 610_000, stopMinUm: 20_000, stopMaxUm: 1_200_000 },
  plan: { number: 2, kerfMm: 3.2, plan, stockRefs: { "panel:p1": { kind: "panel", id: "p1" } } },
  parts: { a: { name: "Board", lengthUm: 300_000, widthUm: 700_000, origins: [origin(1001, "Menu")] }, b: { name: "Tab", lengthUm: 10_000, widthUm: 120_000, origins: [origin(1002, "x")] } },
  offcuts: {},
  saw: null,
  sled: { name: "Small sled", stopMinUm: 20_000, stopMaxUm: 1_000_000, widestUm: 610_000, lastCheck: null },
  now: new Date("2026-12-01T00:00:00Z"),
};

describe("set-up sheet derivation", () => {
  const sheetOut = buildSetupSheet(input);

  it("keeps the plan's set-ups, in order, with their counts", () => {
    expect(sheetOut.setups.map((s) => [s.number, s.heading, s.count])).toEqual([
      [1, "Rip · fence 800 mm", 1],
      [2, "Rip · fence 120 mm", 1],
      [3, "Rip · fence 40 mm", 1],
      [4, "Crosscut · stop 300 mm", 1],
      [5, "Crosscut · stop 10 mm", 1],
    ]);
    expect(sheetOut.setups[3].where).toBe("panel 1: cut 2");
    expect(sheetOut.setups[4].parts).toEqual([{ label: "Tab 10 × 120 mm", count: 1, orders: "#1002 Zoë Nguyễn (1)" }]);
    expect(sheetOut.setups[3].parts).toEqual([{ label: "Board 300 × 700 mm", count: 1, orders: "#1001 Zoë Nguyễn (1)" }]);
  });

  it("flags every machine limit with what to do instead", () => {
    const flags = sheetOut.setups.map((s) => s.flags.join(" "));
    expect(flags[0]).toContain("Wider than the rip fence allows (760 mm): break down on another tool");
    expect(flags[1]).toBe("");
    expect(flags[3]).toContain("wider than the sled takes (610 mm): break it down on another tool");
    expect(flags[4]).toContain("Outside the stop block's range (20 mm to 1000 mm)");
    expect(flags[4]).toContain("cut to the line");
  });

  it("asks for a push stick under 150 mm and a push block under 50 mm", () => {
    expect(sheetOut.setups[0].notes).toEqual([]);
    expect(sheetOut.setups[1].notes).toEqual(["Fence under 150 mm from the blade: use a push stick."]);
    expect(sheetOut.setups[2].notes).toEqual(["Fence under 50 mm from the blade: use a push block."]);
  });

  it("warns about a sled without a check, lists stock, offcuts and cautions", () => {
    expect(sheetOut.warning).toContain("no squareness check on record");
    expect(sheetOut.pull).toEqual(["1 × stock panel 1220 × 1220 mm — panel 1"]);
    expect(sheetOut.offcutsToRack).toEqual(["916.8 × 700 mm — from panel 1"]);
    expect(sheetOut.cautions).toBe(CAUTIONS);
    expect(sheetOut.saw).toBe("Saw: none chosen in the plan settings.");
  });

  it("a reprint of a batch already cut tells how the sled stood that day, not what to do before cutting", () => {
    const reprint = buildSetupSheet({ ...input, batch: { ...input.batch, cutOn: "10 Nov 2026" } });
    expect(reprint.subtitle).toMatch(/· cut 10 Nov 2026, shown as it stood that day$/);
    expect(reprint.warning).toBe("The sled had no squareness check on record when this batch was cut.");
    expect(sheetOut.subtitle).not.toContain("cut 10 Nov");
    // A check 20 days before the cut, square to 0.010 mm over a 500 mm strip: no warning, its age told from the cut.
    const lastCheck = { checkedAt: new Date("2026-11-11T00:00:00Z"), widthFirstEndUm: 100_010, widthSecondEndUm: 100_000, stripLengthUm: 500_000, pivotDistanceUm: 600_000 };
    const checked = buildSetupSheet({ ...input, batch: { ...input.batch, cutOn: "1 Dec 2026" }, sled: { ...input.sled!, lastCheck } });
    expect(checked.warning).toBeNull();
    expect(checked.sledCheck[0]).toMatch(/^Last five-cut check 11 Nov 2026 \(20 days before the cut\)/);
    // Auckland is 13 hours ahead in November (NZDT): 23:30 UTC on the 11th is the 12th there (GNU date: Thu Nov 12 12:30 NZDT).
    const late = buildSetupSheet({ ...input, shop: { ...input.shop, timeZone: "Pacific/Auckland" }, sled: { ...input.sled!, lastCheck: { ...lastCheck, checkedAt: new Date("2026-11-11T23:30:00Z") } } });
    expect(late.sledCheck[0]).toMatch(/^Last five-cut check 12 Nov 2026 /);
    const stale = buildSetupSheet({ ...input, batch: { ...input.batch, cutOn: "1 Dec 2026" }, sled: { ...input.sled!, lastCheck: { ...lastCheck, checkedAt: new Date("2026-08-01T00:00:00Z") } } });
    expect(stale.warning).toBe("The sled's last squareness check was more than 90 days old when this batch was cut.");
  });
});

describe("part labels", () => {
  it("makes one label per copy of every part, with its order, text and size", () => {
    const o = (orderNumber: number, itemIndex: number, text: string | null) => ({ orderId: `o${orderNumber}`, orderNumber, customerName: "Zoë Nguyễn", lineId: "l", productName: "Table number", partName: "Number card", itemIndex, text });
    const labels = partLabels("B-0003", [{ key: "k", name: "Number card", lengthUm: 210_000, widthUm: 150_000, grainLocked: true, process: "saw", quantity: 3, origins: [o(1001, 0, "Zoë"), o(1001, 1, "Nguyễn Thảo"), o(1002, 0, null)] }], "mm");
    expect(labels).toEqual([
      { orderId: "o1001", heading: "#1001 · Zoë Nguyễn", part: "Number card · 210 × 150 mm", text: "Zoë", product: "Table number", batch: "B-0003" },
      { orderId: "o1001", heading: "#1001 · Zoë Nguyễn", part: "Number card · 210 × 150 mm", text: "Nguyễn Thảo", product: "Table number", batch: "B-0003" },
      { orderId: "o1002", heading: "#1002 · Zoë Nguyễn", part: "Number card · 210 × 150 mm", text: null, product: "Table number", batch: "B-0003" },
    ]);
  });
});
