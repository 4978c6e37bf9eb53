// Turning cut batches into the bookkeeper's report: a period, rows per material, totals, CSV.
import Papa from "papaparse";
import { addDays, formatDate, isIsoDate, monthTitle } from "./dates";
import { areaHundredths, hundredthsDecimal } from "./ledger";

/** from inclusive, to exclusive; month: "2026-11" when the period is a calendar month, else null */
export type Period = { from: string; to: string; label: string; month: string | null };

/** ?month=2026-11 or ?from=2026-11-01&to=2026-11-30 (inclusive); default: the month before `today` (or its own month). */
export function parsePeriod(params: URLSearchParams, today: string, fallback: "previous" | "current" = "previous"): Period {
  const month = params.get("month");
  const from = params.get("from");
  const to = params.get("to");
  if (from && to && isIsoDate(from) && isIsoDate(to) && from <= to) return { from, to: addDays(to, 1), label: `${from} to ${to}`, month: null };
  const chosen = month && /^\d{4}-(0[1-9]|1[0-2])$/.test(month) ? month : fallback === "current" ? today.slice(0, 7) : previousMonth(today);
  const [y, m] = chosen.split("-").map(Number);
  const next = m === 12 ? `${y + 1}-01` : `${y}-${String(m + 1).padStart(2, "0")}`;
  return { from: `${chosen}-01`, to: `${next}-01`, label: chosen, month: chosen };
}

/** The period as people read it: "November 2026", or "Sun, 1 Nov 2026 to Mon, 30 Nov 2026", one day alone (the label stays ISO for files). */
export function periodTitle(period: Period): string {
  if (period.month) return monthTitle(period.month);
  const last = addDays(period.to, -1);
  return last === period.from ? formatDate(last) : `${formatDate(period.from)} to ${formatDate(last)}`;
}

export function previousMonth(today: string): string {
  const [y, m] = today.split("-").map(Number);
  return m === 1 ? `${y - 1}-12` : `${y}-${String(m - 1).padStart(2, "0")}`;
}

export type Figures = {
  batches: number;
  stockAreaMm2: number;
  partsAreaMm2: number;
  kerfLossMm2: number;
  rackedAreaMm2: number;
  scrapAreaMm2: number;
  spoiledCount: number;
  costDrawnMinor: number;
  valueReturnedMinor: number;
  scrapCostMinor: number;
  spoiledCostMinor: number;
};
type Row = Omit<Figures, "batches"> & { materialId: string; materialName: string };

const ZERO: Figures = { batches: 0, stockAreaMm2: 0, partsAreaMm2: 0, kerfLossMm2: 0, rackedAreaMm2: 0, scrapAreaMm2: 0, spoiledCount: 0, costDrawnMinor: 0, valueReturnedMinor: 0, scrapCostMinor: 0, spoiledCostMinor: 0 };

function add(a: Figures, b: Omit<Figures, "batches">): Figures {
  return {
    batches: a.batches + 1,
    stockAreaMm2: a.stockAreaMm2 + b.stockAreaMm2,
    partsAreaMm2: a.partsAreaMm2 + b.partsAreaMm2,
    kerfLossMm2: a.kerfLossMm2 + b.kerfLossMm2,
    rackedAreaMm2: a.rackedAreaMm2 + b.rackedAreaMm2,
    scrapAreaMm2: a.scrapAreaMm2 + b.scrapAreaMm2,
    spoiledCount: a.spoiledCount + b.spoiledCount,
    costDrawnMinor: a.costDrawnMinor + b.costDrawnMinor,
    valueReturnedMinor: a.valueReturnedMinor + b.valueReturnedMinor,
    scrapCostMinor: a.scrapCostMinor + b.scrapCostMinor,
    spoiledCostMinor: a.spoiledCostMinor + b.spoiledCostMinor,
  };
}

/** Rows per material and the period's totals: integer sums of the batches' own figures. */
export function summarise(batches: Row[]): { materials: (Figures & { materialId: string; materialName: string })[]; total: Figures } {
  const byMaterial = new Map<string, Figures & { materialId: string; materialName: string }>();
  let total = ZERO;
  for (const b of batches) {
    const current = byMaterial.get(b.materialId) ?? { ...ZERO, materialId: b.materialId, materialName: b.materialName };
    byMaterial.set(b.materialId, { ...add(current, b), materialId: b.materialId, materialName: b.materialName });
    total = add(total, b);
  }
  return { materials: [...byMaterial.values()].sort((a, b) => a.materialName.localeCompare(b.materialName)), total };
}

export const yieldOf = (f: { partsAreaMm2: number; stockAreaMm2: number }) => (f.stockAreaMm2 > 0 ? f.partsAreaMm2 / f.stockAreaMm2 : 0);

/** Money as a plain decimal for CSV ("52.90"), exact from minor units. */
function decimal(minor: number, digits: number): string {
  if (digits === 0) return String(minor);
  const sign = minor < 0 ? "-" : "";
  const abs = Math.abs(minor);
  return `${sign}${Math.floor(abs / 10 ** digits)}.${String(abs % 10 ** digits).padStart(digits, "0")}`;
}

const areaNumber = (mm2: number, unit: "mm" | "in") => hundredthsDecimal(areaHundredths(mm2, unit));

/** A text cell that never runs as a spreadsheet formula (OWASP ASVS 5.0 V1.2.10): formula triggers get a leading quote. */
export function spreadsheetSafe(text: string): string {
  return /^[=+\-@\t\r]/.test(text) ? `'${text}` : text;
}

/** The period's batch rows as CSV; the first lines state the currency and the area unit. */
export function ledgerCsv(rows: (Row & { batchCode: string; cutDay: string })[], period: Period, currency: string, unit: "mm" | "in", digits = 2): string {
  const areaUnit = unit === "mm" ? "m2" : "ft2";
  const body = Papa.unparse({
    fields: ["batch", "cut_on", "material", `stock_${areaUnit}`, `parts_${areaUnit}`, `kerf_${areaUnit}`, `offcuts_racked_${areaUnit}`, `scrap_${areaUnit}`, "yield_percent", "spoiled_parts", `cost_drawn_${currency}`, `value_returned_${currency}`, `net_cost_${currency}`, `scrap_cost_${currency}`, `spoiled_cost_${currency}`],
    data: rows.map((r) => [
      r.batchCode,
      r.cutDay,
      // Formula triggers are defused (OWASP ASVS 5.0 V1.2.10): a name never runs as a spreadsheet formula.
      spreadsheetSafe(r.materialName),
      areaNumber(r.stockAreaMm2, unit),
      areaNumber(r.partsAreaMm2, unit),
      areaNumber(r.kerfLossMm2, unit),
      areaNumber(r.rackedAreaMm2, unit),
      areaNumber(r.scrapAreaMm2, unit),
      (yieldOf(r) * 100).toFixed(1),
      r.spoiledCount,
      decimal(r.costDrawnMinor, digits),
      decimal(r.valueReturnedMinor, digits),
      decimal(r.costDrawnMinor - r.valueReturnedMinor, digits),
      decimal(r.scrapCostMinor, digits),
      decimal(r.spoiledCostMinor, digits),
    ]),
  });
  return `# Stopwise ledger ${period.label}; money in ${currency}; areas in ${areaUnit}\r\n${body}\r\n`;
}
