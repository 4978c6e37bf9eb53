// pack(job): lays the parts of a job onto its stock and returns a validated plan.
import { areaBound, bigItemBound, dffBound, type BoundItem } from "./bounds";
import { COMPLETE_MAX_PER_PANEL, completeSearch } from "./complete";
import { ExactFit } from "./exact";
import type { BinContext, FillParams, GuillotineParams, Orient, Placed } from "./fill";
import { goalDrivenGuillotine } from "./goal";
import { layoutPanel, type RectUm } from "./layout";
import { fullestConstructive, poolSearch, poolSearchApplies } from "./pool";
import { mulberry32 } from "./prng";
import {
  basicKey,
  type Bin,
  constructive,
  downsize,
  fullSheets,
  lexLess,
  ORDER_COUNT,
  ruinAndRecreate,
  type SearchInput,
  type Solution,
  type StockSlot,
} from "./search";
import { deriveSetups } from "./setups";
import { tileToBound } from "./tiling";
import type { Job, PackOptions, Plan, Rect, SheetPlan, Unplaced } from "./types";
import { mmToUm, um2ToMm2, umToMm } from "./units";
import { validatePlan } from "./validate";

export const DEFAULT_MIN_OFFCUT = { shortSide: 100, area: 40_000 };

export function guillotineVariants(): FillParams[] {
  const v: FillParams[] = [];
  for (let rc = 0; rc < 4; rc++) for (let sp = 0; sp < 6; sp++) v.push({ kind: "guillotine", rectChoice: rc, split: sp, driver: "item" });
  for (const rc of [0, 1, 3]) for (let sp = 0; sp < 6; sp++) v.push({ kind: "guillotine", rectChoice: rc, split: sp, driver: "rect" });
  return v;
}

/** knapsack-filled columns (stages 0): both axes, four column widths, two completions */
export function columnVariants(): FillParams[] {
  const v: FillParams[] = [];
  for (const orient of [0, 1] as const)
    for (let pick = 0; pick < 4; pick++)
      for (const rc of [0, 1]) v.push({ kind: "guillotine", rectChoice: rc, split: 2, driver: "column", orient, pick });
  return v;
}

/** share of the parts (by count) above which the column filler joins the search */
const LONG_THIN_SHARE = 0.7;
/** exact fills (exact.ts, pool.ts) where long thin parts average at most this many per panel at the lower bound */
const FEW_PARTS_PER_PANEL = 6;
/** node limit of each panel's fullest fill in the exact start */
const FULLEST_NODES = 200;
/** stages-0 jobs of at most this many parts on one kind of panel get the complete search, for this share of the budget */
const COMPLETE_MAX_PARTS = 40;
const COMPLETE_SHARE = 0.3;
/** the tiling search (tiling.ts): its share of the budget and its node limit */
const TILING_SHARE = 0.25;
const TILING_NODES = 400_000;
/** it runs where the bound's panels hold at least this many parts each on average (a few big parts per panel are the exact fills' domain) */
const TILING_MIN_PER_PANEL = 10;

/** Share of the parts that are long and thin on some panel: longer than half of it one way, at most half the other way. */
function longThinShare(prep: Prepared): number {
  let all = 0;
  let thin = 0;
  prep.demand.forEach((n, t) => {
    all += n;
    const isThin = prep.slots.some(({ ctx }) =>
      ctx.orients[t].some((o) => (o.w * 2 > ctx.W && o.h * 2 <= ctx.H) || (o.h * 2 > ctx.H && o.w * 2 <= ctx.W)),
    );
    if (isThin) thin += n;
  });
  return all > 0 ? thin / all : 0;
}

export function stagedVariants(stages: 2 | 3): FillParams[] {
  const v: FillParams[] = [];
  for (const homogeneous of [false, true])
    for (let opener = 0; opener < 3; opener++)
      for (const sectionByOpener of stages === 3 ? [true, false] : [false])
        v.push({ kind: "staged", stages, opener, sectionByOpener, homogeneous });
  return v;
}

export interface Prepared {
  job: Job;
  kerf: number;
  slots: StockSlot[];
  trimOf: number[];
  usable: { L: number; W: number }[];
  typePart: number[];
  demand: Int32Array;
  unplaced: Unplaced[];
  lowerBoundItems: BoundItem[];
}

export function prepare(job: Job): Prepared {
  const kerf = mmToUm(job.kerf);
  const trim = mmToUm(job.trim);
  const staged = job.stages !== 0;
  const lim = job.limits ?? {};
  const stripLimits = [lim.ripMax, lim.sledWidthMax].filter((v): v is number => typeof v === "number");
  const stripMaxReal = staged && stripLimits.length ? mmToUm(Math.min(...stripLimits)) : Infinity;
  const parts = job.parts.filter((p) => p.quantity > 0);
  const typePart = parts.map((p) => job.parts.indexOf(p));
  const usable = job.stock.map((s) => {
    const t = s.trimmed ? trim : 0;
    return { L: mmToUm(s.length) - 2 * t, W: mmToUm(s.width) - 2 * t };
  });
  const trimOf = job.stock.map((s) => (s.trimmed ? trim : 0));
  const reasonNoLimit: boolean[] = parts.map(() => false);
  const slots: StockSlot[] = job.stock.map((s, si) => {
    const { L, W } = usable[si];
    const orients: Orient[][] = parts.map((p, ti) => {
      if (L <= 0 || W <= 0) return [];
      const l = mmToUm(p.length);
      const w = mmToUm(p.width);
      const opts: Orient[] = [{ w: l + kerf, h: w + kerf, rot: false }];
      if (l !== w && (p.rotate || s.grain === "none")) opts.push({ w: w + kerf, h: l + kerf, rot: true });
      const fit = opts.filter((o) => o.w <= L + kerf && o.h <= W + kerf);
      if (fit.length) reasonNoLimit[ti] = true;
      return fit.filter((o) => o.h - kerf <= stripMaxReal);
    });
    const ctx: BinContext = { W: L + kerf, H: W + kerf, orients, stripMax: stripMaxReal === Infinity ? Infinity : stripMaxReal + kerf };
    return {
      ctx,
      quantity: s.quantity === null ? Infinity : s.quantity,
      cost: s.cost,
      offcut: !s.trimmed,
      area: (L + kerf) * (W + kerf),
    };
  });
  const unplaced: Unplaced[] = [];
  const demand = new Int32Array(parts.length);
  parts.forEach((p, ti) => {
    const fits = slots.some((s) => s.ctx.orients[ti].length > 0);
    if (fits) {
      demand[ti] = p.quantity;
      return;
    }
    let reason: string;
    if (reasonNoLimit[ti]) {
      reason = `wider than the machine limits allow in every orientation (strips at most ${umToMm(stripMaxReal)} mm: ripMax/sledWidthMax)`;
    } else if (!p.rotate && job.stock.some((s, si) => {
      const { L, W } = usable[si];
      return mmToUm(p.width) <= L && mmToUm(p.length) <= W;
    })) {
      reason = "fits no panel with its length along the grain (grain locked, rotate: false)";
    } else {
      reason = "fits no panel in either allowed orientation";
    }
    unplaced.push({ partId: p.id, quantity: p.quantity, reason });
  });
  const lowerBoundItems: BoundItem[] = parts.map((p, ti) => {
    // orientations allowed on some panel (union), for a bound valid on every panel
    const set = new Map<string, [number, number]>();
    for (const s of slots) for (const o of s.ctx.orients[ti]) set.set(`${o.w}x${o.h}`, [o.w, o.h]);
    return { count: demand[ti], orients: [...set.values()] };
  });
  return { job, kerf, slots, trimOf, usable, typePart, demand, unplaced, lowerBoundItems };
}

export function lowerBound(prep: Prepared, counts: Int32Array): number {
  const items = prep.lowerBoundItems.map((it, t) => ({ ...it, count: counts[t] })).filter((it) => it.count > 0);
  if (items.length === 0) return 0;
  const bins = prep.slots.map((s) => ({ W: s.ctx.W, H: s.ctx.H })).filter((b) => b.W > 0 && b.H > 0);
  let lb = Math.max(areaBound(items, bins), bigItemBound(items, bins));
  const sizes = new Set(bins.map((b) => `${b.W}x${b.H}`));
  if (sizes.size === 1) lb = Math.max(lb, dffBound(items, bins[0]));
  return lb;
}

/**
 * Complete search (complete.ts) from the bound up: each panel count it proves impossible raises
 * the bound; a count it can fill gives a plan on that many panels. Stops at its deadline.
 */
function provePanels(prep: Prepared, best: Solution, bound: number, stop: () => boolean, toBin: (placed: Placed[]) => Bin): { best: Solution; bound: number } {
  const slot = prep.slots[0];
  while (bound < best.bins.length && bound <= slot.quantity) {
    const r = completeSearch(slot.ctx, prep.demand, bound, stop);
    if (r.status === "unknown") break;
    if (r.status === "infeasible") {
      bound++;
      continue;
    }
    const exact = new ExactFit(slot.ctx, COMPLETE_MAX_PER_PANEL);
    return { best: { bins: r.panels.map((items) => toBin(exact.place(items)!)), left: new Int32Array(prep.demand.length) }, bound };
  }
  return { best, bound };
}

interface Built {
  plan: Plan;
  sol: Solution;
}

function buildPlan(prep: Prepared, sol: Solution, elapsed: number, lbAll: number): Plan {
  const { job, kerf } = prep;
  const minOff = job.minOffcut ?? DEFAULT_MIN_OFFCUT;
  const minShort = mmToUm(minOff.shortSide);
  const minArea = minOff.area * 1e6;
  let stockArea = 0;
  let partsArea = 0;
  let kerfArea = 0;
  let offcutArea = 0;
  const allCuts: { kind: "breakdown" | "rip" | "crosscut"; setting: number }[] = [];
  const toRect = (r: RectUm): Rect => ({ x: umToMm(r.x), y: umToMm(r.y), length: umToMm(r.w), width: umToMm(r.h) });
  const sheets: SheetPlan[] = sol.bins.map((b) => {
    const st = job.stock[b.s];
    const t = prep.trimOf[b.s];
    const { L, W } = prep.usable[b.s];
    const rects: RectUm[] = b.placed.map((p) => ({ x: t + p.x, y: t + p.y, w: p.w - kerf, h: p.h - kerf }));
    const lay = layoutPanel({ x: t, y: t, w: L, h: W }, rects, kerf, job.stages);
    stockArea += mmToUm(st.length) * mmToUm(st.width);
    for (const r of rects) partsArea += r.w * r.h;
    kerfArea += lay.kerfArea;
    const offcuts: Rect[] = [];
    const scrap: Rect[] = [];
    for (const r of lay.leftovers) {
      if (Math.min(r.w, r.h) >= minShort && r.w * r.h >= minArea) {
        offcuts.push(toRect(r));
        offcutArea += r.w * r.h;
      } else scrap.push(toRect(r));
    }
    for (const c of lay.cuts) allCuts.push({ kind: c.kind, setting: c.setting });
    return {
      stockId: st.id,
      length: st.length,
      width: st.width,
      trimmed: st.trimmed,
      placements: b.placed.map((p, i) => ({
        partId: job.parts[prep.typePart[p.t]].id,
        x: umToMm(rects[i].x),
        y: umToMm(rects[i].y),
        length: umToMm(rects[i].w),
        width: umToMm(rects[i].h),
        rotated: p.rot,
      })),
      cuts: lay.cuts.map((c) => ({
        stage: c.stage,
        kind: c.kind,
        axis: c.axis,
        at: umToMm(c.at),
        from: umToMm(c.from),
        to: umToMm(c.to),
        setting: umToMm(c.setting),
        trim: c.trim,
      })),
      offcuts,
      scrap,
    };
  });
  const unplaced = prep.unplaced.slice();
  sol.left.forEach((n, t) => {
    if (n > 0) unplaced.push({ partId: job.parts[prep.typePart[t]].id, quantity: n, reason: "not enough stock: no panel left that takes it" });
  });
  const setups = deriveSetups(allCuts, job.limits);
  const placedCounts = new Int32Array(sol.left.length);
  for (const b of sol.bins) for (let t = 0; t < placedCounts.length; t++) placedCounts[t] += b.counts[t];
  const scrapArea = stockArea - partsArea - kerfArea - offcutArea;
  return {
    sheets,
    unplaced,
    setups,
    metrics: {
      sheets: sheets.length,
      stockArea: um2ToMm2(stockArea),
      partsArea: um2ToMm2(partsArea),
      yield: stockArea > 0 ? partsArea / stockArea : 0,
      offcutArea: um2ToMm2(offcutArea),
      scrapArea: um2ToMm2(scrapArea),
      kerfLoss: um2ToMm2(kerfArea),
      setups: setups.length,
      lowerBound: placedCounts.every((n, t) => n === prep.demand[t]) ? lbAll : lowerBound(prep, placedCounts),
      elapsedMs: elapsed,
    },
  };
}

function offcutAreaUsed(sol: Solution, slots: StockSlot[]): number {
  let a = 0;
  for (const b of sol.bins) if (slots[b.s].offcut) a += slots[b.s].area;
  return a;
}

export function pack(job: Job, options: PackOptions = {}): Plan {
  const now = options.now ?? (() => performance.now());
  const t0 = now();
  const budget = Math.max(1, job.timeLimitMs);
  const deadline = t0 + budget;
  const prep = prepare(job);
  const rng = mulberry32(job.seed);
  const variants = job.stages === 0 ? guillotineVariants() : stagedVariants(job.stages);
  const lb = lowerBound(prep, prep.demand);
  // shelf-like staged patterns are guillotine patterns too: good starts for long thin parts;
  // the slow look-ahead filler only where a few panels take many parts
  const totalParts = prep.demand.reduce((a, b) => a + b, 0);
  const look: FillParams[] =
    job.stages === 0 && totalParts <= 120 && lb <= 6
      ? [0, 3].flatMap((rc) => [2, 4].map((sp): FillParams => ({ kind: "guillotine", rectChoice: rc, split: sp, driver: "look" })))
      : [];
  // rectangle-packer's GuillotineBinPack (global best fit) where the job is small enough for it
  const rp: FillParams[] =
    job.stages === 0 && totalParts <= 400
      ? [0, 1].flatMap((orient) =>
          [0, 1].flatMap((rc) => [2, 4].map((sp): FillParams => ({ kind: "guillotine", rectChoice: rc, split: sp, driver: "rp", orient: orient as 0 | 1 }))),
        )
      : [];
  // knapsack columns only where long thin parts make up most of the job (elsewhere they only cost time)
  const columns = job.stages === 0 && longThinShare(prep) >= LONG_THIN_SHARE ? columnVariants() : [];
  const buildVariants = job.stages === 0 ? [...variants, ...stagedVariants(2), ...stagedVariants(3), ...rp, ...columns, ...look] : variants;
  const dims = prep.lowerBoundItems.map((_, t) => {
    const p = job.parts[prep.typePart[t]];
    return { l: mmToUm(p.length) + prep.kerf, w: mmToUm(p.width) + prep.kerf };
  });
  const weight = new Float64Array(dims.map((d) => d.l * d.w));
  const input: SearchInput = {
    stocks: prep.slots,
    demand: prep.demand,
    weight,
    dims,
    variants,
    rng,
    now,
    deadline,
    lowerBound: lb,
    offcutsFirst: true,
    onImprove: options.onProgress && ((bins) => options.onProgress!({ bestSheets: bins })),
  };
  const allOrders = Array.from({ length: ORDER_COUNT }, (_, i) => i);
  const cands: Solution[] = [];
  const hasOffcuts = prep.slots.some((s) => s.offcut);
  // long thin parts, a few per panel (stages 0): panels filled as fully as the exact search makes
  // them give a start, and the pool search with exact repacking shares the improvement time
  const exactFills = columns.length > 0 && totalParts <= Math.max(1, lb) * FEW_PARTS_PER_PANEL;
  if (exactFills) {
    const f = fullestConstructive(input, FULLEST_NODES, variants[0], t0 + budget * 0.3);
    if (f) cands.push(f);
  }
  // the constructive passes keep their shares of the budget after that start
  const tc = now() - t0;
  const at = (share: number) => t0 + Math.max(tc, budget * share);
  cands.push(constructive(input, buildVariants, allOrders, at(0.25)));
  if (hasOffcuts) cands.push(constructive({ ...input, offcutsFirst: false }, buildVariants, allOrders, at(0.35)));
  // single-heuristic passes give plans of different character (set-ups, strip structure)
  const singles = job.objective === "setups" ? variants.length : Math.min(8, variants.length);
  for (let i = 0; i < singles && now() < at(0.45); i++) {
    const v = job.objective === "setups" ? variants[i] : variants[Math.floor((i * variants.length) / singles)];
    for (const o of job.objective === "setups" ? allOrders : [i % ORDER_COUNT]) {
      if (now() >= at(0.45)) break;
      cands.push(constructive(input, [v], [o], Infinity));
    }
  }
  let best = cands[0];
  for (const c of cands) if (lexLess(basicKey(c, prep.slots), basicKey(best, prep.slots))) best = c;
  // the exact searches below work on one kind of panel (stages 0) while the plan is above the bound
  let bound = lb;
  const aboveBound = () => job.stages === 0 && prep.slots.length === 1 && best.left.every((n) => n === 0) && best.bins.length > bound;
  const toBin = (placed: Placed[]): Bin => {
    const counts = new Int32Array(prep.demand.length);
    let load = 0;
    for (const p of placed) {
      counts[p.t]++;
      load += weight[p.t];
    }
    return { s: 0, counts, placed, load, v: variants[0] };
  };
  // a few parts: prove the panel count, or find the plan that meets the bound
  if (aboveBound() && totalParts <= COMPLETE_MAX_PARTS) {
    const stopAt = now() + budget * COMPLETE_SHARE;
    ({ best, bound } = provePanels(prep, best, lb, () => now() > stopAt, toBin));
    if (best.bins.length <= bound) cands.push(best);
    input.lowerBound = bound;
  }
  // many parts that (nearly) tile whole panels: the tiling search fills the bound's panels one by one
  if (aboveBound() && totalParts >= TILING_MIN_PER_PANEL * bound) {
    const r = tileToBound(prep.slots[0].ctx, prep.demand, bound, now, now() + budget * TILING_SHARE, TILING_NODES);
    if (r.panels) {
      best = { bins: r.panels.map(({ placed }) => toBin(placed)), left: new Int32Array(prep.demand.length) };
      cands.push(best);
    }
    bound = Math.max(bound, r.bound);
    input.lowerBound = bound;
  }
  options.onProgress?.({ bestSheets: best.bins.length });
  // improvement: leave a little time to lay out and check the plan
  const nParts = prep.demand.reduce((a, b) => a + b, 0);
  const improveEnd = t0 + budget * 0.92 - Math.min(budget * 0.3, nParts * 0.06);
  let improved: Solution;
  if (job.stages === 0) {
    // long thin parts, a few per panel: the pool search with exact repacking has the whole improvement
    // time (on classes 7 and 8 it ends 1–2 panels lower than when it shared it with the goal-driven search)
    improved =
      exactFills && poolSearchApplies(best)
        ? poolSearch({ ...input, deadline: improveEnd }, best, variants[0])
        : goalDrivenGuillotine({ ...input, deadline: improveEnd }, best, variants as GuillotineParams[], buildVariants);
  } else improved = ruinAndRecreate({ ...input, deadline: improveEnd }, best, variants);
  cands.push(improved);
  const finals = cands.map((c) => (prep.slots.length > 1 ? downsize(input, c, variants) : c));

  // lay out only the candidates that can win: the best few on sheets, more when set-ups decide
  const ranked = finals
    .map((sol) => ({ sol, k: basicKey(sol, prep.slots) }))
    .sort((a, b) => (lexLess(a.k, b.k) ? -1 : lexLess(b.k, a.k) ? 1 : 0));
  const top = ranked[0].k;
  const eligible = ranked.filter((r) =>
    job.objective === "setups" ? r.k[0] === top[0] && r.k[1] <= top[1] + 1 : r.k[0] === top[0] && r.k[1] === top[1],
  );
  const built: Built[] = [];
  for (const { sol } of eligible.slice(0, job.objective === "setups" ? 60 : 8)) {
    if (built.length > 0 && now() > t0 + budget * 0.95 - Math.min(budget * 0.2, nParts * 0.02)) break;
    try {
      built.push({ sol, plan: buildPlan(prep, sol, 0, bound) });
    } catch {
      // a layout the cut derivation rejects is never offered
    }
  }
  const minLeft = Math.min(...built.map((b) => basicKey(b.sol, prep.slots)[0]));
  const pool = built.filter((b) => basicKey(b.sol, prep.slots)[0] === minLeft);
  const minFull = Math.min(...pool.map((b) => fullSheets(b.sol, prep.slots)));
  const cost = (s: Solution) => s.bins.reduce((a, b) => a + prep.slots[b.s].cost, 0);
  const fullCost = (s: Solution) => s.bins.reduce((a, b) => a + (prep.slots[b.s].offcut ? 0 : prep.slots[b.s].cost), 0);
  const key = (b: Built): number[] =>
    job.objective === "setups"
      ? [fullSheets(b.sol, prep.slots) <= minFull + 1 ? 0 : 1, b.plan.metrics.setups, fullSheets(b.sol, prep.slots), fullCost(b.sol), cost(b.sol)]
      : [fullSheets(b.sol, prep.slots), fullCost(b.sol), -offcutAreaUsed(b.sol, prep.slots), b.plan.metrics.setups, cost(b.sol)];
  pool.sort((a, b) => {
    const ka = key(a);
    const kb = key(b);
    return lexLess(ka, kb) ? -1 : lexLess(kb, ka) ? 1 : 0;
  });
  for (const b of pool) {
    b.plan.metrics.elapsedMs = Math.round((now() - t0) * 10) / 10;
    if (validatePlan(job, b.plan).ok) return b.plan;
  }
  throw new Error("packing engine produced no plan that passes validation");
}
