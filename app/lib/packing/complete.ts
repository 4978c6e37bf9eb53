// Complete search for small stages-0 jobs on one kind of panel: can the parts go onto K panels?
// Parts are taken biggest first and tried on every open panel (each distinct content once) and
// on one new panel while fewer than K are open; every panel's set is checked by the exact
// guillotine test (exact.ts). Exhausting the tree proves K panels impossible, so K + 1 is a
// lower bound; finding a leaf gives a plan on K panels. Stops (unknown) when told to.
import { ExactFit } from "./exact";
import type { BinContext } from "./fill";

export type CompleteResult =
  | { status: "feasible"; panels: number[][] }
  | { status: "infeasible" }
  | { status: "unknown" };

/** a panel that could take more parts than this (by area) makes the proof too slow to try */
export const COMPLETE_MAX_PER_PANEL = 14;

/** Most parts one panel can hold by area alone: the smallest parts, added while they fit. */
export function mostPartsByArea(areas: number[], panelArea: number): number {
  const s = areas.slice().sort((a, b) => a - b);
  let n = 0;
  let sum = 0;
  while (n < s.length && sum + s[n] <= panelArea) sum += s[n++];
  return n;
}

export function completeSearch(ctx: BinContext, demand: Int32Array, panels: number, stop: () => boolean): CompleteResult {
  const probe = new ExactFit(ctx);
  const parts: number[] = [];
  demand.forEach((n, t) => {
    for (let i = 0; i < n; i++) parts.push(t);
  });
  if (parts.some((t) => !probe.fitsAlone(t))) return { status: "infeasible" };
  const cap = ctx.W * ctx.H;
  const most = mostPartsByArea(parts.map((t) => probe.area[t]), cap);
  // the exact test must see every set a panel could hold, or "impossible" would not be a proof
  if (most > COMPLETE_MAX_PER_PANEL) return { status: "unknown" };
  const exact = new ExactFit(ctx, most);
  parts.sort((a, b) => exact.area[b] - exact.area[a] || a - b);
  const rest = new Float64Array(parts.length + 1);
  for (let i = parts.length - 1; i >= 0; i--) rest[i] = rest[i + 1] + exact.area[parts[i]];
  if (rest[0] > panels * cap) return { status: "infeasible" };

  const open: number[][] = [];
  const used: number[] = [];
  // panel index of the previous part: a part of the same type goes to that panel or a later one
  const at = new Int32Array(parts.length);
  let steps = 0;
  let stopped = false;
  const place = (i: number): boolean => {
    if (i === parts.length) return true;
    if ((++steps & 1023) === 0 && stop()) stopped = true;
    if (stopped) return false;
    let slack = (panels - open.length) * cap;
    for (const u of used) slack += cap - u;
    if (slack < rest[i]) return false;
    const t = parts[i];
    const a = exact.area[t];
    const from = i > 0 && parts[i - 1] === t ? at[i - 1] : 0;
    const seen = new Set<string>();
    for (let b = from; b < open.length; b++) {
      if (used[b] + a > cap) continue;
      const key = open[b].join(",");
      if (seen.has(key)) continue;
      seen.add(key);
      open[b].push(t);
      if (exact.fits(open[b])) {
        used[b] += a;
        at[i] = b;
        if (place(i + 1)) return true;
        used[b] -= a;
      }
      open[b].pop();
    }
    if (open.length < panels) {
      open.push([t]);
      used.push(a);
      at[i] = open.length - 1;
      if (place(i + 1)) return true;
      open.pop();
      used.pop();
    }
    return false;
  };
  if (place(0)) return { status: "feasible", panels: open.map((p) => p.slice()) };
  return stopped ? { status: "unknown" } : { status: "infeasible" };
}
