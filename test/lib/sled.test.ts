import { describe, expect, it } from "vitest";
import { checkStatus, fiveCut, sledWarning } from "~/lib/sled";
import { sheetLength, sheetSize } from "~/lib/setup-sheet";
import { parseLength } from "~/lib/units";

const um = (text: string) => {
  const parsed = parseLength(text, "mm");
  if (!parsed.ok) throw new Error(parsed.error);
  return parsed.um;
};
const UM_PER_INCH = 25_400; // 1 in = 25.4 mm exactly (NIST; TRADE-FACTS §5)

describe("five-cut maths", () => {
  it("matches the metric worked example (TRADE-FACTS §4, Instructables worked example 'Table Saw Sledge Accuracy Test – Five Cut Method')", () => {
    const r = fiveCut({ widthFirstEndUm: um("27.89"), widthSecondEndUm: um("29.25"), stripLengthUm: um("400"), pivotDistanceUm: um("550") });
    expect(r.taperUm).toBe(-1360);
    expect(r.errorPerCutUm).toBe(-340);
    expect(r.angleRad).toBeCloseTo(-0.00085, 12);
    expect(r.correctionUm).toBeCloseTo(-467.5, 9); // −0.4675 mm at the adjustment point
    expect(r.errorUmPerM).toBeCloseTo(-850, 9); // 0.85 mm per metre of crosscut
    expect(r.move).toBe("away-from-you");
  });

  it("matches the inch worked example (TRADE-FACTS §4, LumberJocks thread 'Question using 5th cut method')", () => {
    // Entered as the sawyer types them; stored to the micrometre, so allow the rounding of the inputs.
    const inch = (text: string) => {
      const parsed = parseLength(text, "in");
      if (!parsed.ok) throw new Error(parsed.error);
      return parsed.um;
    };
    const r = fiveCut({ widthFirstEndUm: inch('0.5395"'), widthSecondEndUm: inch("0.3075 in"), stripLengthUm: inch("9.625"), pivotDistanceUm: inch("29.5") });
    expect(r.correctionUm / UM_PER_INCH).toBeCloseTo(0.17777, 4); // 0.17777 in
    expect(Math.abs(r.correctionUm / UM_PER_INCH - 0.17777)).toBeLessThan(0.00005);
    expect(r.move).toBe("toward-you");
  });

  it("follows the shop rule: a strip 0.88 mm wider at one end over four cuts is 0.22 mm per cut (common practice, no published source)", () => {
    const r = fiveCut({ widthFirstEndUm: um("30.88"), widthSecondEndUm: um("30"), stripLengthUm: um("500"), pivotDistanceUm: um("500") });
    expect(r.errorPerCutUm).toBe(220);
    // With D = L the correction is the per-cut error itself.
    expect(r.correctionUm).toBe(220);
  });

  it("a square sled needs no move; a zero-length strip is refused", () => {
    expect(fiveCut({ widthFirstEndUm: 25_000, widthSecondEndUm: 25_000, stripLengthUm: 400_000, pivotDistanceUm: 550_000 })).toMatchObject({ taperUm: 0, correctionUm: 0, move: "none" });
    expect(() => fiveCut({ widthFirstEndUm: 1, widthSecondEndUm: 2, stripLengthUm: 0, pivotDistanceUm: 1 })).toThrow(RangeError);
  });
});

describe("when the set-up sheet warns about the sled", () => {
  const now = new Date("2026-12-01T12:00:00Z");
  const daysAgo = (d: number) => new Date(now.getTime() - d * 86_400_000);

  it("warns with no sled and with no check", () => {
    expect(sledWarning(null, 150, 600_000, now, false)).toMatchObject({ warn: true, reason: "no-sled" });
    expect(sledWarning(null, 150, 600_000, now)).toMatchObject({ warn: true, reason: "no-check" });
  });

  it("warns when the last check is older than 90 days, not at 90", () => {
    expect(sledWarning({ checkedAt: daysAgo(90), errorUmPerM: 10 }, 150, 600_000, now).warn).toBe(false);
    expect(sledWarning({ checkedAt: daysAgo(91), errorUmPerM: 10 }, 150, 600_000, now)).toMatchObject({ warn: true, reason: "stale", ageDays: 91 });
  });

  it("warns when the error over the longest crosscut exceeds tolerance × length", () => {
    // 0.15 mm/m over 600 mm allows 0.09 mm; 0.2 mm/m gives 0.12 mm there.
    const over = sledWarning({ checkedAt: daysAgo(3), errorUmPerM: -200 }, 150, 600_000, now);
    expect(over).toMatchObject({ warn: true, reason: "out-of-tolerance" });
    expect(over.errorOverLengthUm).toBeCloseTo(120, 9);
    expect(over.allowedUm).toBeCloseTo(90, 9);
    const within = sledWarning({ checkedAt: daysAgo(3), errorUmPerM: 150 }, 150, 600_000, now);
    expect(within).toMatchObject({ warn: false });
    expect(within.errorOverLengthUm).toBeCloseTo(90, 9);
  });

  it("flags a check on its own as stale or out of tolerance", () => {
    expect(checkStatus({ checkedAt: daysAgo(100), errorUmPerM: 20 }, 150, now)).toEqual({ stale: true, outOfTolerance: false, ageDays: 100 });
    expect(checkStatus({ checkedAt: daysAgo(1), errorUmPerM: -151 }, 150, now)).toEqual({ stale: false, outOfTolerance: true, ageDays: 1 });
  });
});

describe("figures on the set-up sheet", () => {
  // 1 in = 25.4 mm exactly (NIST, TRADE-FACTS §5); the rounding values are TRADE-FACTS §5's nearest 1/32.
  it("prints exact inch figures as they are", () => {
    expect(sheetLength(48 * UM_PER_INCH, "in")).toBe("48 in");
    expect(sheetLength(600_075, "in")).toBe("23-5/8 in"); // 23.625 in × 25.4
    expect(sheetLength(3_175, "in")).toBe("1/8 in");
    expect(sheetSize(48 * UM_PER_INCH, 24 * UM_PER_INCH, "in")).toBe("48 × 24 in");
  });

  it("marks rounded inch figures and gives the millimetres", () => {
    expect(sheetLength(1_220_000, "in")).toBe("≈ 48-1/32 in (1220 mm)");
    expect(sheetLength(2_440_000, "in")).toBe("≈ 96-1/16 in (2440 mm)");
    expect(sheetLength(1_250_000, "in")).toBe("≈ 49-7/32 in (1250 mm)");
    expect(sheetLength(1_525_000, "in")).toBe("≈ 60-1/32 in (1525 mm)");
    expect(sheetLength(18_000, "in")).toBe("≈ 23/32 in (18 mm)");
    expect(sheetLength(12_000, "in")).toBe("≈ 15/32 in (12 mm)");
    expect(sheetSize(1_220_000, 48 * UM_PER_INCH, "in")).toBe("≈ 48-1/32 in (1220 mm) × 48 in");
  });

  it("prints millimetres to 0.1", () => {
    expect(sheetLength(303_200, "mm")).toBe("303.2 mm");
    expect(sheetLength(1_220_000, "mm")).toBe("1220 mm");
    expect(sheetSize(2_440_000, 1_220_000, "mm")).toBe("2440 × 1220 mm");
  });
});
