import { useEffect, useState } from "react";
import { Bar, CartesianGrid, ComposedChart, Legend, Line, ResponsiveContainer, Tooltip, XAxis, YAxis } from "recharts";
import type { TrendMonth } from "~/lib/ledger-trend";
import { formatMoney } from "~/lib/money";

/** Yield and scrap cost per month, every month of the twelve. Drawn in the browser only: a chart needs its box's width. */
export function LedgerChart({ trend, currency }: { trend: TrendMonth[]; currency: string }) {
  const [mounted, setMounted] = useState(false);
  useEffect(() => setMounted(true), []);
  const data = trend.map((p) => ({ month: p.month, yieldPercent: p.yield === null ? null : Math.round(p.yield * 1000) / 10, scrapCost: p.scrapCostMinor }));
  if (trend.every((p) => p.batches === 0)) return <p className="text-muted">No batches cut in the last twelve months.</p>;
  return (
    <div className="h-72 w-full" role="img" aria-label={`Yield and scrap cost per month: ${data.map((d) => `${d.month} ${d.yieldPercent === null ? "no batches" : `${d.yieldPercent} %`}`).join(", ")}`}>
      {mounted && (
        <ResponsiveContainer width="100%" height="100%">
          <ComposedChart data={data} margin={{ top: 8, right: 8, bottom: 8, left: 8 }}>
            <CartesianGrid stroke="#ddd5c6" strokeDasharray="3 3" />
            <XAxis dataKey="month" stroke="#5d6470" fontSize={12} />
            <YAxis yAxisId="yield" domain={[0, 100]} unit=" %" stroke="#2f6b4f" fontSize={12} />
            <YAxis yAxisId="cost" orientation="right" stroke="#b8561d" fontSize={12} width={80} tickFormatter={(minor) => formatMoney(Number(minor), currency)} />
            <Tooltip itemStyle={{ color: "#1f2329" }} formatter={(value, name) => (name === "Scrap cost" ? formatMoney(Number(value), currency) : value == null ? "no batches" : `${value} %`)} />
            {/* Legend text in ink: the bar's pale fill is unreadable as text. */}
            <Legend formatter={(value) => <span style={{ color: "#1f2329" }}>{value}</span>} />
            <Bar yAxisId="cost" dataKey="scrapCost" name="Scrap cost" fill="#f6e3d4" stroke="#b8561d" maxBarSize={48} isAnimationActive={false} />
            <Line yAxisId="yield" dataKey="yieldPercent" name="Yield" stroke="#2f6b4f" strokeWidth={2} dot isAnimationActive={false} />
          </ComposedChart>
        </ResponsiveContainer>
      )}
    </div>
  );
}
