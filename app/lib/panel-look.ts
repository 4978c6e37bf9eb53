// One look for a panel on screen (components/panel-drawing.tsx, from the app.css tokens) and on the
// printed set-up sheet (pdf/setup-sheet.server.ts): the edge-trim band, the panel inside it, and scrap
// as a pale red ground with diagonal hatching, so the sawyer reads paper and tablet alike.
import type { SheetPlan } from "./packing/types";

export const PANEL_LOOK = {
  /** --color-line at half strength: the edge-trim band */
  trimBand: "#ddd5c6",
  trimBandOpacity: 0.5,
  /** --color-card: the usable panel */
  inside: "#fffdf9",
  /** --color-bad-soft ground, --color-bad lines at half strength, at 45° ("/" going up to the right) */
  scrapGround: "#f8dede",
  scrapLine: "#a12a2a",
  scrapLineOpacity: 0.5,
  /** line width as a share of the distance between hatch lines */
  scrapLineShare: 0.12 / 0.7,
} as const;

/** The edge trim of a trimmed panel, read off the plan: nothing lies inside it. */
export function inferTrim(sheet: SheetPlan): number {
  if (!sheet.trimmed) return 0;
  const starts: number[] = [];
  for (const r of [...sheet.placements, ...sheet.offcuts, ...sheet.scrap]) starts.push(r.x, r.y);
  for (const cut of sheet.cuts) starts.push(cut.from);
  const least = starts.length ? Math.min(...starts) : 0;
  return least > 0 && least < Math.min(sheet.length, sheet.width) / 2 ? least : 0;
}
