// Search over fillers: bin-by-bin constructive passes, then goal-driven ruin and recreate
// that tries to pack everything into one panel fewer until the time budget runs out.
import { fillBin, type BinContext, type FillParams, type Placed } from "./fill";
import { randInt, type Rng } from "./prng";

export interface StockSlot {
  ctx: BinContext;
  /** Infinity when unlimited */
  quantity: number;
  cost: number;
  /** a racked offcut (untrimmed stock) */
  offcut: boolean;
  /** usable inflated area */
  area: number;
}

export interface Bin {
  s: number;
  counts: Int32Array;
  /** in placement order */
  placed: Placed[];
  /** packed weight */
  load: number;
  /** the filler that made it */
  v: FillParams;
}

export interface Solution {
  bins: Bin[];
  /** items left over (no stock left) */
  left: Int32Array;
}

export interface SearchInput {
  stocks: StockSlot[];
  /** demanded count per item type (already without types that fit nowhere) */
  demand: Int32Array;
  weight: Float64Array;
  /** per type: size keys used for orderings (inflated length, width along the part) */
  dims: { l: number; w: number }[];
  variants: FillParams[];
  rng: Rng;
  now: () => number;
  deadline: number;
  /** stop as soon as this many full sheets (plus 0 offcuts) is reached */
  lowerBound: number;
  /** whether to try racked offcuts before full sheets */
  offcutsFirst: boolean;
  /** told the panel count each time the search finds a better solution */
  onImprove?: (bins: number) => void;
}

const ORDER_KEYS: ((d: { l: number; w: number }) => number)[] = [
  (d) => d.l * d.w,
  (d) => Math.max(d.l, d.w) * 1e6 + Math.min(d.l, d.w),
  (d) => Math.min(d.l, d.w) * 1e6 + Math.max(d.l, d.w),
  (d) => d.l + d.w,
  (d) => d.l * 1e6 + d.w,
  (d) => d.w * 1e6 + d.l,
];
export const ORDER_COUNT = ORDER_KEYS.length;

/** A placement sequence: live types sorted by a size key (with optional noise), each repeated by its count. */
export function makeOrder(
  counts: Int32Array,
  dims: { l: number; w: number }[],
  key: number,
  rng: Rng | null,
  noise = 0,
): number[] {
  const f = ORDER_KEYS[key % ORDER_KEYS.length];
  const k: { t: number; v: number }[] = [];
  for (let t = 0; t < counts.length; t++) {
    if (counts[t] > 0) k.push({ t, v: f(dims[t]) * (rng && noise > 0 ? 1 + noise * (rng() - 0.5) : 1) });
  }
  k.sort((a, b) => b.v - a.v || a.t - b.t);
  const seq: number[] = [];
  for (const e of k) for (let c = 0; c < counts[e.t]; c++) seq.push(e.t);
  return seq;
}

function liveTypes(counts: Int32Array): number[] {
  const r: number[] = [];
  for (let t = 0; t < counts.length; t++) if (counts[t] > 0) r.push(t);
  return r;
}

function sumWeight(counts: Int32Array, weight: Float64Array): number {
  let s = 0;
  for (let t = 0; t < counts.length; t++) if (counts[t] > 0) s += counts[t] * weight[t];
  return s;
}

function fitsSomething(ctx: BinContext, counts: Int32Array): boolean {
  for (let t = 0; t < counts.length; t++) if (counts[t] > 0 && ctx.orients[t].length > 0) return true;
  return false;
}

interface Trial {
  counts: Int32Array;
  placed: Placed[];
  load: number;
}

function tryFill(ctx: BinContext, pool: Int32Array, order: number[], v: FillParams, weight: Float64Array): Trial {
  const c = pool.slice();
  const placed: Placed[] = [];
  const load = fillBin(ctx, c, order, v, weight, placed);
  const taken = new Int32Array(pool.length);
  for (let t = 0; t < pool.length; t++) taken[t] = pool[t] - c[t];
  return { counts: taken, placed, load };
}

/** One bin-oriented pass: each new panel gets the best of the given variants × orders. */
export function constructive(input: SearchInput, variants: FillParams[], orders: number[], budgetEnd: number): Solution {
  const { stocks, weight, dims } = input;
  const remaining = input.demand.slice();
  const used = new Array(stocks.length).fill(0);
  const bins: Bin[] = [];
  let vlist = variants;
  let olist = orders;
  const total = sumWeight(remaining, weight);
  const t0 = input.now();
  const wins = new Map<string, number>();
  while (true) {
    if (liveTypes(remaining).length === 0) break;
    let cands = stocks
      .map((s, i) => i)
      .filter((i) => used[i] < stocks[i].quantity && fitsSomething(stocks[i].ctx, remaining));
    if (cands.length === 0) break;
    if (input.offcutsFirst && cands.some((i) => stocks[i].offcut)) cands = cands.filter((i) => stocks[i].offcut);
    let best: Trial | null = null;
    let bestS = -1;
    let bestKey = "";
    let bestV: FillParams = vlist[0];
    const orderCache = olist.map((o) => makeOrder(remaining, dims, o, null));
    let late = false;
    for (const s of cands) {
      for (let vi = 0; vi < vlist.length && !late; vi++) {
        // over budget: settle this panel with what has been tried
        if (best && vi > 0 && input.now() > budgetEnd) late = true;
        for (let oi = 0; oi < olist.length && !late; oi++) {
          if (best && oi > 0 && input.now() > budgetEnd) {
            late = true;
            break;
          }
          const tr = tryFill(stocks[s].ctx, remaining, orderCache[oi], vlist[vi], weight);
          const better =
            !best ||
            tr.load > best.load + 1e-9 ||
            (Math.abs(tr.load - best.load) <= 1e-9 && stocks[s].cost < stocks[bestS].cost);
          if (better) {
            best = tr;
            bestS = s;
            bestKey = vi + ":" + oi;
            bestV = vlist[vi];
          }
        }
      }
    }
    if (!best || best.placed.length === 0) break;
    wins.set(bestKey, (wins.get(bestKey) ?? 0) + 1);
    for (let t = 0; t < remaining.length; t++) remaining[t] -= best.counts[t];
    used[bestS]++;
    bins.push({ s: bestS, counts: best.counts, placed: best.placed, load: best.load, v: bestV });
    // keep within the constructive budget: fall back to the variants that have been winning
    const done = 1 - sumWeight(remaining, weight) / total;
    const spent = input.now() - t0;
    const allowed = (budgetEnd - t0) * done;
    if (spent > allowed && vlist.length * olist.length > 4) {
      const top = [...wins.entries()].sort((a, b) => b[1] - a[1]).slice(0, 3).map((e) => e[0].split(":").map(Number));
      const vs = [...new Set(top.map((e) => e[0]))];
      const os = [...new Set(top.map((e) => e[1]))];
      vlist = vs.map((i) => vlist[i]);
      olist = os.map((i) => olist[i]);
      wins.clear();
    }
  }
  return { bins, left: remaining };
}

export function fullSheets(sol: Solution, stocks: StockSlot[]): number {
  let n = 0;
  for (const b of sol.bins) if (!stocks[b.s].offcut) n++;
  return n;
}

function leftCount(sol: Solution): number {
  let n = 0;
  for (let t = 0; t < sol.left.length; t++) n += sol.left[t];
  return n;
}

/** Compare for the sheets objective, ignoring set-ups: fewer left over, fewer full sheets, less cost. */
export function basicKey(sol: Solution, stocks: StockSlot[]): number[] {
  let cost = 0;
  for (const b of sol.bins) cost += stocks[b.s].cost;
  return [leftCount(sol), fullSheets(sol, stocks), sol.bins.length, cost];
}

export function lexLess(a: number[], b: number[]): boolean {
  for (let i = 0; i < Math.min(a.length, b.length); i++) {
    if (a[i] < b[i] - 1e-9) return true;
    if (a[i] > b[i] + 1e-9) return false;
  }
  return false;
}

function cloneSolution(sol: Solution): Solution {
  return {
    bins: sol.bins.map((b) => ({ s: b.s, counts: b.counts.slice(), placed: b.placed.slice(), load: b.load, v: b.v })),
    left: sol.left.slice(),
  };
}

/**
 * Goal-driven ruin and recreate: drop the least-loaded full sheet, put its items in a pool,
 * and repeatedly refill one to three random panels from their items plus the pool, accepting
 * (late acceptance) when the pool's weight does not grow. An empty pool is a plan with one
 * panel fewer; then the next panel is dropped.
 */
export function ruinAndRecreate(input: SearchInput, start: Solution, variants: FillParams[]): Solution {
  const { stocks, weight, dims, rng, now, deadline } = input;
  let best = cloneSolution(start);
  if (leftCount(best) > 0) return best;
  let cur = cloneSolution(best);
  const nT = weight.length;
  let pool = new Int32Array(nT);

  const dropOne = (): boolean => {
    // least-loaded full sheet (relative to its area); offcuts only when no full sheet is left
    let idx = -1;
    let bestR = Infinity;
    const anyFull = cur.bins.some((b) => !stocks[b.s].offcut);
    cur.bins.forEach((b, i) => {
      if (anyFull && stocks[b.s].offcut) return;
      const r = b.load / stocks[b.s].area;
      if (r < bestR) {
        bestR = r;
        idx = i;
      }
    });
    if (idx < 0 || cur.bins.length <= 1) return false;
    const b = cur.bins[idx];
    for (let t = 0; t < nT; t++) pool[t] += b.counts[t];
    cur.bins.splice(idx, 1);
    return true;
  };

  if (fullSheets(cur, stocks) <= input.lowerBound && !cur.bins.some((b) => stocks[b.s].offcut)) return best;
  if (!dropOne()) return best;
  let poolW = sumWeight(pool, weight);
  const itemVariants = variants.filter((v) => v.kind === "guillotine" && v.driver === "item");
  const histLen = 40;
  const hist = new Float64Array(histLen).fill(poolW);
  let iter = 0;
  while (now() < deadline) {
    iter++;
    const nb = cur.bins.length;
    if (nb === 0) break;
    const k = Math.min(nb, 1 + randInt(rng, 3));
    const chosen = new Set<number>();
    while (chosen.size < k) chosen.add(randInt(rng, nb));
    const work = pool.slice();
    for (const i of chosen) {
      const b = cur.bins[i];
      for (let t = 0; t < nT; t++) work[t] += b.counts[t];
    }
    const newBins: Bin[] = [];
    const full = rng() < 0.25;
    for (const i of chosen) {
      const old = cur.bins[i];
      const s = old.s;
      let tr: Trial;
      let v: FillParams;
      if (full || itemVariants.length === 0) {
        // rebuild from scratch with a random filler and a noisy size order
        v = variants[randInt(rng, variants.length)];
        tr = tryFill(stocks[s].ctx, work, makeOrder(work, dims, randInt(rng, ORDER_COUNT), rng, 0.2 + 0.6 * rng()), v, weight);
      } else {
        // ruin part of the panel, then recreate: kept parts in their old sequence, the pool by size
        v = old.v.kind === "guillotine" && old.v.driver === "item" ? old.v : itemVariants[randInt(rng, itemVariants.length)];
        const drop = rng() < 0.3 ? 0 : 0.1 + 0.5 * rng();
        const kept: number[] = [];
        const rest = work.slice();
        for (const p of old.placed) {
          if (rng() >= drop) {
            kept.push(p.t);
            rest[p.t]--;
          }
        }
        const poolSeq = makeOrder(rest, dims, randInt(rng, 2), rng, 0.3 * rng());
        const seq = rng() < 0.3 ? poolSeq.concat(kept) : kept.concat(poolSeq);
        tr = tryFill(stocks[s].ctx, work, seq, v, weight);
      }
      for (let t = 0; t < nT; t++) work[t] -= tr.counts[t];
      newBins.push({ s, counts: tr.counts, placed: tr.placed, load: tr.load, v });
    }
    const newW = sumWeight(work, weight);
    const h = iter % histLen;
    if (newW <= poolW + 1e-9 || newW <= hist[h] + 1e-9) {
      let j = 0;
      for (const i of chosen) cur.bins[i] = newBins[j++];
      pool = work;
      poolW = newW;
    }
    if (poolW < hist[h]) hist[h] = poolW;
    if (poolW <= 1e-9) {
      // every item placed with one panel fewer
      const sol: Solution = { bins: cur.bins, left: new Int32Array(nT) };
      if (lexLess(basicKey(sol, stocks), basicKey(best, stocks))) {
        best = cloneSolution(sol);
        input.onImprove?.(best.bins.length);
      }
      if (fullSheets(best, stocks) <= input.lowerBound && !best.bins.some((b) => stocks[b.s].offcut)) break;
      pool = new Int32Array(nT);
      if (!dropOne()) break;
      poolW = sumWeight(pool, weight);
      hist.fill(poolW);
    }
  }
  return best;
}

/** Move each panel's parts onto a cheaper stock panel when they all fit there. */
export function downsize(input: SearchInput, sol: Solution, variants: FillParams[]): Solution {
  const { stocks, weight, dims } = input;
  const used = new Array(stocks.length).fill(0);
  for (const b of sol.bins) used[b.s]++;
  const out = cloneSolution(sol);
  for (const b of out.bins) {
    const cheaper = stocks
      .map((s, i) => i)
      .filter((i) => stocks[i].cost < stocks[b.s].cost && used[i] < stocks[i].quantity && stocks[i].offcut === stocks[b.s].offcut)
      .sort((a, c) => stocks[a].cost - stocks[c].cost);
    const n = b.placed.length;
    for (const s of cheaper) {
      let ok: Trial | null = null;
      for (const v of variants) {
        for (let o = 0; o < ORDER_COUNT && !ok; o++) {
          const tr = tryFill(stocks[s].ctx, b.counts, makeOrder(b.counts, dims, o, null), v, weight);
          if (tr.placed.length === n) ok = tr;
        }
        if (ok) break;
      }
      if (ok) {
        used[b.s]--;
        used[s]++;
        b.s = s;
        b.placed = ok.placed;
        b.load = ok.load;
        b.v = variants[0];
        break;
      }
    }
  }
  return out;
}
