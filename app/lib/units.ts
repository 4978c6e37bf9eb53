// Lengths are stored as integer micrometres and shown in the shop's unit: millimetres to 0.1,
// or inches in fractions to the nearest 1/32 (1 in = 25.4 mm exactly, NIST; TRADE-FACTS §5).

export type DisplayUnit = "mm" | "in";

export const UM_PER_MM = 1000;
export const UM_PER_INCH = 25_400;
const UM_PER_FOOT = 12 * UM_PER_INCH;

export type ParsedLength = { ok: true; um: number } | { ok: false; error: string };

const FRACTION = String.raw`(\d+)\s*/\s*(\d+)`;
// 23, 23.5, 23 5/8, 23-5/8, 5/8
const INCH_AMOUNT = new RegExp(String.raw`^(?:(\d+(?:\.\d+)?)(?:(?:\s+|\s*-\s*)${FRACTION})?|${FRACTION})$`);

function inchAmount(text: string): number | null {
  const match = INCH_AMOUNT.exec(text.trim());
  if (!match) return null;
  const [, whole, num, den, onlyNum, onlyDen] = match;
  const fraction = (n?: string, d?: string) => {
    if (n === undefined || d === undefined) return 0;
    const denominator = Number(d);
    return denominator === 0 ? NaN : Number(n) / denominator;
  };
  const value = (whole ? Number(whole) : 0) + fraction(num ?? onlyNum, den ?? onlyDen);
  return Number.isFinite(value) ? value : null;
}

/**
 * Reads a length as people write it: `600`, `600 mm`, `60.5cm`, `23 5/8"`, `23-5/8 in`, `1' 11 5/8"`.
 * A bare number is in `defaultUnit`. Returns micrometres, or a message saying what was not understood.
 */
export function parseLength(input: string, defaultUnit: DisplayUnit = "mm"): ParsedLength {
  const text = input.trim().replace(/[″”]/g, '"').replace(/[′’]/g, "'").replace(/,/g, ".");
  if (text === "") return { ok: false, error: "is empty" };
  // Readable, just not a length: say so rather than "not a length we can read".
  if (/^-\s*\d/.test(text)) return { ok: false, error: `"${input}" is below zero; a length cannot be negative` };

  const metric = /^(\d+(?:\.\d+)?)\s*(mm|cm|m)?$/i.exec(text);
  if (metric && (metric[2] || defaultUnit === "mm")) {
    const factor = { mm: 1, cm: 10, m: 1000 }[(metric[2] ?? "mm").toLowerCase() as "mm" | "cm" | "m"];
    return positive(Math.round(Number(metric[1]) * factor * UM_PER_MM));
  }

  const feetAndInches = /^(\d+(?:\.\d+)?)\s*(?:'|ft)\s*(?:-\s*)?(.*?)\s*(?:"|in|inch|inches)?$/i.exec(text);
  if (feetAndInches) {
    const inches = feetAndInches[2] === "" ? 0 : inchAmount(feetAndInches[2]);
    if (inches === null) return { ok: false, error: `"${input}" is not a length we can read` };
    return positive(Math.round(Number(feetAndInches[1]) * UM_PER_FOOT + inches * UM_PER_INCH));
  }

  const inchMatch = /^(.*?)\s*(?:"|in|inch|inches)$/i.exec(text);
  const inchText = inchMatch ? inchMatch[1] : defaultUnit === "in" ? text : null;
  if (inchText !== null) {
    const inches = inchAmount(inchText);
    if (inches !== null) return positive(Math.round(inches * UM_PER_INCH));
  }
  return { ok: false, error: `"${input}" is not a length we can read (try 600, 600 mm or 23 5/8")` };
}

function positive(um: number): ParsedLength {
  return um > 0 ? { ok: true, um } : { ok: false, error: "must be more than zero" };
}

export type InchFigure = { whole: number; numerator: number; denominator: number; exact: boolean; errorUm: number };

/** Nearest fraction of an inch (1/32 by default, halves rounded up), reduced to lowest terms. */
export function toInchFraction(um: number, denominator = 32): InchFigure {
  const sign = um < 0 ? -1 : 1;
  const abs = Math.abs(um);
  // Integer arithmetic: steps = round(abs / (25400 / denominator)), half up.
  const steps = Math.floor((2 * abs * denominator + UM_PER_INCH) / (2 * UM_PER_INCH));
  const errorUm = sign * ((steps * UM_PER_INCH) / denominator - abs);
  let numerator = steps % denominator;
  let den = denominator;
  while (numerator > 0 && numerator % 2 === 0 && den % 2 === 0) {
    numerator /= 2;
    den /= 2;
  }
  return { whole: sign * Math.floor(steps / denominator), numerator, denominator: numerator === 0 ? 1 : den, exact: errorUm === 0, errorUm };
}

/** `600 mm`, `303.2 mm`, or `23-5/8 in`; `≈` marks an inch figure that is rounded. */
export function formatLength(um: number, unit: DisplayUnit, options: { showRounding?: boolean } = {}): string {
  if (unit === "mm") return `${formatMillimetres(um)} mm`;
  const figure = toInchFraction(um);
  const fraction = figure.numerator ? `${figure.numerator}/${figure.denominator}` : "";
  const body = figure.whole && fraction ? `${figure.whole}-${fraction}` : figure.whole ? `${figure.whole}` : fraction || "0";
  const rounded = options.showRounding !== false && !figure.exact;
  return `${rounded ? "≈ " : ""}${body} in`;
}

/** Millimetres to 0.1, without a trailing `.0`. */
export function formatMillimetres(um: number): string {
  const tenths = Math.round(um / 100);
  return tenths % 10 === 0 ? String(tenths / 10) : (tenths / 10).toFixed(1);
}

/** `600 × 400 mm` or `23-5/8 × 15-3/4 in`. */
export function formatSize(lengthUm: number, widthUm: number, unit: DisplayUnit): string {
  const l = formatLength(lengthUm, unit, { showRounding: false });
  const w = formatLength(widthUm, unit, { showRounding: false });
  return `${l.replace(/ (mm|in)$/, "")} × ${w}`;
}
