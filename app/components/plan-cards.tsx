import { Form, Link } from "react-router";
import { formatMoney } from "~/lib/money";
import { stockDrawn } from "~/lib/stock-names";
import type { DisplayUnit } from "~/lib/units";
import type { PlanSummary } from "~/models/plans.server";

const STATUS = { queued: "Waiting for a runner", running: "Searching", done: "Finished", failed: "Failed", cancelled: "Cancelled" } as const;
const percent = (permille: number | null) => (permille === null ? "—" : `${(permille / 10).toFixed(1)} %`);
const area = (mm2: number | null, unit: "mm" | "in") => (mm2 === null ? "—" : unit === "mm" ? `${(mm2 / 1e6).toFixed(2)} m²` : `${(mm2 / 92_903.04).toFixed(1)} ft²`);
// Panels counted apart: a plan that opens two racked offcuts and a small sheet must not read as "3 panels",
// and each sheet shows its size, so a half-sheet never reads as a full one.
const panelsOf = (p: PlanSummary) => (p.sheets === null ? null : p.sheets - (p.offcutsUsed ?? 0));
const drawn = (p: PlanSummary, unit: DisplayUnit, offcuts = p.offcutsUsed ?? 0) => (p.sheets === null || p.sheetSizes === null ? "—" : stockDrawn(p.sheetSizes, offcuts, unit));
// What the stock costs less what the offcuts it leaves are worth back on the rack (the ledger's rule).
const netCost = (p: PlanSummary) => (p.costMinor === null || p.rackCreditMinor === null ? null : p.costMinor - p.rackCreditMinor);
const STAGES = { 0: "any cuts", 2: "rip then crosscut", 3: "breakdown, rip, crosscut" } as const;

/** One plan of a batch: live progress while it runs, its figures when it is done. */
export function PlanCard({ plan, batchId, currency, unit, canWrite, chosen }: { plan: PlanSummary; batchId: string; currency: string; unit: DisplayUnit; canWrite: boolean; chosen: boolean }) {
  const active = plan.status === "queued" || plan.status === "running";
  return (
    <article className={`h-full space-y-3 rounded-lg border bg-card p-4 ${chosen ? "border-edge" : "border-line"}`} data-plan={plan.number} aria-busy={active}>
      <header className="flex items-baseline justify-between gap-2">
        <h3 className="font-semibold">
          Plan {plan.number} {chosen && <span className="text-sm font-normal text-edge">(released)</span>}
        </h3>
        <span className={`text-sm font-medium ${plan.status === "failed" ? "text-bad" : plan.status === "done" ? "text-ok" : "text-muted"}`} data-status={plan.status}>
          {STATUS[plan.status]}
        </span>
      </header>
      <p className="text-sm text-muted">
        Kerf {plan.settings.kerfMm} mm · trim {plan.settings.trimMm} mm · {STAGES[plan.settings.stages]} · {plan.settings.objective === "sheets" ? "fewest sheets" : "fewest settings"} · {plan.settings.timeLimitMs / 1000} s
      </p>
      {active && (
        <p className="tabular-nums" role="status">
          {((plan.progress?.elapsedMs ?? 0) / 1000).toFixed(1)} s of {plan.settings.timeLimitMs / 1000} s · best so far: {plan.progress?.bestSheets ?? "—"} panel{plan.progress?.bestSheets === 1 ? "" : "s"}
        </p>
      )}
      {plan.status === "done" && (
        <dl className="grid grid-cols-2 gap-x-4 gap-y-1 text-sm sm:grid-cols-3">
          <Figure label="Stock" value={drawn(plan, unit)} wide />
          <Figure label="Yield" value={percent(plan.yieldPermille)} />
          <Figure label="Cost" value={plan.costMinor === null ? "—" : formatMoney(plan.costMinor, currency)} />
          <Figure label="Net of offcuts" value={netCost(plan) === null ? "—" : formatMoney(netCost(plan)!, currency)} />
          <Figure label="Settings" value={plan.setups} />
        </dl>
      )}
      {plan.status === "done" && (plan.offcutsUsed ?? 0) > 0 && (
        <p className="text-sm text-muted" data-testid="offcut-reason">
          Offcuts first: the rack is used before new stock whenever that takes no extra sheet, so this plan cuts {plan.offcutsUsed === 1 ? "a racked offcut" : `${plan.offcutsUsed} racked offcuts`}.
        </p>
      )}
      {plan.error && <p className={`text-sm ${plan.status === "failed" ? "text-bad" : "text-warn"}`}>{plan.error}</p>}
      <div className="flex flex-wrap gap-2">
        {plan.status === "done" && (
          <Link to={`/batches/${batchId}/plans/${plan.id}`} className="inline-flex min-h-11 items-center rounded-md border border-line bg-white px-4 font-medium hover:border-edge">
            View panels
          </Link>
        )}
        {canWrite && active && (
          <Form method="post">
            <input type="hidden" name="intent" value="cancel-plan" />
            <input type="hidden" name="planId" value={plan.id} />
            <button type="submit" className="min-h-11 rounded-md border border-bad/40 px-4 font-medium text-bad hover:bg-bad-soft">
              Cancel
            </button>
          </Form>
        )}
        {canWrite && plan.status === "done" && (
          <Form method="post">
            <input type="hidden" name="intent" value="release" />
            <input type="hidden" name="planId" value={plan.id} />
            <button type="submit" className="min-h-11 rounded-md bg-edge px-4 font-semibold text-white hover:bg-edge-dark">
              Release to the saw
            </button>
          </Form>
        )}
      </div>
    </article>
  );
}

function Figure({ label, value, wide = false }: { label: string; value: React.ReactNode; wide?: boolean }) {
  return (
    <div className={wide ? "col-span-2" : undefined}>
      <dt className="text-muted">{label}</dt>
      <dd className="text-lg font-semibold tabular-nums">{value ?? "—"}</dd>
    </div>
  );
}

/** Two finished plans side by side: sheets, racked offcuts, yield, cost, settings, offcuts made. */
export function PlanCompare({ a, b, currency, unit }: { a: PlanSummary; b: PlanSummary; currency: string; unit: DisplayUnit }) {
  const rows: [string, (p: PlanSummary) => string | number | null, (p: PlanSummary) => number | null][] = [
    ["Sheets", (p) => drawn(p, unit, 0), (p) => panelsOf(p)],
    ["Racked offcuts used", (p) => p.offcutsUsed ?? "—", () => null], // neither more nor fewer is better by itself
    ["Yield", (p) => percent(p.yieldPermille), (p) => (p.yieldPermille === null ? null : -p.yieldPermille)],
    ["Cost", (p) => (p.costMinor === null ? "—" : formatMoney(p.costMinor, currency)), (p) => p.costMinor],
    ["Net of offcuts racked", (p) => (netCost(p) === null ? "—" : formatMoney(netCost(p)!, currency)), netCost],
    ["Fence and stop settings", (p) => p.setups, (p) => p.setups],
    ["Offcuts to rack", (p) => area(p.offcutAreaMm2, unit), (p) => (p.offcutAreaMm2 === null ? null : -p.offcutAreaMm2)],
  ];
  return (
    <table className="w-full text-left text-sm" data-testid="plan-compare">
      <thead>
        <tr className="border-b border-line text-muted">
          <th className="py-2" />
          <th className="py-2">Plan {a.number}</th>
          <th className="py-2">Plan {b.number}</th>
        </tr>
      </thead>
      <tbody className="divide-y divide-line">
        {rows.map(([label, show, rank]) => {
          const [ra, rb] = [rank(a), rank(b)];
          const better = (mine: number | null, other: number | null) => mine !== null && other !== null && mine < other;
          return (
            <tr key={label}>
              <th className="py-2 font-medium">{label}</th>
              <td className={`py-2 tabular-nums ${better(ra, rb) ? "font-semibold text-ok" : ""}`}>{show(a)}</td>
              <td className={`py-2 tabular-nums ${better(rb, ra) ? "font-semibold text-ok" : ""}`}>{show(b)}</td>
            </tr>
          );
        })}
      </tbody>
    </table>
  );
}
