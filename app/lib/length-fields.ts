// Length fields of forms and grids: what a field shows for a stored length, and how typed text is
// read back against the limits of that field. Pure, so the browser checks with the server's rules.
import * as v from "valibot";
import { formatLength, formatMillimetres, parseLength, UM_PER_INCH, type DisplayUnit } from "./units";

/** The text an input shows for a stored length: "600 mm", "23-5/8 in" (no "≈": it must read back). */
export function lengthInputValue(um: number, unit: DisplayUnit): string {
  return formatLength(um, unit, { showRounding: false });
}

export type LengthLimits = { min: number; max: number; allowZero?: boolean };

function limitText(um: number, unit: DisplayUnit): string {
  if (unit === "mm") return `${formatMillimetres(um)} mm`;
  return `${Number((um / UM_PER_INCH).toFixed(3))} in (${formatMillimetres(um)} mm)`;
}

/** A stored length and the unit its field showed it in. */
export type Previous = { um: number; unit: DisplayUnit } | null | undefined;

export type ReadLength = { ok: true; um: number } | { ok: false; error: string };

/**
 * Reads a typed length (a bare number is in the shop's unit) and checks it against the field's limits.
 * Text left exactly as `lengthInputValue` showed the previous value keeps it, so a rounded inch
 * figure never drifts to the nearest 1/32 just because the form was saved again.
 */
export function readLength(text: string, unit: DisplayUnit, limits: LengthLimits, previous?: Previous): ReadLength {
  const trimmed = text.trim();
  if (previous && trimmed === lengthInputValue(previous.um, previous.unit)) return { ok: true, um: previous.um };
  if (trimmed === "") return { ok: false, error: "Enter a length." };
  if (limits.allowZero && /^0+(\.0+)?\s*(mm|cm|m|in|"|inch|inches)?$/i.test(trimmed)) return { ok: true, um: 0 };
  const parsed = parseLength(trimmed, unit);
  if (!parsed.ok) return { ok: false, error: parsed.error === "must be more than zero" ? "Must be more than zero." : capitalise(parsed.error) + "." };
  if (parsed.um < limits.min || parsed.um > limits.max) {
    return { ok: false, error: `Must be between ${limitText(limits.min, unit)} and ${limitText(limits.max, unit)}.` };
  }
  return { ok: true, um: parsed.um };
}

function capitalise(text: string) {
  return text.charAt(0).toUpperCase() + text.slice(1);
}

/** A valibot schema for one length field: string in, micrometres out, the message from `readLength`. */
export function lengthSchema(unit: DisplayUnit, limits: LengthLimits, previous?: Previous) {
  return v.pipe(
    v.string("Enter a length."),
    v.rawTransform(({ dataset, addIssue, NEVER }) => {
      const read = readLength(dataset.value, unit, limits, previous);
      if (read.ok) return read.um;
      addIssue({ message: read.error });
      return NEVER;
    }),
  );
}

export const mm = (value: number) => Math.round(value * 1000);
