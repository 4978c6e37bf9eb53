// Laser-cut items are nested onto blanks the size of the laser bed; the blanks then join the sawn parts.
// Every blank is the same size, so one rip and one stop setting cut every blank from the sheet.
import type { MergedPart, PartOrigin } from "./batch-parts";
import { mmToUm, pack, umToMm, type Job, type PackOptions, type Placement } from "./packing";
import { formatSize } from "./units";

export type LaserSettings = { bedLengthUm: number; bedWidthUm: number; spacingUm: number; marginUm: number };

/**
 * One item on a blank. Coordinates follow the packing plan: (xUm, yUm) is the item's lower-left corner
 * measured from the blank's lower-left corner, x along the blank's length, y along its width (upwards).
 * lengthUm / widthUm are the placed extents along x / y.
 */
export type BlankItem = {
  xUm: number;
  yUm: number;
  lengthUm: number;
  widthUm: number;
  /** true when the part's length lies along the blank's width */
  rotated: boolean;
  name: string;
  text: string | null;
  origin: PartOrigin;
};

/** index: position in the list of blanks, from 0 (show index + 1 to people). */
export type LaserBlank = { index: number; lengthUm: number; widthUm: number; items: BlankItem[] };

export type UnplacedLaserPart = { key: string; name: string; quantity: number; reason: string };

export type NestOptions = {
  seed?: number;
  timeLimitMs?: number;
  /** clock for the time budget; tests pass their own so the result cannot depend on machine speed */
  now?: PackOptions["now"];
};

const DEFAULT_TIME_LIMIT_MS = 300;
const BED_STOCK_ID = "laser-bed";

function fitsBed(part: MergedPart, usableLengthUm: number, usableWidthUm: number): boolean {
  const asGiven = part.lengthUm <= usableLengthUm && part.widthUm <= usableWidthUm;
  const turned = !part.grainLocked && part.widthUm <= usableLengthUm && part.lengthUm <= usableWidthUm;
  return asGiven || turned;
}

function tooBigReason(part: MergedPart, settings: LaserSettings, usableLengthUm: number, usableWidthUm: number): string {
  const size = formatSize(part.lengthUm, part.widthUm, "mm");
  const bed = formatSize(settings.bedLengthUm, settings.bedWidthUm, "mm");
  if (usableLengthUm <= 0 || usableWidthUm <= 0) return `the laser bed (${bed}) has no room inside its margin`;
  const usable = formatSize(usableLengthUm, usableWidthUm, "mm");
  const turnedFits = part.widthUm <= usableLengthUm && part.lengthUm <= usableWidthUm;
  if (part.grainLocked && turnedFits) {
    return `${size} with its grain locked fits the laser bed (${bed}, ${usable} inside the margin) only turned`;
  }
  return `${size} is larger than the laser bed (${bed}, ${usable} inside the margin)`;
}

/** Top row first, left to right: the order in which people read the drawing, so texts run in list order. */
function readingOrder(a: Placement, b: Placement): number {
  return b.y + b.width - (a.y + a.width) || a.x - b.x;
}

export function nestLaserParts(
  parts: MergedPart[],
  settings: LaserSettings,
  options: NestOptions = {},
): { blanks: LaserBlank[]; unplaced: UnplacedLaserPart[] } {
  const usableLengthUm = settings.bedLengthUm - 2 * settings.marginUm;
  const usableWidthUm = settings.bedWidthUm - 2 * settings.marginUm;
  const laserParts = parts.filter((part) => part.process === "laser" && part.quantity > 0);

  const unplaced: UnplacedLaserPart[] = [];
  const nestable: MergedPart[] = [];
  for (const part of laserParts) {
    if (fitsBed(part, usableLengthUm, usableWidthUm)) nestable.push(part);
    else unplaced.push({ key: part.key, name: part.name, quantity: part.quantity, reason: tooBigReason(part, settings, usableLengthUm, usableWidthUm) });
  }
  if (nestable.length === 0) return { blanks: [], unplaced };

  const job: Job = {
    kerf: umToMm(settings.spacingUm),
    trim: umToMm(settings.marginUm),
    stages: 0,
    objective: "sheets",
    timeLimitMs: options.timeLimitMs ?? DEFAULT_TIME_LIMIT_MS,
    seed: options.seed ?? 1,
    stock: [
      {
        id: BED_STOCK_ID,
        length: umToMm(settings.bedLengthUm),
        width: umToMm(settings.bedWidthUm),
        quantity: null,
        cost: 0,
        // On grain-free stock the engine may turn any part, so lock the grain only when a part needs it.
        grain: nestable.some((part) => part.grainLocked) ? "length" : "none",
        trimmed: true,
      },
    ],
    parts: nestable.map((part, i) => ({
      id: String(i),
      length: umToMm(part.lengthUm),
      width: umToMm(part.widthUm),
      quantity: part.quantity,
      rotate: !part.grainLocked,
    })),
  };
  const plan = pack(job, { now: options.now });

  const sortedSheets = plan.sheets.map((sheet) => [...sheet.placements].sort(readingOrder));
  const nextOrigin = nestable.map(() => 0);
  const blanks: LaserBlank[] = sortedSheets.map((placements, index) => ({
    index,
    lengthUm: settings.bedLengthUm,
    widthUm: settings.bedWidthUm,
    items: placements.map((placement) => {
      const partIndex = Number(placement.partId);
      const part = nestable[partIndex];
      const origin = part.origins[nextOrigin[partIndex]++];
      return {
        xUm: mmToUm(placement.x),
        yUm: mmToUm(placement.y),
        lengthUm: mmToUm(placement.length),
        widthUm: mmToUm(placement.width),
        rotated: placement.rotated,
        name: part.name,
        text: origin.text,
        origin,
      };
    }),
  }));

  for (const left of plan.unplaced) {
    const part = nestable[Number(left.partId)];
    unplaced.push({ key: part.key, name: part.name, quantity: left.quantity, reason: left.reason });
  }
  return { blanks, unplaced };
}

// ---------------------------------------------------------------------------------------------------
// SVG of one blank, true size in millimetres, for the laser's software.

const HAIRLINE_MM = 0.1;
/** Rough advance of one character of a sans-serif face, in ems; enough to keep a text inside its item. */
const CHAR_ADVANCE_EM = 0.6;
const MAX_FONT_MM = 12;
const LINE_HEIGHT_EM = 1.2;
/** below this a one-line text is hard to read once engraved, so a name of several words wraps */
const WRAP_BELOW_MM = 6;

/** Escapes XML's special characters and drops control characters XML 1.0 cannot carry; keeps all other Unicode. */
export function escapeXml(text: string): string {
  return text
    // eslint-disable-next-line no-control-regex
    .replace(/[\u0000-\u0008\u000B\u000C\u000E-\u001F\uFFFE\uFFFF]/g, "")
    .replace(/&/g, "&amp;")
    .replace(/</g, "&lt;")
    .replace(/>/g, "&gt;")
    .replace(/"/g, "&quot;")
    .replace(/'/g, "&apos;");
}

/** Micrometres to an SVG number in millimetres, exact to the micrometre. */
function mm(um: number): string {
  return String(umToMm(um));
}

function round2(value: number): string {
  return String(Math.round(value * 100) / 100);
}

/** The font size (mm) at which `lines` fit a box along `alongMm` and across `acrossMm`, with some air. */
function fittingFontMm(lines: string[], alongMm: number, acrossMm: number): number {
  const chars = Math.max(1, ...lines.map((line) => [...line].length));
  // One line may take half the item's depth; a block of lines three quarters of it.
  const byDepth = lines.length === 1 ? 0.5 * acrossMm : (0.75 * acrossMm) / (1 + (lines.length - 1) * LINE_HEIGHT_EM);
  return Math.min(MAX_FONT_MM, (0.85 * alongMm) / (chars * CHAR_ADVANCE_EM), byDepth);
}

/** A text of several words over two lines, split where the longer line is shortest; null for one word. */
function splitInTwo(text: string): string[] | null {
  const words = text.split(/\s+/).filter(Boolean);
  let best: string[] | null = null;
  const longest = (lines: string[]) => Math.max(...lines.map((line) => [...line].length));
  for (let i = 1; i < words.length; i++) {
    const pair = [words.slice(0, i).join(" "), words.slice(i).join(" ")];
    if (!best || longest(pair) < longest(best)) best = pair;
  }
  return best;
}

/** One line, or two when a long name would engrave too small on one line and much larger on two. */
function labelLayout(label: string, alongMm: number, acrossMm: number): { lines: string[]; font: number } {
  const single = { lines: [label], font: fittingFontMm([label], alongMm, acrossMm) };
  const pair = splitInTwo(label);
  if (!pair) return single;
  const double = { lines: pair, font: fittingFontMm(pair, alongMm, acrossMm) };
  return single.font < WRAP_BELOW_MM && double.font > single.font * 1.25 ? double : single;
}

/**
 * A standalone SVG 1.1 document of one blank at true size (1 user unit = 1 mm).
 * Convention: the SVG's y axis runs downward, the plan's y upward from the blank's lower edge, so an item
 * at plan (x, y) with extent (l, w) is drawn at SVG (x, W − y − w): the drawing looks like the plan.
 * No border rectangle is drawn (the blank's edge is sawn, not lasered): one <rect> per item.
 */
export function blankSvg(blank: LaserBlank, title: string): string {
  const lengthMm = mm(blank.lengthUm);
  const widthMm = mm(blank.widthUm);
  const items = blank.items.map((item) => {
    const x = item.xUm;
    const y = blank.widthUm - item.yUm - item.widthUm;
    const label = item.text ?? item.name;
    const lengthItemMm = umToMm(item.lengthUm);
    const widthItemMm = umToMm(item.widthUm);
    // Run the text along the item's longer side so it can be as large as possible.
    const upright = widthItemMm > lengthItemMm;
    const { lines, font } = upright ? labelLayout(label, widthItemMm, lengthItemMm) : labelLayout(label, lengthItemMm, widthItemMm);
    const cx = umToMm(x + item.lengthUm / 2);
    const cy = umToMm(y + item.widthUm / 2);
    // A baseline about 0.35 em below the centre puts the text's middle at the centre without relying on
    // dominant-baseline, which some laser software ignores.
    const turn = upright ? ` transform="rotate(-90 ${round2(cx)} ${round2(cy)})"` : "";
    const firstBaseline = cy - ((lines.length - 1) * font * LINE_HEIGHT_EM) / 2 + 0.35 * font;
    const content =
      lines.length === 1
        ? escapeXml(label)
        : lines.map((line, i) => `<tspan x="${round2(cx)}" dy="${i === 0 ? 0 : round2(font * LINE_HEIGHT_EM)}">${escapeXml(line)}</tspan>`).join("");
    return [
      `  <g>`,
      `    <rect x="${mm(x)}" y="${mm(y)}" width="${mm(item.lengthUm)}" height="${mm(item.widthUm)}" fill="none" stroke="#000000" stroke-width="${HAIRLINE_MM}"/>`,
      `    <text x="${round2(cx)}" y="${round2(firstBaseline)}" font-family="sans-serif" font-size="${round2(font)}" text-anchor="middle" fill="#000000"${turn}>${content}</text>`,
      `  </g>`,
    ].join("\n");
  });
  return [
    `<?xml version="1.0" encoding="UTF-8" standalone="yes"?>`,
    `<svg xmlns="http://www.w3.org/2000/svg" version="1.1" width="${lengthMm}mm" height="${widthMm}mm" viewBox="0 0 ${lengthMm} ${widthMm}">`,
    `  <title>${escapeXml(title)}</title>`,
    ...items,
    `</svg>`,
    ``,
  ].join("\n");
}
