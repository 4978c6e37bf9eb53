import { GuillotineBinPack } from "rectangle-packer";

// Fillers: lay items from a pool onto one panel. All sizes are "inflated" integers
// (real size + kerf, panel usable size + kerf), which turns every kerf-aware guillotine
// layout into a zero-kerf one: n parts of width w fit in W iff n·(w+k) <= W+k.

export interface Orient {
  /** extent along x (panel length) */
  w: number;
  /** extent along y (panel width) */
  h: number;
  rot: boolean;
}

export interface BinContext {
  /** usable length and width of the panel, inflated */
  W: number;
  H: number;
  /** allowed orientations per item type that fit this panel (and its strip limit), inflated */
  orients: Orient[][];
  /** widest strip (inflated) in staged patterns; Infinity when unlimited */
  stripMax: number;
}

export interface Placed {
  t: number;
  x: number;
  y: number;
  w: number;
  h: number;
  rot: boolean;
}

export interface GuillotineParams {
  kind: "guillotine";
  /** 0 best area fit, 1 best short side, 2 best long side, 3 bottom-left */
  rectChoice: number;
  /** 0 shorter axis, 1 longer axis, 2 shorter leftover, 3 longer leftover, 4 min area, 5 max area */
  split: number;
  /**
   * item-driven (pack the order), rectangle-driven (best item for each free rectangle), or look-ahead
   * (rectangle-driven, each choice judged by completing the panel greedily: slow, for small jobs)
   */
  driver: "item" | "rect" | "look" | "rp" | "column";
  /**
   * "rp": orientation decided up front, 0 long side along x, 1 along y (where allowed).
   * "column": 0 the column's parts lie along x (first cut x = const), 1 transposed (along y).
   */
  orient?: 0 | 1;
  /** "column" only: which column width, 0 the longest candidate to 3 the shortest (spread over the range) */
  pick?: number;
}

export interface StagedParams {
  kind: "staged";
  /** 2: one section the panel's length; 3: breakdown into sections first */
  stages: 2 | 3;
  /** strip opener orientation: 0 widest fitting, 1 narrowest, 2 try both and keep the denser strip */
  opener: number;
  /** 3 stages: section length from its opener's length (true) or the rest of the panel (false) */
  sectionByOpener: boolean;
  /** only parts exactly as wide as the strip (no rip to width): fewer set-ups */
  homogeneous: boolean;
}

export type FillParams = GuillotineParams | StagedParams;

export interface Free {
  x: number;
  y: number;
  w: number;
  h: number;
}

/** Fills one panel from `counts` (decremented in place) and appends to `out`. Returns the packed weight. */
export function fillBin(
  ctx: BinContext,
  counts: Int32Array,
  order: number[],
  params: FillParams,
  weight: Float64Array,
  out: Placed[],
  freeOut?: Free[],
): number {
  if (params.kind === "guillotine") {
    if (params.driver === "look") return lookaheadFill(ctx, counts, order, params, weight, out, freeOut);
    if (params.driver === "rp") return rectanglePackerFill(ctx, counts, order, params, weight, out, freeOut);
    if (params.driver === "column") return columnFill(ctx, counts, order, params, weight, out, freeOut);
    return params.driver === "item"
      ? guillotineItemFill(ctx, counts, order, params, weight, out, freeOut)
      : guillotineRectFill(ctx, counts, order, params, weight, out, freeOut);
  }
  return stagedFill(ctx, counts, order, params, weight, out);
}

function splitHorizontal(split: number, fw: number, fh: number, w: number, h: number): boolean {
  const wl = fw - w;
  const hl = fh - h;
  switch (split) {
    case 0:
      return fw <= fh;
    case 1:
      return fw > fh;
    case 2:
      return wl <= hl;
    case 3:
      return wl > hl;
    case 4:
      return w * hl > wl * h;
    default:
      return w * hl <= wl * h;
  }
}

// Place at the free rectangle's lower-left corner and cut the rest into two free rectangles.
export function placeAndSplit(free: Free[], i: number, o: Orient, split: number): Free {
  const r = free[i];
  const horiz = splitHorizontal(split, r.w, r.h, o.w, o.h);
  const wl = r.w - o.w;
  const hl = r.h - o.h;
  free[i] = free[free.length - 1];
  free.pop();
  if (horiz) {
    // cut y = r.y + o.h across the whole free rect first
    if (hl > 0) free.push({ x: r.x, y: r.y + o.h, w: r.w, h: hl });
    if (wl > 0) free.push({ x: r.x + o.w, y: r.y, w: wl, h: o.h });
  } else {
    if (wl > 0) free.push({ x: r.x + o.w, y: r.y, w: wl, h: r.h });
    if (hl > 0) free.push({ x: r.x, y: r.y + o.h, w: o.w, h: hl });
  }
  return r;
}

function rectScore(choice: number, r: Free, o: Orient): number {
  const dw = r.w - o.w;
  const dh = r.h - o.h;
  switch (choice) {
    case 0:
      return r.w * r.h - o.w * o.h + Math.min(dw, dh) * 1e-9;
    case 1:
      return Math.min(dw, dh) + Math.max(dw, dh) * 1e-9;
    case 2:
      return Math.max(dw, dh) + Math.min(dw, dh) * 1e-9;
    default:
      return r.y * 4e12 + r.x + Math.min(dw, dh) * 1e-9;
  }
}

// The order is a sequence: each entry places one copy of its type when one is left and fits.
function guillotineItemFill(
  ctx: BinContext,
  counts: Int32Array,
  order: number[],
  p: GuillotineParams,
  weight: Float64Array,
  out: Placed[],
  freeOut?: Free[],
): number {
  const free: Free[] = freeOut ?? [];
  free.length = 0;
  free.push({ x: 0, y: 0, w: ctx.W, h: ctx.H });
  let packed = 0;
  // free space only shrinks, so a type that once found no room never will
  const failed = new Uint8Array(counts.length);
  for (const t of order) {
    if (counts[t] <= 0 || failed[t] || free.length === 0) continue;
    const os = ctx.orients[t];
    let best = -1;
    let bestO: Orient | null = null;
    let bestS = Infinity;
    for (let i = 0; i < free.length; i++) {
      const r = free[i];
      for (const o of os) {
        if (o.w <= r.w && o.h <= r.h) {
          const s = rectScore(p.rectChoice, r, o);
          if (s < bestS) {
            bestS = s;
            best = i;
            bestO = o;
          }
        }
      }
    }
    if (best < 0 || !bestO) {
      failed[t] = 1;
      continue;
    }
    const r = placeAndSplit(free, best, bestO, p.split);
    out.push({ t, x: r.x, y: r.y, w: bestO.w, h: bestO.h, rot: bestO.rot });
    counts[t]--;
    packed += weight[t];
  }
  return packed;
}

function guillotineRectFill(
  ctx: BinContext,
  counts: Int32Array,
  order: number[],
  p: GuillotineParams,
  weight: Float64Array,
  out: Placed[],
  freeOut?: Free[],
  startFree?: Free[],
): number {
  const free: Free[] = freeOut ?? [];
  free.length = 0;
  if (startFree) free.push(...startFree);
  else free.push({ x: 0, y: 0, w: ctx.W, h: ctx.H });
  let packed = 0;
  const dead: Free[] = [];
  // candidate types in priority order; ties in fit go to the earlier one
  const live = [...new Set(order)].filter((t) => counts[t] > 0 && ctx.orients[t].length > 0);
  while (free.length > 0 && live.length > 0) {
    // next free rectangle: bottom-left (choice 3) or the smallest first
    let ri = 0;
    for (let i = 1; i < free.length; i++) {
      const a = free[i];
      const b = free[ri];
      if (p.rectChoice === 3 ? a.y < b.y || (a.y === b.y && a.x < b.x) : a.w * a.h < b.w * b.h) ri = i;
    }
    const r = free[ri];
    let bestT = -1;
    let bestO: Orient | null = null;
    let bestS = -Infinity;
    for (let li = 0; li < live.length; li++) {
      const t = live[li];
      for (const o of ctx.orients[t]) {
        if (o.w <= r.w && o.h <= r.h) {
          // prefer filling the rectangle: biggest area, then a snug side
          const snug = o.w === r.w || o.h === r.h ? 1 : 0;
          const s = p.rectChoice === 1 ? o.w * o.h + snug * r.w * r.h : o.w * o.h * (1 + 0.05 * snug);
          if (s > bestS) {
            bestS = s;
            bestT = t;
            bestO = o;
          }
        }
      }
    }
    if (bestT < 0 || !bestO) {
      dead.push(r);
      free[ri] = free[free.length - 1];
      free.pop();
      continue;
    }
    placeAndSplit(free, ri, bestO, p.split);
    out.push({ t: bestT, x: r.x, y: r.y, w: bestO.w, h: bestO.h, rot: bestO.rot });
    counts[bestT]--;
    packed += weight[bestT];
    if (counts[bestT] === 0) live.splice(live.indexOf(bestT), 1);
  }
  for (const d of dead) free.push(d);
  return packed;
}

// --- staged (2 or 3 stage) patterns: sections along x, strips along y, parts along x ---

function fillStrip(
  ctx: BinContext,
  counts: Int32Array,
  order: number[],
  x0: number,
  y0: number,
  len: number,
  s: number,
  homogeneous: boolean,
  weight: Float64Array,
  out: Placed[] | null,
): number {
  let x = x0;
  const end = x0 + len;
  let area = 0;
  for (const t of order) {
    while (counts[t] > 0) {
      let bo: Orient | null = null;
      for (const o of ctx.orients[t]) {
        if (o.h > s || o.w > end - x) continue;
        if (homogeneous && o.h !== s) continue;
        if (!bo || o.h > bo.h || (o.h === bo.h && o.w < bo.w)) bo = o;
      }
      if (!bo) break;
      if (out) out.push({ t, x, y: y0, w: bo.w, h: bo.h, rot: bo.rot });
      x += bo.w;
      counts[t]--;
      area += out ? weight[t] : bo.w * bo.h;
    }
  }
  return area;
}

function stagedFill(
  ctx: BinContext,
  counts: Int32Array,
  order: number[],
  p: StagedParams,
  weight: Float64Array,
  out: Placed[],
): number {
  let packed = 0;
  let x0 = 0;
  while (x0 < ctx.W) {
    // section opener: first item of the order that fits the rest of the panel
    const lenLeft = ctx.W - x0;
    let secLen = lenLeft;
    if (p.stages === 3 && p.sectionByOpener) {
      let found = -1;
      for (const t of order) {
        if (counts[t] <= 0) continue;
        let bo: Orient | null = null;
        for (const o of ctx.orients[t]) {
          if (o.w > lenLeft || o.h > ctx.H || o.h > ctx.stripMax) continue;
          // the longest fitting orientation makes the section
          if (!bo || o.w > bo.w) bo = o;
        }
        if (bo) {
          found = bo.w;
          break;
        }
      }
      if (found < 0) break;
      secLen = found;
    }
    let y = 0;
    let any = false;
    while (y < ctx.H) {
      const wLeft = Math.min(ctx.H - y, ctx.stripMax);
      // strip opener
      let opener = -1;
      let cands: Orient[] = [];
      for (const t of order) {
        if (counts[t] <= 0) continue;
        cands = ctx.orients[t].filter((o) => o.w <= secLen && o.h <= wLeft);
        if (cands.length) {
          opener = t;
          break;
        }
      }
      if (opener < 0) break;
      let chosen: Orient = cands[0];
      if (cands.length > 1) {
        if (p.opener === 0) chosen = cands.reduce((a, b) => (b.h > a.h ? b : a));
        else if (p.opener === 1) chosen = cands.reduce((a, b) => (b.h < a.h ? b : a));
        else {
          let bestD = -1;
          for (const o of cands) {
            const c = counts.slice();
            c[opener]--;
            const a = o.w * o.h + fillStrip(ctx, c, order, x0 + o.w, y, secLen - o.w, o.h, p.homogeneous, weight, null);
            const d = a / (o.h * secLen);
            if (d > bestD) {
              bestD = d;
              chosen = o;
            }
          }
        }
      }
      out.push({ t: opener, x: x0, y, w: chosen.w, h: chosen.h, rot: chosen.rot });
      counts[opener]--;
      packed += weight[opener];
      packed += fillStrip(ctx, counts, order, x0 + chosen.w, y, secLen - chosen.w, chosen.h, p.homogeneous, weight, out);
      y += chosen.h;
      any = true;
    }
    if (!any || p.stages === 2 || !p.sectionByOpener) break;
    x0 += secLen;
  }
  return packed;
}

// --- look-ahead: judge each candidate for the next free rectangle by a greedy completion ---

function pickRect(free: Free[], bottomLeft: boolean): number {
  let ri = 0;
  for (let i = 1; i < free.length; i++) {
    const a = free[i];
    const b = free[ri];
    if (bottomLeft ? a.y < b.y || (a.y === b.y && a.x < b.x) : a.w * a.h < b.w * b.h) ri = i;
  }
  return ri;
}

/** Greedy completion (area only): the biggest fitting part into the chosen rectangle, repeatedly. */
function greedyArea(ctx: BinContext, counts: Int32Array, live: number[], free: Free[], split: number, bottomLeft: boolean): number {
  let area = 0;
  while (free.length > 0) {
    const ri = pickRect(free, bottomLeft);
    const r = free[ri];
    let bestT = -1;
    let bestO: Orient | null = null;
    let bestA = 0;
    for (const t of live) {
      if (counts[t] <= 0) continue;
      for (const o of ctx.orients[t]) {
        if (o.w <= r.w && o.h <= r.h && o.w * o.h > bestA) {
          bestA = o.w * o.h;
          bestT = t;
          bestO = o;
        }
      }
    }
    if (!bestO) {
      free[ri] = free[free.length - 1];
      free.pop();
      continue;
    }
    placeAndSplit(free, ri, bestO, split);
    counts[bestT]--;
    area += bestA;
  }
  return area;
}

function lookaheadFill(
  ctx: BinContext,
  counts: Int32Array,
  order: number[],
  p: GuillotineParams,
  weight: Float64Array,
  out: Placed[],
  freeOut?: Free[],
): number {
  const free: Free[] = freeOut ?? [];
  free.length = 0;
  free.push({ x: 0, y: 0, w: ctx.W, h: ctx.H });
  const dead: Free[] = [];
  const live = [...new Set(order)].filter((t) => counts[t] > 0 && ctx.orients[t].length > 0);
  const bottomLeft = p.rectChoice === 3;
  let packed = 0;
  const width = 6;
  while (free.length > 0) {
    const ri = pickRect(free, bottomLeft);
    const r = free[ri];
    // the biggest few candidates, each with both ways of cutting the rest
    const cand: { t: number; o: Orient }[] = [];
    for (const t of live) {
      if (counts[t] <= 0) continue;
      for (const o of ctx.orients[t]) if (o.w <= r.w && o.h <= r.h) cand.push({ t, o });
    }
    if (cand.length === 0) {
      dead.push(r);
      free[ri] = free[free.length - 1];
      free.pop();
      continue;
    }
    cand.sort((a, b) => b.o.w * b.o.h - a.o.w * a.o.h);
    let best: { t: number; o: Orient; split: number } | null = null;
    let bestScore = -1;
    for (const c of cand.slice(0, width)) {
      for (const split of [p.split, p.split ^ 1]) {
        const f = free.slice();
        const cc = counts.slice();
        placeAndSplit(f, ri, c.o, split);
        cc[c.t]--;
        const score = c.o.w * c.o.h + greedyArea(ctx, cc, live, f, p.split, bottomLeft);
        if (score > bestScore) {
          bestScore = score;
          best = { t: c.t, o: c.o, split };
        }
      }
    }
    const b = best!;
    placeAndSplit(free, ri, b.o, b.split);
    out.push({ t: b.t, x: r.x, y: r.y, w: b.o.w, h: b.o.h, rot: b.o.rot });
    counts[b.t]--;
    packed += weight[b.t];
  }
  for (const d of dead) free.push(d);
  return packed;
}

// --- rectangle-packer's GuillotineBinPack as one more filler (global best fit over all parts) ---
// Without flipping (it would not say which parts it turned) and without merging free rectangles
// (which can lose the guillotine property); orientations are chosen before packing.

interface RpRect {
  x: number;
  y: number;
  width: number;
  height: number;
  t: number;
  rot: boolean;
}

const RP_SPLIT = [
  GuillotineBinPack.GuillotineSplitHeuristic.SplitShorterAxis,
  GuillotineBinPack.GuillotineSplitHeuristic.SplitLongerAxis,
  GuillotineBinPack.GuillotineSplitHeuristic.SplitShorterLeftoverAxis,
  GuillotineBinPack.GuillotineSplitHeuristic.SplitLongerLeftoverAxis,
  GuillotineBinPack.GuillotineSplitHeuristic.SplitMinimizeArea,
  GuillotineBinPack.GuillotineSplitHeuristic.SplitMaximizeArea,
];
const RP_CHOICE = [
  GuillotineBinPack.FreeRectChoiceHeuristic.RectBestAreaFit,
  GuillotineBinPack.FreeRectChoiceHeuristic.RectBestShortSideFit,
  GuillotineBinPack.FreeRectChoiceHeuristic.RectBestLongSideFit,
  GuillotineBinPack.FreeRectChoiceHeuristic.RectBestAreaFit,
];

function rectanglePackerFill(
  ctx: BinContext,
  counts: Int32Array,
  order: number[],
  p: GuillotineParams,
  weight: Float64Array,
  out: Placed[],
  freeOut?: Free[],
): number {
  const rects: RpRect[] = [];
  const left = counts.slice();
  for (const t of order) {
    if (left[t] <= 0) continue;
    const os = ctx.orients[t];
    if (os.length === 0) continue;
    let o = os[0];
    for (const q of os) if (p.orient === 1 ? q.h > o.h : q.w > o.w) o = q;
    rects.push({ x: 0, y: 0, width: o.w, height: o.h, t, rot: o.rot });
    left[t]--;
  }
  const bp = new GuillotineBinPack<RpRect>(ctx.W, ctx.H, false);
  bp.InsertSizes(rects, false, RP_CHOICE[p.rectChoice], RP_SPLIT[p.split]);
  let packed = 0;
  for (const r of bp.usedRectangles) {
    out.push({ t: r.t, x: r.x, y: r.y, w: r.width, h: r.height, rot: r.rot });
    counts[r.t]--;
    packed += weight[r.t];
  }
  if (freeOut) {
    freeOut.length = 0;
    for (const f of bp.freeRectangles) freeOut.push({ x: f.x, y: f.y, w: f.width, h: f.height });
  }
  return packed;
}

// --- column filler: a knapsack picks the parts that fill one column's height best ---
// First cut x = a; the column [0, a) holds parts lying along x, stacked in y, chosen by a 0-1
// knapsack on their widths (value: area) so the column's height is used nearly exactly; each
// row's remnant, the column's top and the rest of the panel [a, W) are then filled by the
// rectangle-driven guillotine filler. Long thin parts (longer than half the panel) cannot lie
// side by side, so stacking them in a column of about their length wastes least.

/** knapsack grid: at most this many cells (capacity × copies); sizes are rounded up to the grid */
const KNAP_CELLS = 60_000;

function gcd(a: number, b: number): number {
  while (b) [a, b] = [b, a % b];
  return a;
}

const transposedCtx = new WeakMap<BinContext, BinContext>();
function transpose(ctx: BinContext): BinContext {
  let t = transposedCtx.get(ctx);
  if (!t) {
    t = { W: ctx.H, H: ctx.W, stripMax: ctx.stripMax, orients: ctx.orients.map((os) => os.map((o) => ({ w: o.h, h: o.w, rot: o.rot }))) };
    transposedCtx.set(ctx, t);
  }
  return t;
}

function columnFill(
  ctx: BinContext,
  counts: Int32Array,
  order: number[],
  p: GuillotineParams,
  weight: Float64Array,
  out: Placed[],
  freeOut?: Free[],
): number {
  if (p.orient === 1) {
    const tc = transpose(ctx);
    const placed: Placed[] = [];
    const free: Free[] = [];
    const packed = columnFill(tc, counts, order, { ...p, orient: 0 }, weight, placed, free);
    for (const q of placed) out.push({ t: q.t, x: q.y, y: q.x, w: q.h, h: q.w, rot: q.rot });
    if (freeOut) {
      freeOut.length = 0;
      for (const f of free) freeOut.push({ x: f.y, y: f.x, w: f.h, h: f.w });
    }
    return packed;
  }
  const { W, H } = ctx;
  // candidate column widths: lengths of parts longer than half the panel
  const widths = new Set<number>();
  for (let t = 0; t < counts.length; t++) {
    if (counts[t] <= 0) continue;
    for (const o of ctx.orients[t]) if (o.w * 2 > W && o.h <= H) widths.add(o.w);
  }
  const startFree: Free[] = [];
  if (widths.size > 0) {
    const ws = [...widths].sort((a, b) => b - a);
    const a = ws[Math.round(((p.pick ?? 0) * (ws.length - 1)) / 3)];
    // copies that fit the column, each in its longest orientation no longer than a
    const items: { t: number; o: Orient }[] = [];
    for (const t of order.length ? [...new Set(order)] : []) {
      if (counts[t] <= 0) continue;
      let bo: Orient | null = null;
      for (const o of ctx.orients[t]) if (o.w <= a && o.h <= H && (!bo || o.w > bo.w)) bo = o;
      if (!bo) continue;
      const copies = Math.min(counts[t], Math.floor(H / bo.h));
      for (let c = 0; c < copies; c++) items.push({ t, o: bo });
    }
    if (items.length > 0) {
      let g = H;
      for (const it of items) g = gcd(g, it.o.h);
      let cap = Math.floor(H / g);
      if (cap * items.length > KNAP_CELLS) {
        // coarser grid: round heights up and the capacity down, so every choice still fits
        g = Math.ceil((H * items.length) / KNAP_CELLS);
        cap = Math.floor(H / g);
      }
      const size = items.map((it) => Math.ceil(it.o.h / g));
      const best = new Float64Array(cap + 1);
      const take = new Uint8Array(items.length * (cap + 1));
      for (let i = 0; i < items.length; i++) {
        const sz = size[i];
        const val = items[i].o.w * items[i].o.h;
        for (let c = cap; c >= sz; c--) {
          const v = best[c - sz] + val;
          if (v > best[c]) {
            best[c] = v;
            take[i * (cap + 1) + c] = 1;
          }
        }
      }
      const chosen: { t: number; o: Orient }[] = [];
      let c = cap;
      for (let i = items.length - 1; i >= 0; i--) {
        if (take[i * (cap + 1) + c]) {
          chosen.push(items[i]);
          c -= size[i];
        }
      }
      // longest first, so the row remnants widen towards the column's top
      chosen.sort((x, y) => y.o.w - x.o.w);
      let y = 0;
      let packed = 0;
      for (const { t, o } of chosen) {
        out.push({ t, x: 0, y, w: o.w, h: o.h, rot: o.rot });
        counts[t]--;
        packed += weight[t];
        if (a > o.w) startFree.push({ x: o.w, y, w: a - o.w, h: o.h });
        y += o.h;
      }
      if (H > y) startFree.push({ x: 0, y, w: a, h: H - y });
      if (W > a) startFree.push({ x: a, y: 0, w: W - a, h: H });
      return packed + guillotineRectFill(ctx, counts, order, p, weight, out, freeOut, startFree);
    }
  }
  return guillotineRectFill(ctx, counts, order, p, weight, out, freeOut);
}
