// The books of a cut batch: what stock it drew, what became parts, offcuts or scrap, and what it cost.
// Areas are whole mm²; money is integer minor units, split with the largest-remainder rule so the
// parts always add up to the whole, to the cent.
//
// Rules (the bookkeeper's page states them too):
// - Stock drawn: full sheets at their price; racked offcuts at the material's cheapest full-sheet price
//   per area (the same rate values the offcuts a batch returns to the rack).
// - Net material cost = cost of the stock drawn − value of the offcuts racked.
// - Waste = stock area − parts area − racked offcut area (kerf, trim, leftovers too small to keep, and
//   offcuts the sawyer did not keep). Scrap cost = the net cost's share of waste by area.
// - Spoiled parts: their area's share of the parts' cost, shown as a line of its own.
// - An order's share of the net cost is by the area of its parts in the batch.

export type LedgerSheet = { kind: "panel" | "offcut"; lengthUm: number; widthUm: number; costMinor: number; partsAreaMm2: number };
export type LedgerInput = {
  sheets: LedgerSheet[];
  kerfLossMm2: number;
  /** offcuts the floor put on the rack, at their measured sizes */
  racked: { lengthUm: number; widthUm: number }[];
  /** material price per mm², minor units */
  ratePerMm2: number;
  spoiled: { lengthUm: number; widthUm: number }[];
  /** parts area per order in the batch */
  orders: { orderId: string; orderNumber: number; partsAreaMm2: number }[];
};

export type BatchLedger = {
  stockAreaMm2: number;
  offcutDrawnAreaMm2: number;
  partsAreaMm2: number;
  kerfLossMm2: number;
  rackedAreaMm2: number;
  scrapAreaMm2: number;
  spoiledAreaMm2: number;
  spoiledCount: number;
  costDrawnMinor: number;
  valueReturnedMinor: number;
  netCostMinor: number;
  scrapCostMinor: number;
  spoiledCostMinor: number;
  yield: number;
  allocations: { orderId: string; orderNumber: number; partsAreaMm2: number; costMinor: number }[];
};

/** The figures a batch's books keep (batch_costs columns); net cost and yield follow from them. */
export type LedgerFigures = Omit<BatchLedger, "netCostMinor" | "yield" | "allocations">;

export function ledgerFigures({ netCostMinor: _net, yield: _yield, allocations: _allocations, ...figures }: BatchLedger): LedgerFigures {
  return figures;
}

const areaMm2 = (lengthUm: number, widthUm: number) => Math.round((lengthUm * widthUm) / 1e6);

/** Splits `total` in proportion to `weights` so the parts sum to `total` exactly (largest remainder). */
export function splitByWeight(total: number, weights: number[]): number[] {
  const sum = weights.reduce((a, b) => a + b, 0);
  if (sum <= 0 || weights.length === 0) return weights.map((_, i) => (i === 0 ? total : 0));
  const exact = weights.map((w) => (total * w) / sum);
  const floors = exact.map(Math.floor);
  let left = total - floors.reduce((a, b) => a + b, 0);
  const order = exact.map((e, i) => ({ i, r: e - Math.floor(e) })).sort((a, b) => b.r - a.r || a.i - b.i);
  for (const { i } of order) {
    if (left <= 0) break;
    floors[i] += 1;
    left -= 1;
  }
  return floors;
}

/** What offcuts going back to the rack are worth, at the material's rate: never more than the stock drawn. */
export function valueReturned(costDrawnMinor: number, rackedAreaMm2: number, ratePerMm2: number): number {
  return Math.min(costDrawnMinor, Math.round(rackedAreaMm2 * ratePerMm2));
}

export function batchLedger(input: LedgerInput): BatchLedger {
  const stockAreaMm2 = input.sheets.reduce((a, s) => a + areaMm2(s.lengthUm, s.widthUm), 0);
  const offcutDrawnAreaMm2 = input.sheets.filter((s) => s.kind === "offcut").reduce((a, s) => a + areaMm2(s.lengthUm, s.widthUm), 0);
  const partsAreaMm2 = input.sheets.reduce((a, s) => a + s.partsAreaMm2, 0);
  const rackedAreaMm2 = input.racked.reduce((a, o) => a + areaMm2(o.lengthUm, o.widthUm), 0);
  const kerfLossMm2 = Math.round(input.kerfLossMm2);
  const wasteAreaMm2 = Math.max(0, stockAreaMm2 - partsAreaMm2 - rackedAreaMm2);
  const scrapAreaMm2 = Math.max(0, wasteAreaMm2 - kerfLossMm2);
  const costDrawnMinor = input.sheets.reduce((a, s) => a + s.costMinor, 0);
  const valueReturnedMinor = valueReturned(costDrawnMinor, rackedAreaMm2, input.ratePerMm2);
  const netCostMinor = costDrawnMinor - valueReturnedMinor;
  const [partsCostMinor, scrapCostMinor] = splitByWeight(netCostMinor, [partsAreaMm2, wasteAreaMm2]);
  const spoiledAreaMm2 = input.spoiled.reduce((a, p) => a + areaMm2(p.lengthUm, p.widthUm), 0);
  const spoiledCostMinor = partsAreaMm2 > 0 ? splitByWeight(partsCostMinor, [Math.min(spoiledAreaMm2, partsAreaMm2), Math.max(0, partsAreaMm2 - spoiledAreaMm2)])[0] : 0;
  const shares = splitByWeight(netCostMinor, input.orders.map((o) => o.partsAreaMm2));
  return {
    stockAreaMm2,
    offcutDrawnAreaMm2,
    partsAreaMm2,
    kerfLossMm2,
    rackedAreaMm2,
    scrapAreaMm2,
    spoiledAreaMm2,
    spoiledCount: input.spoiled.length,
    costDrawnMinor,
    valueReturnedMinor,
    netCostMinor,
    scrapCostMinor,
    spoiledCostMinor,
    yield: stockAreaMm2 > 0 ? partsAreaMm2 / stockAreaMm2 : 0,
    allocations: input.orders.map((o, i) => ({ ...o, costMinor: shares[i] })),
  };
}

// The ledger's one rounding rule, on screen and in the CSV: an area is shown in hundredths of a square
// metre or foot (1 ft = 0.3048 m exactly), rounded half up; a figure made of several areas (scrap and
// kerf) is the sum of its parts as each is shown, so it always equals the CSV's cells added up.

/** An area in whole hundredths of m² (or ft²), rounded half up. */
export function areaHundredths(mm2: number, unit: "mm" | "in"): number {
  return Math.round(mm2 / (unit === "mm" ? 10_000 : 929.0304));
}

/** Hundredths as a plain decimal, "1.80" (integer arithmetic, no float formatting). */
export function hundredthsDecimal(hundredths: number): string {
  const abs = Math.abs(hundredths);
  return `${hundredths < 0 ? "-" : ""}${Math.floor(abs / 100)}.${String(abs % 100).padStart(2, "0")}`;
}

/** Square metres or square feet, to two places, for people. Several areas: each rounded, then added. */
export function formatArea(mm2: number | number[], unit: "mm" | "in"): string {
  const hundredths = (Array.isArray(mm2) ? mm2 : [mm2]).reduce((sum, a) => sum + areaHundredths(a, unit), 0);
  return `${hundredthsDecimal(hundredths)} ${unit === "mm" ? "m²" : "ft²"}`;
}
