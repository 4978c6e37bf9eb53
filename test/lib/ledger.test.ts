import { describe, expect, it } from "vitest";
import fc from "fast-check";
import { areaHundredths, batchLedger, formatArea, splitByWeight } from "~/lib/ledger";
import { parsePeriod, periodTitle } from "~/lib/ledger-report";

describe("a hand-worked batch", () => {
  // Two full sheets of 2440 × 1220 mm at £52.90 and one racked offcut of 1000 × 500 mm drawn.
  // Cheapest price per area of the material: 5290 p / (2440 × 1220 mm²) = 5290 / 2,976,800 p per mm².
  const rate = 5290 / 2_976_800;
  const ledger = batchLedger({
    sheets: [
      { kind: "panel", lengthUm: 2_440_000, widthUm: 1_220_000, costMinor: 5290, partsAreaMm2: 2_500_000 },
      { kind: "panel", lengthUm: 2_440_000, widthUm: 1_220_000, costMinor: 5290, partsAreaMm2: 1_800_000 },
      // the offcut drawn: 500,000 mm² × rate = 888.5 p, rounded when the plan was made
      { kind: "offcut", lengthUm: 1_000_000, widthUm: 500_000, costMinor: 889, partsAreaMm2: 400_000 },
    ],
    kerfLossMm2: 60_000,
    racked: [{ lengthUm: 800_000, widthUm: 400_000 }], // 320,000 mm² back on the rack
    ratePerMm2: rate,
    spoiled: [{ lengthUm: 210_000, widthUm: 150_000 }], // one table number: 31,500 mm²
    orders: [
      { orderId: "a", orderNumber: 1001, partsAreaMm2: 3_000_000 },
      { orderId: "b", orderNumber: 1002, partsAreaMm2: 1_700_000 },
    ],
  });

  it("adds the areas up step by step", () => {
    // stock: 2 × 2,976,800 + 500,000 = 6,453,600 mm²
    expect(ledger.stockAreaMm2).toBe(6_453_600);
    expect(ledger.offcutDrawnAreaMm2).toBe(500_000);
    // parts: 2,500,000 + 1,800,000 + 400,000 = 4,700,000 mm²
    expect(ledger.partsAreaMm2).toBe(4_700_000);
    expect(ledger.rackedAreaMm2).toBe(320_000);
    // waste: 6,453,600 − 4,700,000 − 320,000 = 1,433,600 mm², of which kerf 60,000 → scrap 1,373,600
    expect(ledger.scrapAreaMm2).toBe(1_373_600);
    // yield: 4,700,000 / 6,453,600 = 0.72828…
    expect(ledger.yield).toBeCloseTo(0.72828, 5);
  });

  it("costs it exactly in pence", () => {
    // drawn: 5290 + 5290 + 889 = 11,469 p
    expect(ledger.costDrawnMinor).toBe(11_469);
    // returned: 320,000 × 5290 / 2,976,800 = 568.66 → 569 p
    expect(ledger.valueReturnedMinor).toBe(569);
    // net: 11,469 − 569 = 10,900 p; scrap share 10,900 × 1,433,600 / 6,133,600 = 2547.67 → 2548 p
    expect(ledger.netCostMinor).toBe(10_900);
    expect(ledger.scrapCostMinor).toBe(2548);
    // parts cost 10,900 − 2548 = 8352; spoiled share 8352 × 31,500 / 4,700,000 = 55.98 → 56 p
    expect(ledger.spoiledCostMinor).toBe(56);
  });

  it("allocates the net cost to orders by parts area, summing to the penny", () => {
    // 10,900 × 3,000,000 / 4,700,000 = 6957.45; × 1,700,000 / 4,700,000 = 3942.55 → 6957 + 3943
    expect(ledger.allocations.map((a) => a.costMinor)).toEqual([6957, 3943]);
    expect(ledger.allocations.reduce((a, b) => a + b.costMinor, 0)).toBe(ledger.netCostMinor);
  });
});

describe("splitByWeight", () => {
  it("always sums to the whole, never goes negative, and follows the weights", () => {
    fc.assert(
      fc.property(fc.integer({ min: 0, max: 10_000_000 }), fc.array(fc.integer({ min: 0, max: 5_000_000 }), { minLength: 1, maxLength: 40 }), (total, weights) => {
        const parts = splitByWeight(total, weights);
        expect(parts.reduce((a, b) => a + b, 0)).toBe(total);
        const sum = weights.reduce((a, b) => a + b, 0);
        parts.forEach((p, i) => {
          expect(p).toBeGreaterThanOrEqual(0);
          if (sum > 0) expect(Math.abs(p - (total * weights[i]) / sum)).toBeLessThan(1);
        });
      }),
    );
  });
});

describe("the ledger's one rounding rule (screen and CSV)", () => {
  it("rounds each area to hundredths half up, and a figure of several areas is the sum of them as shown", () => {
    expect(areaHundredths(1_794_900, "mm")).toBe(179); // 1.7949 m²
    expect(areaHundredths(14_900, "mm")).toBe(1); // 0.0149 m²
    expect(areaHundredths(5_000, "mm")).toBe(1); // 0.005 m², half up
    expect(areaHundredths(4_999, "mm")).toBe(0);
    expect(areaHundredths(92_903, "in")).toBe(100); // 92,903.04 mm² is 1 ft²
    expect(formatArea(1_794_900, "mm")).toBe("1.79 m²");
    // Scrap 1.7949 m² and kerf 0.0149 m²: "1.80", as 1.79 + 0.01 in the CSV, not 1.81 from the exact sum.
    expect(formatArea([1_794_900, 14_900], "mm")).toBe("1.80 m²");
    expect(formatArea(1_794_900 + 14_900, "mm")).toBe("1.81 m²");
    expect(formatArea(0, "in")).toBe("0.00 ft²");
  });

  it("a combined figure always equals its parts' shown values added, for any areas", () => {
    fc.assert(
      fc.property(fc.array(fc.integer({ min: 0, max: 50_000_000 }), { minLength: 1, maxLength: 4 }), fc.constantFrom("mm" as const, "in" as const), (areas, unit) => {
        const parts = areas.map((a) => Number(formatArea(a, unit).split(" ")[0]) * 100);
        expect(Math.round(Number(formatArea(areas, unit).split(" ")[0]) * 100)).toBe(Math.round(parts.reduce((s, p) => s + p, 0)));
      }),
    );
  });
});

describe("the period's title, as the ledger's headings show it", () => {
  // Month names and weekdays checked against GNU date: `date -d 2026-11-01 "+%B %Y"` is November 2026,
  // 3 and 10 Nov 2026 are Tuesdays, 31 Dec 2026 a Thursday.
  it("names a month in words, a range by its first and last days and one day alone, while the label stays ISO", () => {
    const month = parsePeriod(new URLSearchParams({ month: "2026-11" }), "2026-12-02");
    expect(periodTitle(month)).toBe("November 2026");
    expect(month.label).toBe("2026-11");
    expect(periodTitle(parsePeriod(new URLSearchParams({ month: "2026-12" }), "2027-01-05"))).toBe("December 2026");
    const range = parsePeriod(new URLSearchParams({ from: "2026-11-03", to: "2026-11-10" }), "2026-12-02");
    expect(periodTitle(range)).toBe("Tue, 3 Nov 2026 to Tue, 10 Nov 2026");
    expect(periodTitle(parsePeriod(new URLSearchParams({ from: "2026-12-31", to: "2026-12-31" }), "2027-01-02"))).toBe("Thu, 31 Dec 2026");
  });
});
