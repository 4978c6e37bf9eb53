// How screens and printouts name the stock a plan draws, as the catalogue does: its stock panels by
// their size (a 1220 × 1220 is a panel of its own, not a "full sheet"), and racked offcuts apart.

const plural = (n: number, one: string, many: string) => `${n} ${n === 1 ? one : many}`;

/** "1 sheet · 2 offcuts": the stock panels and the racked offcuts a plan opens, counted apart. */
export function stockCount(panels: number, offcuts: number): string {
  const sheets = plural(panels, "sheet", "sheets");
  return offcuts > 0 ? `${sheets} · ${plural(offcuts, "offcut", "offcuts")}` : sheets;
}


/** A panel of a plan by what it is cut from: "stock panel 1220 × 1220 mm" or "racked offcut 800 × 400 mm". */
export function stockName(kind: "panel" | "offcut" | undefined, size: string): string {
  return `${kind === "offcut" ? "racked offcut" : "stock panel"} ${size}`;
}
