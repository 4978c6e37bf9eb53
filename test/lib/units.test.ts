import { describe, expect, it } from "vitest";
import { formatLength, parseLength, toInchFraction } from "~/lib/units";

const um = (text: string, unit: "mm" | "in" = "mm") => {
  const parsed = parseLength(text, unit);
  if (!parsed.ok) throw new Error(parsed.error);
  return parsed.um;
};

describe("parseLength", () => {
  it("reads the forms of DESIGN.md", () => {
    expect(um("600")).toBe(600_000);
    expect(um("600 mm")).toBe(600_000);
    expect(um("3.2mm")).toBe(3_200);
    expect(um("60 cm")).toBe(600_000);
    expect(um('23 5/8"')).toBe(600_075); // 23.625 in × 25.4 = 600.075 mm
    expect(um("23-5/8 in")).toBe(600_075);
    expect(um(`1' 11 5/8"`)).toBe(600_075);
    expect(um("5/8", "in")).toBe(15_875);
    expect(um("48", "in")).toBe(1_219_200);
  });

  it("says what it could not read", () => {
    expect(parseLength("")).toEqual({ ok: false, error: "is empty" });
    expect(parseLength("0 mm")).toEqual({ ok: false, error: "must be more than zero" });
    expect(parseLength("-3")).toEqual({ ok: false, error: '"-3" is below zero; a length cannot be negative' });
    expect(parseLength("- 1/8 in")).toEqual({ ok: false, error: '"- 1/8 in" is below zero; a length cannot be negative' });
    expect(parseLength("six feet").ok).toBe(false);
    expect(parseLength("5/0 in").ok).toBe(false);
    expect(parseLength("-3 mm").ok).toBe(false);
  });
});

// Check values from TRADE-FACTS.md §5 (derived from 1 in = 25.4 mm exactly, NIST / NBS 1959).
describe("inch fractions", () => {
  it("4 × 8 ft is 1219.2 × 2438.4 mm exactly", () => {
    expect(um("48 in")).toBe(1_219_200);
    expect(um(`8'`)).toBe(2_438_400);
  });

  it.each([
    [1220, 16, "48-1/16"],
    [1220, 32, "48-1/32"],
    [2440, 16, "96-1/16"],
    [1250, 16, "49-3/16"],
    [1250, 32, "49-7/32"],
    [2500, 16, "98-7/16"],
    [1525, 32, "60-1/32"],
    [18, 16, "11/16"],
    [18, 32, "23/32"],
    [12, 16, "1/2"],
    [12, 32, "15/32"],
    [3, 32, "1/8"],
  ])("%s mm to the nearest 1/%s is %s in", (mm, denominator, expected) => {
    const f = toInchFraction(mm * 1000, denominator);
    const text = f.whole && f.numerator ? `${f.whole}-${f.numerator}/${f.denominator}` : f.numerator ? `${f.numerator}/${f.denominator}` : `${f.whole}`;
    expect(text).toBe(expected);
  });

  it("shows when an inch figure is rounded", () => {
    expect(formatLength(1_219_200, "in")).toBe("48 in");
    expect(formatLength(1_220_000, "in")).toBe("≈ 48-1/32 in");
    expect(toInchFraction(18_000).errorUm).toBeCloseTo(256.25, 2); // 23/32 in = 18.256 mm
  });

  it("formats millimetres to 0.1", () => {
    expect(formatLength(600_000, "mm")).toBe("600 mm");
    expect(formatLength(303_240, "mm")).toBe("303.2 mm");
  });
});
