// The catalogue's forms and the bill-of-parts grid: one set of rules, used by the browser for instant
// red cells and by the server, which decides.
import * as v from "valibot";
import { lengthSchema, mm, readLength, type LengthLimits } from "./length-fields";
import { parseMoney } from "./money";
import type { DisplayUnit } from "./units";

export const MATERIAL_KINDS = ["plywood", "mdf", "acrylic", "hardwood", "other"] as const;
export type MaterialKind = (typeof MATERIAL_KINDS)[number];
export const MATERIAL_KIND_LABELS: Record<MaterialKind, string> = { plywood: "Plywood", mdf: "MDF", acrylic: "Acrylic", hardwood: "Hardwood", other: "Other" };

export const GRAINS = ["length", "none"] as const;
export const GRAIN_LABELS: Record<(typeof GRAINS)[number], string> = { length: "Lengthwise", none: "None" };

export const PROCESSES = ["saw", "laser"] as const;
export type Process = (typeof PROCESSES)[number];
export const PROCESS_LABELS: Record<Process, string> = { saw: "Sawn", laser: "Laser-cut" };

const THICKNESS: LengthLimits = { min: mm(0.5), max: mm(100) };
const PANEL_SIDE: LengthLimits = { min: mm(10), max: mm(5000) };
export const PART_SIDE: LengthLimits = { min: mm(1), max: mm(5000) };

const text = (label: string, max: number) =>
  v.pipe(v.string(`Enter the ${label}.`), v.trim(), v.nonEmpty(`Enter the ${label}.`), v.maxLength(max, `Keep the ${label} under ${max} characters.`));
const optionalText = (max: number) => v.pipe(v.optional(v.string(), ""), v.trim(), v.maxLength(max, `Keep it under ${max} characters.`));

/** A whole number typed into a form, within limits. */
export function wholeNumber(label: string, min: number, max: number) {
  return v.pipe(
    v.union([v.string(), v.number()], `Enter the ${label}.`),
    v.transform((x) => (typeof x === "number" ? x : x.trim() === "" ? NaN : Number(x.trim()))),
    v.check((n) => Number.isInteger(n), `Enter the ${label} as a whole number.`),
    v.check((n) => n >= min && n <= max, `The ${label} must be between ${min} and ${max}.`),
  );
}

export function moneySchema(currency: string, label = "price") {
  return v.pipe(
    v.string(`Enter the ${label}.`),
    v.rawTransform(({ dataset, addIssue, NEVER }) => {
      const minor = parseMoney(dataset.value, currency);
      if (minor === null) {
        addIssue({ message: dataset.value.trim() === "" ? `Enter the ${label}.` : `Enter the ${label} as an amount in ${currency}, such as 12.50.` });
        return NEVER;
      }
      return minor;
    }),
  );
}

export const materialSchema = (unit: DisplayUnit, previousThicknessUm?: number) =>
  v.object({
    name: text("name", 80),
    kind: v.picklist(MATERIAL_KINDS, "Choose a kind."),
    thickness: lengthSchema(unit, THICKNESS, previousThicknessUm === undefined ? undefined : { um: previousThicknessUm, unit }),
    note: optionalText(200),
  });

export const panelSchema = (unit: DisplayUnit, currency: string, previous?: { lengthUm: number; widthUm: number }) =>
  v.object({
    length: lengthSchema(unit, PANEL_SIDE, previous && { um: previous.lengthUm, unit }),
    width: lengthSchema(unit, PANEL_SIDE, previous && { um: previous.widthUm, unit }),
    cost: moneySchema(currency, "cost"),
    onHand: wholeNumber("count on hand", 0, 100_000),
    grain: v.picklist(GRAINS, "Choose the grain."),
  });

export const productSchema = (currency: string) =>
  v.object({
    name: text("name", 120),
    price: moneySchema(currency),
    leadTime: v.pipe(
      v.optional(v.string(), ""),
      v.trim(),
      v.rawTransform(({ dataset, addIssue, NEVER }) => {
        if (dataset.value === "") return null;
        const days = v.safeParse(wholeNumber("lead time in days", 0, 365), dataset.value);
        if (days.success) return days.output;
        addIssue({ message: days.issues[0].message });
        return NEVER;
      }),
    ),
  });

// ---- the bill of parts ----

/** One grid row as typed: lengths stay text until they are read. `id` is the stored part it came from. */
export type PartRow = {
  key: string;
  id?: string;
  name: string;
  length: string;
  width: string;
  materialId: string;
  quantity: number | string | null;
  grainLocked: boolean;
  process: Process;
};

export type PartInput = { name: string; lengthUm: number; widthUm: number; materialId: string; quantity: number; grainLocked: boolean; process: Process };
export type PartField = "name" | "length" | "width" | "materialId" | "quantity" | "grainLocked" | "process";
export type RowErrors = Record<string, Partial<Record<PartField, string>>>;

export type PartContext = {
  unit: DisplayUnit;
  materialIds: readonly string[];
  laserBed: { lengthUm: number; widthUm: number };
  /** The stored sizes of parts being edited, by part id: text left as shown keeps them exactly. */
  previous?: Record<string, { lengthUm: number; widthUm: number }>;
};

export const MAX_PARTS = 200;

/** Checks every cell of every row; the errors are keyed by row key and field. */
export function validatePartRows(input: unknown, ctx: PartContext): { ok: true; parts: PartInput[] } | { ok: false; rowErrors: RowErrors; formError?: string } {
  if (!Array.isArray(input)) return { ok: false, rowErrors: {}, formError: "The parts did not arrive; reload the page and try again." };
  if (input.length === 0) return { ok: false, rowErrors: {}, formError: "Add at least one part." };
  if (input.length > MAX_PARTS) return { ok: false, rowErrors: {}, formError: `A product has at most ${MAX_PARTS} parts.` };
  const rowErrors: RowErrors = {};
  const parts: PartInput[] = [];
  input.forEach((raw, index) => {
    const row = (raw && typeof raw === "object" ? raw : {}) as Partial<PartRow>;
    const key = typeof row.key === "string" && row.key ? row.key : `row-${index}`;
    const { errors, part } = validatePartRow(row, ctx);
    if (part) parts.push(part);
    else rowErrors[key] = errors;
  });
  return Object.keys(rowErrors).length ? { ok: false, rowErrors } : { ok: true, parts };
}

function validatePartRow(row: Partial<PartRow>, ctx: PartContext): { errors: Partial<Record<PartField, string>>; part?: PartInput } {
  const errors: Partial<Record<PartField, string>> = {};
  const previous = typeof row.id === "string" ? ctx.previous?.[row.id] : undefined;

  const name = typeof row.name === "string" ? row.name.trim() : "";
  if (!name) errors.name = "Name the part.";
  else if (name.length > 80) errors.name = "Keep the name under 80 characters.";

  const length = readLength(String(row.length ?? ""), ctx.unit, PART_SIDE, previous && { um: previous.lengthUm, unit: ctx.unit });
  if (!length.ok) errors.length = length.error;
  const width = readLength(String(row.width ?? ""), ctx.unit, PART_SIDE, previous && { um: previous.widthUm, unit: ctx.unit });
  if (!width.ok) errors.width = width.error;

  const materialId = typeof row.materialId === "string" ? row.materialId : "";
  if (!ctx.materialIds.includes(materialId)) errors.materialId = "Choose one of the shop's materials.";

  const quantity = v.safeParse(wholeNumber("quantity", 1, 999), row.quantity ?? "");
  if (!quantity.success) errors.quantity = quantity.issues[0].message;

  const process = row.process;
  if (process !== "saw" && process !== "laser") errors.process = "Choose sawn or laser-cut.";
  else if (process === "laser" && length.ok && width.ok && !fitsBed(length.um, width.um, ctx.laserBed)) {
    errors.process = "Larger than the laser bed: saw it, or change the bed size in shop settings.";
  }
  if (typeof row.grainLocked !== "boolean") errors.grainLocked = "Tick or untick grain locked.";

  if (Object.keys(errors).length || !length.ok || !width.ok || !quantity.success) return { errors };
  return {
    errors,
    part: { name, lengthUm: length.um, widthUm: width.um, materialId, quantity: quantity.output, grainLocked: row.grainLocked as boolean, process: process as Process },
  };
}

function fitsBed(lengthUm: number, widthUm: number, bed: { lengthUm: number; widthUm: number }) {
  return (lengthUm <= bed.lengthUm && widthUm <= bed.widthUm) || (lengthUm <= bed.widthUm && widthUm <= bed.lengthUm);
}

/** Reads the grid's JSON from the hidden input; anything unreadable becomes "not a list". */
export function parsePartsJson(value: FormDataEntryValue | null): unknown {
  if (typeof value !== "string") return null;
  try {
    return JSON.parse(value);
  } catch {
    return null;
  }
}

/** The product form as typed, and what its action answers. */
export type ProductValues = { name: string; price: string; leadTime: string; parts: PartRow[] };
export type ProductResult = {
  ok: boolean;
  notice: string | null;
  errors: Record<string, string>;
  rowErrors: RowErrors;
  values: ProductValues | null;
  stamp: string;
};

export const PART_FIELD_LABELS: Record<PartField, string> = {
  name: "Part",
  length: "Length",
  width: "Width",
  materialId: "Material",
  quantity: "Qty",
  grainLocked: "Grain locked",
  process: "Process",
};
