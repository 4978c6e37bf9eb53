// The pure rules of the catalogue and settings forms (app/lib/catalogue.ts, length-fields.ts, shop-settings.ts).
import * as v from "valibot";
import { describe, expect, it } from "vitest";
import { validatePartRows, type PartContext, type PartRow } from "~/lib/catalogue";
import { lengthInputValue, readLength } from "~/lib/length-fields";
import { formatArea, readArea, settingsFormValues, settingsSchema, type SettingsValues } from "~/lib/shop-settings";

const ctx: PartContext = { unit: "mm", materialIds: ["birch"], laserBed: { lengthUm: 600_000, widthUm: 400_000 } };
const row = (changes: Partial<PartRow> = {}): PartRow => ({ key: "a", name: "Face", length: "600", width: "400", materialId: "birch", quantity: 1, grainLocked: false, process: "saw", ...changes });

describe("part rows", () => {
  it("reads a good row into micrometres", () => {
    expect(validatePartRows([row({ length: '23 5/8"', quantity: "3" })], ctx)).toEqual({
      ok: true,
      parts: [{ name: "Face", lengthUm: 600_075, widthUm: 400_000, materialId: "birch", quantity: 3, grainLocked: false, process: "saw" }],
    });
  });

  it("keys every bad cell by row key and field", () => {
    const result = validatePartRows([row(), row({ key: "b", name: " ", width: "-4", materialId: "oak", quantity: 0, process: "plasma" as never, grainLocked: "yes" as never })], ctx);
    expect(result).toEqual({
      ok: false,
      rowErrors: {
        b: {
          name: "Name the part.",
          width: expect.stringContaining("a length cannot be negative"),
          materialId: "Choose one of the shop's materials.",
          quantity: "The quantity must be between 1 and 999.",
          process: "Choose sawn or laser-cut.",
          grainLocked: "Tick or untick grain locked.",
        },
      },
    });
  });

  it("a laser-cut part must fit the bed either way round", () => {
    expect(validatePartRows([row({ process: "laser", length: "400", width: "600" })], ctx).ok).toBe(true);
    const big = validatePartRows([row({ process: "laser", length: "601", width: "100" })], ctx);
    expect(big.ok === false && big.rowErrors.a.process).toMatch(/Larger than the laser bed/);
  });

  it("needs at least one row, and a list", () => {
    expect(validatePartRows([], ctx)).toEqual({ ok: false, rowErrors: {}, formError: "Add at least one part." });
    expect(validatePartRows(null, ctx)).toMatchObject({ ok: false, formError: expect.stringContaining("did not arrive") });
  });

  it("a stored size left as shown keeps its exact value in an inch shop", () => {
    const inch: PartContext = { ...ctx, unit: "in", previous: { p1: { lengthUm: 500_000, widthUm: 350_000 } } };
    const shown = row({ id: "p1", length: lengthInputValue(500_000, "in"), width: lengthInputValue(350_000, "in") });
    expect(shown.length).toBe("19-11/16 in");
    expect(validatePartRows([shown], inch)).toMatchObject({ ok: true, parts: [{ lengthUm: 500_000, widthUm: 350_000 }] });
    // Typed again by hand, the same text is an inch figure like any other.
    expect(validatePartRows([{ ...shown, id: undefined }], inch)).toMatchObject({ ok: true, parts: [{ lengthUm: 500_063 }] });
  });
});

describe("length fields", () => {
  it("checks limits and says them in the shop's unit", () => {
    const limits = { min: 100, max: 10_000 };
    expect(readLength("12", "mm", limits)).toEqual({ ok: false, error: "Must be between 0.1 mm and 10 mm." });
    expect(readLength("1", "in", limits)).toEqual({ ok: false, error: "Must be between 0.004 in (0.1 mm) and 0.394 in (10 mm)." });
    expect(readLength("", "mm", limits)).toEqual({ ok: false, error: "Enter a length." });
    expect(readLength("0", "mm", { ...limits, allowZero: true })).toEqual({ ok: true, um: 0 });
    expect(readLength("0", "mm", limits)).toEqual({ ok: false, error: "Must be more than zero." });
  });
});

describe("areas", () => {
  it("reads mm², cm², m² and in², a bare number in the shop's unit squared", () => {
    expect(readArea("40000", "mm")).toEqual({ ok: true, mm2: 40_000 });
    expect(readArea("400 cm²", "mm")).toEqual({ ok: true, mm2: 40_000 });
    expect(readArea("0.04 m2", "in")).toEqual({ ok: true, mm2: 40_000 });
    expect(readArea("62", "in")).toEqual({ ok: true, mm2: 40_000 }); // 62 × 645.16 = 39 999.92
    expect(readArea("62 sq in", "mm")).toEqual({ ok: true, mm2: 40_000 });
    expect(readArea("0", "mm").ok).toBe(false);
    expect(readArea("big", "mm").ok).toBe(false);
    expect(formatArea(40_000, "in")).toBe("62 in²");
  });
});

describe("settings schema", () => {
  const stored: SettingsValues = {
    displayUnit: "mm",
    currency: "EUR",
    timeZone: "Europe/London",
    sledToleranceUmPerM: 150,
    kerfUm: 3200,
    edgeTrimUm: 10_000,
    minOffcutShortUm: 100_000,
    minOffcutAreaMm2: 40_000,
    laserBedLengthUm: 600_000,
    laserBedWidthUm: 400_000,
    laserSpacingUm: 3000,
    ripMaxUm: 760_000,
    sledWidthMaxUm: 610_000,
    stopMinUm: 20_000,
    stopMaxUm: 1_200_000,
  };

  it("reads its own form back to the same values", () => {
    expect(v.parse(settingsSchema("mm", stored), settingsFormValues(stored))).toEqual(stored);
    const inches = { ...stored, displayUnit: "in" as const };
    expect(v.parse(settingsSchema("in", inches), settingsFormValues(inches))).toEqual(inches);
  });

  it("takes a known time zone and names the field for any other", () => {
    expect(v.parse(settingsSchema("mm", stored), { ...settingsFormValues(stored), timeZone: "America/Argentina/Buenos_Aires" }).timeZone).toBe("America/Argentina/Buenos_Aires");
    for (const bad of ["Mars/Olympus", "", "Europe/London; drop", "+01:00"]) {
      const result = v.safeParse(settingsSchema("mm", stored), { ...settingsFormValues(stored), timeZone: bad });
      expect(result.issues?.map((i) => [v.getDotPath(i), i.message])).toEqual([["timeZone", "Choose the shop's time zone from the list."]]);
    }
  });

  it("refuses a stop range that is empty or backwards", () => {
    const result = v.safeParse(settingsSchema("mm", stored), { ...settingsFormValues(stored), stopMinUm: "600", stopMaxUm: "600" });
    expect(result.success).toBe(false);
    expect(result.issues?.map((i) => [v.getDotPath(i), i.message])).toEqual([["stopMaxUm", "Must be further than the nearest stop setting."]]);
  });
});
