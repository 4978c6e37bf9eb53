// How screens name the stock a plan draws: sheets from the catalogue and racked offcuts, apart.

const plural = (n: number, one: string, many: string) => `${n} ${n === 1 ? one : many}`;

/** "1 sheet · 2 offcuts": the stock panels and the racked offcuts a plan opens, counted apart. */
export function stockCount(panels: number, offcuts: number): string {
  const sheets = plural(panels, "sheet", "sheets");
  return offcuts > 0 ? `${sheets} · ${plural(offcuts, "offcut", "offcuts")}` : sheets;
}

