// The shop settings form: which lengths a shop sets, the sane range of each, and the one schema
// that reads the form (typed lengths in the chosen unit, stored as micrometres).
import * as v from "valibot";
import { isTimeZone } from "./dates";
import { CURRENCIES } from "./money";
import { lengthInputValue, lengthSchema, mm, type LengthLimits } from "./length-fields";
import { formatLength, type DisplayUnit } from "./units";

export type LengthSetting =
  | "kerfUm"
  | "edgeTrimUm"
  | "minOffcutShortUm"
  | "laserBedLengthUm"
  | "laserBedWidthUm"
  | "laserSpacingUm"
  | "ripMaxUm"
  | "sledWidthMaxUm"
  | "stopMinUm"
  | "stopMaxUm";

export type SettingsValues = Record<LengthSetting, number> & { displayUnit: DisplayUnit; currency: string; timeZone: string; minOffcutAreaMm2: number; sledToleranceUmPerM: number };

type LengthField = { key: LengthSetting; label: string; hint: string; limits: LengthLimits };
export type SettingsGroup = { title: string; about: string; lengths: LengthField[]; area?: boolean; sledTolerance?: boolean };

export const SETTINGS_GROUPS: SettingsGroup[] = [
  {
    title: "Saw and stock",
    about: "What every layout allows for on the table saw.",
    lengths: [
      { key: "kerfUm", label: "Default kerf", hint: "The width of the saw's cut; a measured kerf per saw can replace it later.", limits: { min: mm(0.1), max: mm(10) } },
      { key: "edgeTrimUm", label: "Edge trim", hint: "Cut off each factory edge of a full sheet before use; 0 trusts the edges.", limits: { min: 0, max: mm(50), allowZero: true } },
    ],
  },
  {
    title: "Offcuts worth racking",
    about: "Smaller leftovers are scrap; these and larger go on the rack.",
    lengths: [{ key: "minOffcutShortUm", label: "Shorter side at least", hint: "The narrow side of an offcut.", limits: { min: mm(1), max: mm(2000) } }],
    area: true,
  },
  {
    title: "Laser",
    about: "Laser-cut items are nested onto blanks of the bed's size, which are then sawn like parts.",
    lengths: [
      { key: "laserBedLengthUm", label: "Laser bed length", hint: "", limits: { min: mm(50), max: mm(3000) } },
      { key: "laserBedWidthUm", label: "Laser bed width", hint: "", limits: { min: mm(50), max: mm(3000) } },
      { key: "laserSpacingUm", label: "Spacing between laser-cut items", hint: "", limits: { min: mm(0.1), max: mm(50) } },
    ],
  },
  {
    title: "Saw capacities",
    about: "What the fence, the sled and its stop block can take.",
    lengths: [
      { key: "ripMaxUm", label: "Widest rip at the fence", hint: "From the blade to the fence at its furthest.", limits: { min: mm(10), max: mm(3000) } },
      { key: "sledWidthMaxUm", label: "Widest piece on the sled", hint: "", limits: { min: mm(10), max: mm(3000) } },
      { key: "stopMinUm", label: "Stop block, nearest setting", hint: "From the blade.", limits: { min: mm(1), max: mm(5000) } },
      { key: "stopMaxUm", label: "Stop block, furthest setting", hint: "From the blade.", limits: { min: mm(1), max: mm(5000) } },
    ],
  },
  {
    title: "Sled checks",
    about: "How far out of square a crosscut sled may be, by the five-cut test, before the sled page and the set-up sheet warn.",
    lengths: [],
    sledTolerance: true,
  },
];

export const LENGTH_SETTINGS: LengthField[] = SETTINGS_GROUPS.flatMap((g) => g.lengths);

export const DISPLAY_UNITS: { value: DisplayUnit; label: string }[] = [
  { value: "mm", label: "Millimetres (600 mm)" },
  { value: "in", label: "Inches in fractions (23-5/8 in)" },
];

// 1 in² = 645.16 mm² exactly (1 in = 25.4 mm).
const MM2_PER_IN2 = 645.16;
const AREA_LIMITS_MM2 = { min: 1, max: 10_000_000 };

/** "40000", "40000 mm²", "400 cm2", "62 in²", "62 sq in" → whole mm²; a bare number is in the shop's unit squared. */
export function readArea(text: string, unit: DisplayUnit): { ok: true; mm2: number } | { ok: false; error: string } {
  const match = /^(\d+(?:[.,]\d+)?)\s*(mm²|mm2|sq\s*mm|cm²|cm2|sq\s*cm|m²|m2|in²|in2|sq\.?\s*in)?$/i.exec(text.trim());
  if (!match) return { ok: false, error: `Enter an area such as ${unit === "mm" ? "40000 mm²" : "62 in²"}.` };
  const amount = Number(match[1].replace(",", "."));
  const suffix = (match[2] ?? (unit === "mm" ? "mm2" : "in2")).toLowerCase().replace(/\s|\./g, "").replace("²", "2").replace(/^sq(.*)$/, "$12");
  const factor = { mm2: 1, cm2: 100, m2: 1_000_000, in2: MM2_PER_IN2 }[suffix] ?? 1;
  const mm2 = Math.round(amount * factor);
  if (mm2 < AREA_LIMITS_MM2.min || mm2 > AREA_LIMITS_MM2.max) return { ok: false, error: "Must be more than zero and at most 10 m²." };
  return { ok: true, mm2 };
}

// Squareness is an error per length of cut: per metre for a metric shop, per foot (0.3048 m exactly) for an inch one.
const UM_PER_IN = 25_400;
const M_PER_FT = 0.3048;
const TOLERANCE_LIMITS_UM_PER_M = { min: 10, max: 5000 };

/** "0.15", "0.15 mm/m", "0.15 mm per metre", "0.002 in/ft", "0.002 in per foot" → whole µm per metre; a bare number is in the shop's unit. */
export function readErrorRate(text: string, unit: DisplayUnit): { ok: true; umPerM: number } | { ok: false; error: string } {
  const match = /^(\d+(?:[.,]\d+)?|[.,]\d+)\s*(?:(mm)\s*(?:\/|per)\s*m(?:et(?:re|er))?|(in|inch(?:es)?|")\s*(?:\/|per)\s*(?:ft|foot))?$/i.exec(text.trim());
  if (!match) return { ok: false, error: `Enter an error per length of cut, such as ${unit === "mm" ? "0.15 mm/m" : "0.002 in/ft"}.` };
  const amount = Number(match[1].replace(",", "."));
  const inches = match[3] !== undefined || (match[2] === undefined && unit === "in");
  const umPerM = Math.round(inches ? (amount * UM_PER_IN) / M_PER_FT : amount * 1000);
  if (umPerM < TOLERANCE_LIMITS_UM_PER_M.min || umPerM > TOLERANCE_LIMITS_UM_PER_M.max) return { ok: false, error: unit === "mm" ? "Must be between 0.01 and 5 mm per metre." : "Must be between 0.00012 and 0.06 in per foot." };
  return { ok: true, umPerM };
}

/** As the form shows it: "0.150 mm/m" or "0.0018 in/ft". */
export function formatErrorRateInput(umPerM: number, unit: DisplayUnit): string {
  return unit === "mm" ? `${(umPerM / 1000).toFixed(3)} mm/m` : `${((umPerM * M_PER_FT) / UM_PER_IN).toFixed(4)} in/ft`;
}

export function formatArea(mm2: number, unit: DisplayUnit): string {
  if (unit === "mm") return `${mm2} mm²`;
  return `${Number((mm2 / MM2_PER_IN2).toFixed(1))} in²`;
}

/** The values the form shows for stored settings (and keeps when a rejected form comes back). */
export function settingsFormValues(settings: SettingsValues): Record<string, string> {
  const unit = settings.displayUnit;
  const values: Record<string, string> = {
    displayUnit: unit,
    currency: settings.currency,
    timeZone: settings.timeZone,
    minOffcutAreaMm2: formatArea(settings.minOffcutAreaMm2, unit),
    sledToleranceUmPerM: formatErrorRateInput(settings.sledToleranceUmPerM, unit),
  };
  for (const field of LENGTH_SETTINGS) values[field.key] = lengthInputValue(settings[field.key], unit);
  return values;
}

export function formatSetting(settings: SettingsValues, key: LengthSetting): string {
  return formatLength(settings[key], settings.displayUnit);
}

/**
 * The settings form's schema. Bare numbers are read in the unit chosen on the form; text left as it
 * was shown keeps the stored value exactly (see readLength).
 */
export function settingsSchema(unit: DisplayUnit, current: SettingsValues) {
  const lengths = Object.fromEntries(LENGTH_SETTINGS.map((f) => [f.key, lengthSchema(unit, f.limits, { um: current[f.key], unit: current.displayUnit })])) as Record<
    LengthSetting,
    ReturnType<typeof lengthSchema>
  >;
  const shownArea = formatArea(current.minOffcutAreaMm2, current.displayUnit);
  const shownTolerance = formatErrorRateInput(current.sledToleranceUmPerM, current.displayUnit);
  return v.pipe(
    v.object({
      displayUnit: v.picklist(["mm", "in"], "Choose millimetres or inches."),
      currency: v.picklist(Object.keys(CURRENCIES) as [string, ...string[]], "Choose one of the currencies."),
      timeZone: v.pipe(v.string("Choose the shop's time zone."), v.check(isTimeZone, "Choose the shop's time zone from the list.")),
      minOffcutAreaMm2: shownOrRead("Enter an area.", shownArea, current.minOffcutAreaMm2, (text) => {
        const read = readArea(text, unit);
        return read.ok ? read.mm2 : read;
      }),
      // The inch form is rounded to 0.0001 in, so only a changed figure is read again.
      sledToleranceUmPerM: shownOrRead("Enter a tolerance.", shownTolerance, current.sledToleranceUmPerM, (text) => {
        const read = readErrorRate(text, unit);
        return read.ok ? read.umPerM : read;
      }),
      ...lengths,
    }),
    v.forward(
      v.partialCheck([["stopMinUm"], ["stopMaxUm"]], (s) => s.stopMinUm < s.stopMaxUm, "Must be further than the nearest stop setting."),
      ["stopMaxUm"],
    ),
  );
}

/** A typed figure: left exactly as the form showed it, it keeps the stored value; otherwise it is read anew. */
function shownOrRead(missing: string, shown: string, stored: number, read: (text: string) => number | { error: string }) {
  return v.pipe(
    v.string(missing),
    v.rawTransform(({ dataset, addIssue, NEVER }) => {
      if (dataset.value.trim() === shown) return stored;
      const value = read(dataset.value);
      if (typeof value === "number") return value;
      addIssue({ message: value.error });
      return NEVER;
    }),
  );
}

/** The unit a bare number on the submitted form is in: the one chosen on it, else the stored one. */
export function formUnit(form: FormData, stored: DisplayUnit): DisplayUnit {
  const chosen = form.get("displayUnit");
  return chosen === "mm" || chosen === "in" ? chosen : stored;
}
