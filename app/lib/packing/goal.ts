// Goal-driven ruin and recreate for free guillotine patterns (stages 0). Each panel keeps its
// free rectangles, so parts from the pool can be inserted into any panel; ruined panels are
// rebuilt by replaying their kept parts. Aim: an empty pool with one panel fewer.
import { fillBin, placeAndSplit, type FillParams, type Free, type GuillotineParams, type Placed } from "./fill";
import { layoutPanel } from "./layout";
import { randInt } from "./prng";
import { basicKey, fullSheets, lexLess, makeOrder, ORDER_COUNT, type SearchInput, type Solution } from "./search";

interface GBin {
  s: number;
  counts: Int32Array;
  placed: Placed[];
  load: number;
  v: GuillotineParams;
  free: Free[];
}

// Tuned on the literature classes (see test/bench/RESULTS.md); moves are cheap, so many per second.
/** chance to rebuild a ruined panel with the biggest pool part placed first */
const FIRST_P = 0.3;
/** a ruined panel loses 10 % to 70 % of its parts */
const DROP_MAX = 0.6;
/** panels ruined per move: 1 to 3 */
const KMAX = 3;
/** late-acceptance history length */
const HIST = 50;
/** moves without a better pool before restarting from the best plan */
const STALL = 3000;
/** jobs of at most this many panels may use the slow look-ahead filler in rebuilds */
const LOOK_BINS = 4;
const LOOK_PARTS = 60;
/** noise on the recreate order (relative) */
const RNOISE = 0.3;
/** share of moves that rebuild the chosen panels from scratch, and tries per rebuild */
const REFILL_P = 0.3;
const REFILL_TRIES = 3;
/** pool cost per part: (area)^COST_EXP, so big parts weigh more than their area */
const COST_EXP = 1.2;

export function goalDrivenGuillotine(input: SearchInput, start: Solution, variants: GuillotineParams[], allVariants: FillParams[]): Solution {
  const { stocks, weight, dims, rng, now, deadline } = input;
  const nT = weight.length;
  const itemVariants = variants.filter((v) => v.driver === "item");
  if (itemVariants.length === 0 || start.left.some((n) => n > 0)) return start;
  // look-ahead fills are slow: only where a few panels carry many parts
  let nParts = 0;
  for (const b of start.bins) nParts += b.placed.length;
  const fewBins = start.bins.length <= LOOK_BINS && nParts <= LOOK_PARTS;
  const refillVariants = allVariants.filter((v) => fewBins || !(v.kind === "guillotine" && v.driver === "look"));
  const cost = new Float64Array(nT);
  for (let t = 0; t < nT; t++) cost[t] = Math.pow(dims[t].l * dims[t].w, COST_EXP);

  const replay = (s: number, seq: number[], pool: Int32Array, v: GuillotineParams): GBin => {
    const c = pool.slice();
    const placed: Placed[] = [];
    const free: Free[] = [];
    const load = fillBin(stocks[s].ctx, c, seq, v, weight, placed, free);
    const counts = new Int32Array(nT);
    for (let t = 0; t < nT; t++) counts[t] = pool[t] - c[t];
    return { s, counts, placed, load, v, free: usable(free) };
  };

  // free rectangles no part fits in are dropped: insertion scans fewer
  let minSide = Infinity;
  for (let t = 0; t < nT; t++) minSide = Math.min(minSide, dims[t].l, dims[t].w);
  const usable = (fr: Free[]): Free[] => (fr.some((r) => r.w < minSide || r.h < minSide) ? fr.filter((r) => r.w >= minSide && r.h >= minSide) : fr);
  // the leftovers of a panel's guillotine decomposition are its free rectangles, whatever filler made it
  const freeOf = (s: number, placed: Placed[]): Free[] => {
    const { W, H } = stocks[s].ctx;
    try {
      const lay = layoutPanel({ x: 0, y: 0, w: W, h: H }, placed.map((p) => ({ x: p.x, y: p.y, w: p.w, h: p.h })), 0, 0);
      return usable(lay.leftovers.map((r) => ({ x: r.x, y: r.y, w: r.w, h: r.h })));
    } catch {
      return [];
    }
  };
  let bins: GBin[] = start.bins.map((b) => {
    const v = b.v.kind === "guillotine" && b.v.driver === "item" ? b.v : itemVariants[0];
    return { s: b.s, counts: b.counts.slice(), placed: b.placed.slice(), load: b.load, v, free: freeOf(b.s, b.placed) };
  });
  const toSolution = (bs: GBin[]): Solution => ({
    bins: bs.filter((b) => b.placed.length > 0).map((b) => ({ s: b.s, counts: b.counts.slice(), placed: b.placed.slice(), load: b.load, v: b.v })),
    left: new Int32Array(nT),
  });
  let best = toSolution(bins);
  const done = () => fullSheets(best, stocks) <= input.lowerBound && !best.bins.some((b) => stocks[b.s].offcut);
  if (done()) return best;

  let pool = new Int32Array(nT);
  const poolCost = (p: Int32Array) => {
    let c = 0;
    for (let t = 0; t < nT; t++) if (p[t] > 0) c += p[t] * cost[t];
    return c;
  };
  const dropOne = (noise = 0): boolean => {
    const anyFull = bins.some((b) => !stocks[b.s].offcut);
    let idx = -1;
    let bestR = Infinity;
    bins.forEach((b, i) => {
      if (anyFull && stocks[b.s].offcut) return;
      const r = (b.load / stocks[b.s].area) * (1 + noise * rng());
      if (r < bestR) {
        bestR = r;
        idx = i;
      }
    });
    if (idx < 0 || bins.length <= 1) return false;
    for (let t = 0; t < nT; t++) pool[t] += bins[idx].counts[t];
    bins.splice(idx, 1);
    return true;
  };
  if (!dropOne()) return best;
  let curCost = poolCost(pool);
  const histLen = HIST;
  const hist = new Float64Array(histLen).fill(curCost);
  let iter = 0;
  let lastGain = 0;
  let bestSinceDrop = curCost;

  while (now() < deadline) {
    iter++;
    const nb = bins.length;
    const saved = new Map<number, GBin>();
    const work = pool.slice();
    // ruin
    const k = Math.min(nb, 1 + randInt(rng, KMAX));
    const chosen = new Set<number>();
    while (chosen.size < k) chosen.add(randInt(rng, nb));
    if (rng() < REFILL_P) {
      // rebuild the chosen panels from scratch: their parts and the pool, best of a few noisy fills
      for (const i of chosen) {
        saved.set(i, bins[i]);
        const b = bins[i];
        for (let t = 0; t < nT; t++) work[t] += b.counts[t];
      }
      for (const i of chosen) {
        const s = bins[i].s;
        let bestBin: GBin | null = null;
        for (let a = 0; a < REFILL_TRIES && (a === 0 || now() < deadline); a++) {
          const v = refillVariants[randInt(rng, refillVariants.length)];
          const order = makeOrder(work, dims, randInt(rng, ORDER_COUNT), rng, 0.2 + 0.6 * rng());
          const c = work.slice();
          const placed: Placed[] = [];
          const free: Free[] = [];
          const load = fillBin(stocks[s].ctx, c, order, v, weight, placed, free);
          if (bestBin && load <= bestBin.load) continue;
          const counts = new Int32Array(nT);
          for (let t = 0; t < nT; t++) counts[t] = work[t] - c[t];
          let fr = free;
          if (v.kind !== "guillotine") fr = freeOf(s, placed);
          const gv = v.kind === "guillotine" && v.driver === "item" ? v : itemVariants[randInt(rng, itemVariants.length)];
          bestBin = { s, counts, placed, load, v: gv, free: usable(fr) };
        }
        const nb2 = bestBin!;
        for (let t = 0; t < nT; t++) work[t] -= nb2.counts[t];
        bins[i] = nb2;
      }
    } else {
    for (const i of chosen) {
        const b = bins[i];
        saved.set(i, b);
        const drop = 0.1 + DROP_MAX * rng();
        const kept: number[] = [];
        const keepCounts = new Int32Array(nT);
        for (const p of b.placed) {
          if (rng() >= drop) {
            kept.push(p.t);
            keepCounts[p.t]++;
          } else work[p.t]++;
        }
        const v = rng() < 0.8 ? b.v : itemVariants[randInt(rng, itemVariants.length)];
        let seq = kept;
        if (rng() < FIRST_P) {
          // give the biggest pool part a clean spot first
          let bt = -1;
          for (let t = 0; t < nT; t++) if (work[t] > 0 && (bt < 0 || cost[t] > cost[bt]) && rng() < 0.7) bt = t;
          if (bt >= 0) {
            seq = [bt, ...kept];
            keepCounts[bt]++;
            work[bt]--;
          }
        }
        const nbin = replay(b.s, seq, keepCounts, v);
        for (let t = 0; t < nT; t++) work[t] += keepCounts[t] - nbin.counts[t];
        bins[i] = nbin;
      }
    }
    // recreate: pool parts by decreasing cost (noisy), each into the snuggest free rectangle of any panel
    const seq: { t: number; key: number }[] = [];
    for (let t = 0; t < nT; t++) for (let c = 0; c < work[t]; c++) seq.push({ t, key: cost[t] * (1 + RNOISE * (rng() - 0.5)) });
    seq.sort((a, b) => b.key - a.key);
    for (const { t } of seq) {
      if (rng() < 0.03) continue; // blink: leave it for a later round
      let bi = -1;
      let fi = -1;
      let bo = null as null | { w: number; h: number; rot: boolean };
      let bs = Infinity;
      const itemArea = dims[t].l * dims[t].w;
      for (let i = 0; i < bins.length; i++) {
        const b = bins[i];
        const os = stocks[b.s].ctx.orients[t];
        for (let f = 0; f < b.free.length; f++) {
          const r = b.free[f];
          if (r.w * r.h < itemArea) continue;
          for (const o of os) {
            if (o.w <= r.w && o.h <= r.h) {
              const sc = r.w * r.h - o.w * o.h;
              if (sc < bs) {
                bs = sc;
                bi = i;
                fi = f;
                bo = o;
              }
            }
          }
        }
      }
      if (bi < 0 || !bo) continue;
      if (!saved.has(bi)) {
        const b = bins[bi];
        saved.set(bi, b);
        bins[bi] = { ...b, counts: b.counts.slice(), placed: b.placed.slice(), free: b.free.slice() };
      }
      const b = bins[bi];
      const r = placeAndSplit(b.free, fi, bo, b.v.split);
      b.free = usable(b.free);
      b.placed.push({ t, x: r.x, y: r.y, w: bo.w, h: bo.h, rot: bo.rot });
      b.counts[t]++;
      b.load += weight[t];
      work[t]--;
    }
    const newCost = poolCost(work);
    const h = iter % histLen;
    if (newCost <= curCost + 1e-9 || newCost <= hist[h] + 1e-9) {
      pool = work;
      curCost = newCost;
      bins = bins.filter((b) => b.placed.length > 0);
    } else {
      for (const [i, b] of saved) bins[i] = b;
    }
    if (curCost < hist[h]) hist[h] = curCost;
    if (curCost < bestSinceDrop - 1e-9) {
      bestSinceDrop = curCost;
      lastGain = iter;
    } else if (iter - lastGain > STALL) {
      // stuck: start again from the best plan, dropping another lightly loaded panel
      bins = best.bins.map((b) => ({ s: b.s, counts: b.counts.slice(), placed: b.placed.slice(), load: b.load, v: b.v.kind === "guillotine" && b.v.driver === "item" ? b.v : itemVariants[0], free: freeOf(b.s, b.placed) }));
      pool = new Int32Array(nT);
      if (!dropOne(0.3)) break;
      curCost = poolCost(pool);
      hist.fill(curCost);
      bestSinceDrop = curCost;
      lastGain = iter;
      continue;
    }
    if (curCost <= 1e-9) {
      const sol = toSolution(bins);
      if (lexLess(basicKey(sol, stocks), basicKey(best, stocks))) {
        best = sol;
        input.onImprove?.(best.bins.length);
      }
      if (done()) break;
      pool = new Int32Array(nT);
      if (!dropOne()) break;
      curCost = poolCost(pool);
      hist.fill(curCost);
      bestSinceDrop = curCost;
      lastGain = iter;
    }
  }
  return best;
}
