// The ledger chart's months: always the month of `now` and the eleven before it (UTC, as the ledger
// groups batches), so a month without batches shows as a month without batches, not as a missing one.

export type TrendMonth = { month: string; batches: number; yield: number | null; scrapCostMinor: number };

/** "YYYY-MM" of the `count` months ending with the month of `now`, oldest first. */
export function trendMonths(now: Date, count = 12): string[] {
  return Array.from({ length: count }, (_, i) => new Date(Date.UTC(now.getUTCFullYear(), now.getUTCMonth() - (count - 1 - i), 1)).toISOString().slice(0, 7));
}

/**
 * Every month of `months`, with the figures of `rows` where it had batches. An empty month counts zero
 * batches and zero scrap cost; its yield is null, since nothing was cut to have a yield (the chart leaves
 * a gap in the line rather than a drop to 0 %).
 */
export function fillTrend(months: string[], rows: { month: string; batches: number; yield: number; scrapCostMinor: number }[]): TrendMonth[] {
  const byMonth = new Map(rows.map((r) => [r.month, r]));
  return months.map((month) => byMonth.get(month) ?? { month, batches: 0, yield: null, scrapCostMinor: 0 });
}
