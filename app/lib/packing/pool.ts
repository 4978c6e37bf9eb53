// Pool search with exact repacking (stages 0): empty the lightest panel into a pool, then move
// parts between the pool and the other panels, each move checked by the exact guillotine test
// (exact.ts) on the panel's whole new part set, so a panel is repacked from scratch whenever its
// contents change. Moves: put pool parts into a panel; swap one or two of a panel's parts for one
// or two pool parts when the pool gets lighter (late acceptance lets it drift a little). An empty
// pool is a plan with one panel fewer. Only panels of at most EXACT_MAX_PARTS parts take part, so
// it is meant for jobs of big parts (a few per panel); other panels are left as they are.
import { EXACT_MAX_PARTS, ExactFit, fullestFill } from "./exact";
import type { FillParams } from "./fill";
import { randInt } from "./prng";
import { basicKey, fullSheets, lexLess, type Bin, type SearchInput, type Solution } from "./search";

interface PBin {
  s: number;
  /** part types, one entry per part */
  items: number[];
  load: number;
  /** the original bin while unchanged (keeps its placements) */
  orig: Bin | null;
}

/** pool cost per part: (area / largest area)^COST_EXP, so one big part weighs more than two halves */
const COST_EXP = 2;
const HIST = 30;
/** share of moves that repack two panels and the pool, and the exact search's node limit for them */
const REFILL_P = 0.5;
const REFILL_NODES = 100;
/** moves without a lighter pool before starting again from the best plan */
const STALL = 400;

/** Whether the pool search can work on this plan: stages 0 and most panels few enough parts. */
export function poolSearchApplies(sol: Solution): boolean {
  if (sol.bins.length < 2) return false;
  let small = 0;
  for (const b of sol.bins) if (b.placed.length <= EXACT_MAX_PARTS - 1) small++;
  return small * 2 >= sol.bins.length;
}

export function poolSearch(input: SearchInput, start: Solution, fallback: FillParams): Solution {
  const { stocks, weight, rng, now, deadline } = input;
  if (start.left.some((n) => n > 0) || !poolSearchApplies(start)) return start;
  const nT = weight.length;
  const exact = stocks.map((s) => new ExactFit(s.ctx));
  let maxW = 0;
  for (let t = 0; t < nT; t++) maxW = Math.max(maxW, weight[t]);
  const cost = new Float64Array(nT);
  for (let t = 0; t < nT; t++) cost[t] = Math.pow(weight[t] / maxW, COST_EXP);
  const areaOf = (s: number) => stocks[s].ctx.W * stocks[s].ctx.H;

  const fromSolution = (sol: Solution): PBin[] =>
    sol.bins.map((b) => ({ s: b.s, items: b.placed.map((p) => p.t), load: b.load, orig: b }));
  const toSolution = (bs: PBin[]): Solution => {
    const bins: Bin[] = [];
    for (const b of bs) {
      if (b.orig) {
        bins.push(b.orig);
        continue;
      }
      const placed = exact[b.s].place(b.items)!;
      const counts = new Int32Array(nT);
      for (const t of b.items) counts[t]++;
      bins.push({ s: b.s, counts, placed, load: b.load, v: fallback });
    }
    return { bins, left: new Int32Array(nT) };
  };
  const atBound = (sol: Solution) => fullSheets(sol, stocks) <= input.lowerBound && !sol.bins.some((b) => stocks[b.s].offcut);

  let best = start;
  if (atBound(best)) return best;
  let bins = fromSolution(best);
  let pool: number[] = [];
  const poolCost = () => pool.reduce((a, t) => a + cost[t], 0);

  const dropOne = (noise: number): boolean => {
    const anyFull = bins.some((b) => !stocks[b.s].offcut);
    let idx = -1;
    let bestR = Infinity;
    bins.forEach((b, i) => {
      if (anyFull && stocks[b.s].offcut) return;
      if (b.items.length > EXACT_MAX_PARTS) return;
      const r = (b.load / stocks[b.s].area) * (1 + noise * rng());
      if (r < bestR) {
        bestR = r;
        idx = i;
      }
    });
    if (idx < 0 || bins.length <= 1) return false;
    pool = bins[idx].items.slice();
    bins.splice(idx, 1);
    return true;
  };
  if (!dropOne(0)) return best;
  let cur = poolCost();
  const hist = new Float64Array(HIST).fill(cur);
  let iter = 0;
  let lastGain = 0;
  let bestSinceDrop = cur;

  // subsets of one or two entries of a list, as index lists
  const subsets = (n: number, withEmpty: boolean): number[][] => {
    const r: number[][] = withEmpty ? [[]] : [];
    for (let i = 0; i < n; i++) r.push([i]);
    for (let i = 0; i < n; i++) for (let j = i + 1; j < n; j++) r.push([i, j]);
    return r;
  };

  while (now() < deadline) {
    iter++;
    if (pool.length === 0) {
      const sol = toSolution(bins);
      if (lexLess(basicKey(sol, stocks), basicKey(best, stocks))) {
        best = sol;
        input.onImprove?.(best.bins.length);
      }
      if (atBound(best)) break;
      bins = fromSolution(best);
      if (!dropOne(0)) break;
      cur = poolCost();
      hist.fill(cur);
      bestSinceDrop = cur;
      lastGain = iter;
      continue;
    }
    const h0 = iter % HIST;
    if (bins.length >= 2 && rng() < REFILL_P) {
      // repack two panels and the pool: each panel as full as the exact search makes it
      const i1 = randInt(rng, bins.length);
      let i2 = randInt(rng, bins.length - 1);
      if (i2 >= i1) i2++;
      const b1 = bins[i1];
      const b2 = bins[i2];
      if (b1.items.length > EXACT_MAX_PARTS || b2.items.length > EXACT_MAX_PARTS) continue;
      const union = new Int32Array(nT);
      for (const t of b1.items) union[t]++;
      for (const t of b2.items) union[t]++;
      for (const t of pool) union[t]++;
      const first = rng() < 0.5 ? pool[randInt(rng, pool.length)] : -1;
      const it1 = fullestFill(exact[b1.s], union, weight, areaOf(b1.s), REFILL_NODES, first, cost, () => now() > deadline);
      for (const t of it1) union[t]--;
      const it2 = fullestFill(exact[b2.s], union, weight, areaOf(b2.s), REFILL_NODES, -1, cost, () => now() > deadline);
      for (const t of it2) union[t]--;
      let nc = 0;
      const np: number[] = [];
      for (let t = 0; t < nT; t++) for (let c = 0; c < union[t]; c++) {
        np.push(t);
        nc += cost[t];
      }
      if (it1.length > 0 && it2.length > 0 && nc <= Math.max(cur, hist[h0]) + 1e-12) {
        const mk = (s: number, items: number[]): PBin => ({ s, items, load: items.reduce((a, t) => a + weight[t], 0), orig: null });
        bins[i1] = mk(b1.s, it1);
        bins[i2] = mk(b2.s, it2);
        pool = np;
        cur = nc;
      }
    } else {
    const bi = randInt(rng, bins.length);
    const b = bins[bi];
    if (b.items.length > EXACT_MAX_PARTS) continue;
    const cap = areaOf(b.s);
    const outs = subsets(b.items.length, true);
    const ins = subsets(pool.length, false);
    const limit = Math.max(cur, hist[h0]);
    // candidate moves, lightest resulting pool first; ties broken at random
    const moves: { o: number[]; i: number[]; d: number; r: number }[] = [];
    for (const o of outs) {
      let oc = 0;
      let ow = 0;
      for (const k of o) {
        oc += cost[b.items[k]];
        ow += weight[b.items[k]];
      }
      for (const i of ins) {
        if (b.items.length - o.length + i.length > EXACT_MAX_PARTS) continue;
        let ic = 0;
        let iw = 0;
        for (const k of i) {
          ic += cost[pool[k]];
          iw += weight[pool[k]];
        }
        if (b.load - ow + iw > cap) continue;
        const d = oc - ic;
        if (d >= -1e-12 && cur + d > limit + 1e-12) continue;
        if (o.length === i.length && d === 0 && o.every((k, j) => b.items[k] === pool[i[j]])) continue;
        moves.push({ o, i, d, r: rng() });
      }
    }
    moves.sort((p, q) => p.d - q.d || p.r - q.r);
    for (const m of moves) {
      const out = new Set(m.o);
      const next = b.items.filter((_, k) => !out.has(k));
      for (const k of m.i) next.push(pool[k]);
      if (!exact[b.s].fits(next)) continue;
      const inSet = new Set(m.i);
      const nextPool = pool.filter((_, k) => !inSet.has(k));
      for (const k of m.o) nextPool.push(b.items[k]);
      let load = 0;
      for (const t of next) load += weight[t];
      bins[bi] = { s: b.s, items: next, load, orig: null };
      pool = nextPool;
      cur += m.d;
      break;
    }
    }
    if (cur < hist[h0]) hist[h0] = cur;
    if (cur < bestSinceDrop - 1e-12) {
      bestSinceDrop = cur;
      lastGain = iter;
    } else if (iter - lastGain > STALL) {
      // stuck: start again from the best plan, dropping another lightly loaded panel
      bins = fromSolution(best);
      if (!dropOne(0.3)) break;
      cur = poolCost();
      hist.fill(cur);
      bestSinceDrop = cur;
      lastGain = iter;
    }
  }
  return best;
}

/**
 * Bin by bin, each panel filled as fully as possible by the exact search (fullestFill), its
 * heaviest part first. For jobs whose panels hold a few big parts; full sheets only.
 */
export function fullestConstructive(
  input: SearchInput,
  nodeLimit: number,
  fallback: FillParams,
  deadline: number,
  value: Float64Array = input.weight,
): Solution | null {
  const { stocks, weight } = input;
  const nT = weight.length;
  const s = stocks.findIndex((st) => !st.offcut && st.quantity === Infinity);
  if (s < 0) return null;
  const exact = new ExactFit(stocks[s].ctx);
  const cap = stocks[s].ctx.W * stocks[s].ctx.H;
  const left = input.demand.slice();
  const bins: Bin[] = [];
  while (left.some((n) => n > 0)) {
    if (input.now() > deadline) return null;
    const items = fullestFill(exact, left, weight, cap, nodeLimit, -1, value, () => input.now() > deadline);
    if (items.length === 0) return null;
    const placed = exact.place(items)!;
    const counts = new Int32Array(nT);
    let load = 0;
    for (const t of items) {
      counts[t]++;
      left[t]--;
      load += weight[t];
    }
    bins.push({ s, counts, placed, load, v: fallback });
  }
  return { bins, left };
}

