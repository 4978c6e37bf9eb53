import { describe, expect, it } from "vitest";
import { fillTrend, trendMonths } from "~/lib/ledger-trend";

describe("the ledger chart's twelve months", () => {
  it("are this month and the eleven before it, oldest first, across a year's turn", () => {
    expect(trendMonths(new Date("2026-03-31T23:59:59Z"))).toEqual([
      "2025-04", "2025-05", "2025-06", "2025-07", "2025-08", "2025-09", "2025-10", "2025-11", "2025-12", "2026-01", "2026-02", "2026-03",
    ]);
    expect(trendMonths(new Date("2026-12-01T00:00:00Z"), 2)).toEqual(["2026-11", "2026-12"]);
  });

  it("keep every month: one without batches counts zero batches and zero scrap, and has no yield", () => {
    const months = trendMonths(new Date("2026-12-02T10:00:00Z"));
    const trend = fillTrend(months, [
      { month: "2026-02", batches: 1, yield: 0.5, scrapCostMinor: 120 },
      { month: "2026-12", batches: 3, yield: 0.72, scrapCostMinor: 900 },
      { month: "2025-11", batches: 9, yield: 0.9, scrapCostMinor: 1 }, // before the twelve: not drawn
    ]);
    expect(trend.map((m) => m.month)).toEqual(months);
    expect(trend[1]).toEqual({ month: "2026-02", batches: 1, yield: 0.5, scrapCostMinor: 120 });
    expect(trend[11]).toEqual({ month: "2026-12", batches: 3, yield: 0.72, scrapCostMinor: 900 });
    expect(trend.filter((m) => m.batches === 0)).toHaveLength(10);
    expect(trend[0]).toEqual({ month: "2026-01", batches: 0, yield: null, scrapCostMinor: 0 });
  });
});
