import { describe, expect, it } from "vitest";
import { sheetSizes, stockDrawn, stockName } from "~/lib/stock-names";

const sheet = { lengthUm: 2_440_000, widthUm: 1_220_000 };
const half = { lengthUm: 1_220_000, widthUm: 1_220_000 };

describe("stock names", () => {
  it("counts a plan's sheets by size, the largest first", () => {
    expect(sheetSizes([half, sheet, half, sheet, sheet])).toEqual([
      { ...sheet, count: 3 },
      { ...half, count: 2 },
    ]);
    expect(sheetSizes([])).toEqual([]);
  });

  it("says what a plan draws with each sheet's size, offcuts apart", () => {
    expect(stockDrawn([{ ...sheet, count: 1 }], 0, "mm")).toBe("1 sheet 2440 × 1220 mm");
    expect(stockDrawn([{ ...sheet, count: 2 }, { ...half, count: 1 }], 2, "mm")).toBe("2 sheets 2440 × 1220 mm, 1 sheet 1220 × 1220 mm · 2 offcuts");
    expect(stockDrawn([], 1, "mm")).toBe("no new sheet · 1 offcut");
    // 2440 mm = 96.06 in, 1220 mm = 48.03 in, to the nearest 1/32 (1 in = 25.4 mm exactly)
    expect(stockDrawn([{ ...sheet, count: 1 }], 0, "in")).toBe("1 sheet 96-1/16 × 48-1/32 in");
  });

  it("names a panel by the stock it is cut from", () => {
    expect(stockName("panel", "1220 × 1220 mm")).toBe("stock panel 1220 × 1220 mm");
    expect(stockName("offcut", "800 × 400 mm")).toBe("racked offcut 800 × 400 mm");
  });
});
