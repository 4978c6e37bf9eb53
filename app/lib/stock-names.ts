// How screens and printouts name the stock a plan draws, as the catalogue does: its stock panels by
// their size (a 1220 × 1220 is a panel of its own, not a "full sheet"), and racked offcuts apart.
import { countOf } from "./plural";
import { formatSize, type DisplayUnit } from "./units";

/** How many stock panels of one size a plan draws. */
export type SheetSize = { lengthUm: number; widthUm: number; count: number };

/** The stock panels a plan draws, counted by size, the largest first. */
export function sheetSizes(panels: { lengthUm: number; widthUm: number }[]): SheetSize[] {
  const bySize = new Map<string, SheetSize>();
  for (const p of panels) {
    const key = `${p.lengthUm}x${p.widthUm}`;
    const seen = bySize.get(key);
    if (seen) seen.count++;
    else bySize.set(key, { lengthUm: p.lengthUm, widthUm: p.widthUm, count: 1 });
  }
  return [...bySize.values()].sort((a, b) => b.lengthUm * b.widthUm - a.lengthUm * a.widthUm || b.lengthUm - a.lengthUm || b.widthUm - a.widthUm);
}

/**
 * "1 sheet 2440 × 1220 mm · 2 offcuts", "2 sheets 2440 × 1220 mm, 1 sheet 1220 × 1220 mm": what a
 * plan draws, with the size of each sheet, so a half-sheet never reads as a full one.
 */
export function stockDrawn(sizes: SheetSize[], offcuts: number, unit: DisplayUnit): string {
  const sheets = sizes.length ? sizes.map((s) => `${countOf(s.count, "sheet", "sheets")} ${formatSize(s.lengthUm, s.widthUm, unit)}`).join(", ") : "no new sheet";
  return offcuts > 0 ? `${sheets} · ${countOf(offcuts, "offcut", "offcuts")}` : sheets;
}

/** A panel of a plan by what it is cut from: "stock panel 1220 × 1220 mm" or "racked offcut 800 × 400 mm". */
export function stockName(kind: "panel" | "offcut" | undefined, size: string): string {
  return `${kind === "offcut" ? "racked offcut" : "stock panel"} ${size}`;
}
