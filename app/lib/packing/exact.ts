// Exact guillotine feasibility for a few parts on one panel (stages 0: any nesting).
// Every guillotine packing splits by a first cut into two smaller guillotine packings, so the
// set of bounding boxes a part set can be packed into is built from its two-part splits:
// side by side (widths add, heights max) or stacked (heights add, widths max). Keeping only the
// Pareto-minimal boxes (the frontier) makes the test exact: the set fits the panel iff some box
// of its frontier does. Sizes are inflated (kerf included, see fill.ts), so kerf is respected.
import type { BinContext, Placed } from "./fill";

/** A box (w × h) a part set packs into: a single part (o = its orientation) or two halves. */
interface Box {
  w: number;
  h: number;
  /** leaf: orientation index into ctx.orients[t]; split: -1 */
  o: number;
  /** split: the first half's mask and the box index in each half, and whether they stand side by side */
  m1: number;
  i1: number;
  i2: number;
  side: boolean;
}

/** at most this many parts in one exact test: the work grows as 3^n */
export const EXACT_MAX_PARTS = 8;

/**
 * Frontiers of every subset of a list of parts, by bit mask. Parts can be pushed and popped at
 * the end: pushing the k-th part computes only the subsets that contain it.
 */
class MaskFrontiers {
  types: number[] = [];
  private f: Box[][] = [[]];
  private area: number[] = [0];

  constructor(
    private ctx: BinContext,
    private partArea: Float64Array,
    private count: { work: number },
  ) {}

  /** Adds a part; true when the whole list still fits the panel. */
  push(t: number): boolean {
    const { W, H } = this.ctx;
    const k = this.types.length;
    this.types.push(t);
    const bit = 1 << k;
    for (let m = bit; m < bit << 1; m++) {
      const a = this.area[m ^ bit] + this.partArea[t];
      this.area[m] = a;
      const cand: Box[] = [];
      if (m === bit) {
        this.ctx.orients[t].forEach((o, oi) => {
          if (o.w <= W && o.h <= H) cand.push({ w: o.w, h: o.h, o: oi, m1: 0, i1: 0, i2: 0, side: false });
        });
      } else if (a <= W * H) {
        // halves: s1 holds the new part, s2 the rest (each split seen once)
        const rest = m ^ bit;
        for (let sub = rest; ; sub = (sub - 1) & rest) {
          const s1 = sub | bit;
          const s2 = m ^ s1;
          if (s2 !== 0) {
            const f1 = this.f[s1];
            const f2 = this.f[s2];
            if (f1.length && f2.length) {
              for (let i1 = 0; i1 < f1.length; i1++) {
                const b1 = f1[i1];
                for (let i2 = 0; i2 < f2.length; i2++) {
                  const b2 = f2[i2];
                  const sw = b1.w + b2.w;
                  if (sw <= W) cand.push({ w: sw, h: b1.h > b2.h ? b1.h : b2.h, o: -1, m1: s1, i1, i2, side: true });
                  const sh = b1.h + b2.h;
                  if (sh <= H) cand.push({ w: b1.w > b2.w ? b1.w : b2.w, h: sh, o: -1, m1: s1, i1, i2, side: false });
                }
              }
            }
          }
          if (sub === 0) break;
        }
      }
      this.f[m] = pareto(cand);
      this.count.work += cand.length + 1;
    }
    return this.f[(bit << 1) - 1].length > 0;
  }

  pop() {
    this.types.pop();
  }

  /** Placements of the whole list (which must fit), lower-left corner at (x, y). */
  emit(m: number, i: number, x: number, y: number, out: Placed[]) {
    const b = this.f[m][i];
    if (b.o >= 0) {
      const t = this.types[31 - Math.clz32(m)];
      const o = this.ctx.orients[t][b.o];
      out.push({ t, x, y, w: o.w, h: o.h, rot: o.rot });
      return;
    }
    const first = this.f[b.m1][b.i1];
    this.emit(b.m1, b.i1, x, y, out);
    const m2 = m ^ b.m1;
    if (b.side) this.emit(m2, b.i2, x + first.w, y, out);
    else this.emit(m2, b.i2, x, y + first.h, out);
  }

  placeAll(): Placed[] {
    const out: Placed[] = [];
    this.emit((1 << this.types.length) - 1, 0, 0, 0, out);
    return out;
  }
}

/** Pareto filter: by width, then keep boxes strictly lower than every narrower one. */
function pareto(cand: Box[]): Box[] {
  if (cand.length <= 1) return cand;
  cand.sort((p, q) => p.w - q.w || p.h - q.h);
  const f: Box[] = [];
  let minH = Infinity;
  for (const b of cand) {
    if (b.h < minH) {
      f.push(b);
      minH = b.h;
    }
  }
  return f;
}

export class ExactFit {
  private memo = new Map<string, boolean>();
  readonly area: Float64Array;
  /** boxes considered, a measure of the work done */
  readonly count = { work: 0 };

  /** maxParts: larger sets are refused unchecked (the work grows as 3^n) */
  constructor(
    readonly ctx: BinContext,
    readonly maxParts = EXACT_MAX_PARTS,
  ) {
    const n = ctx.orients.length;
    this.area = new Float64Array(n);
    for (let t = 0; t < n; t++) {
      const o = ctx.orients[t][0];
      this.area[t] = o ? o.w * o.h : Infinity;
    }
  }

  get work() {
    return this.count.work;
  }

  /** A fresh incremental frontier table for this panel. */
  frontiers(): MaskFrontiers {
    return new MaskFrontiers(this.ctx, this.area, this.count);
  }

  /** Whether one part of the type fits the panel at all. */
  fitsAlone(t: number): boolean {
    return this.ctx.orients[t].some((o) => o.w <= this.ctx.W && o.h <= this.ctx.H);
  }

  /** Whether the parts (type ids, repeats allowed) fit the panel in a guillotine pattern. */
  fits(types: number[]): boolean {
    if (types.length === 0) return true;
    if (types.length > this.maxParts) return false;
    let a = 0;
    for (const t of types) a += this.area[t];
    if (a > this.ctx.W * this.ctx.H) return false;
    const s = types.slice().sort((x, y) => x - y);
    const key = String.fromCharCode(...s);
    const hit = this.memo.get(key);
    if (hit !== undefined) return hit;
    const mf = this.frontiers();
    let ok = true;
    for (const t of s) if (!mf.push(t)) {
      ok = false;
      break;
    }
    if (this.memo.size > 200_000) this.memo.clear();
    this.memo.set(key, ok);
    return ok;
  }

  /** A guillotine placement of the parts, or null when they do not fit. */
  place(types: number[]): Placed[] | null {
    if (types.length > this.maxParts) return null;
    if (types.length === 0) return [];
    const mf = this.frontiers();
    for (const t of types) if (!mf.push(t)) return null;
    return mf.placeAll();
  }
}

/**
 * Fill one panel as fully as possible (by packed weight) from the pool, the pool's heaviest part
 * first: a depth-first search over part sets in decreasing weight, each extension checked by the
 * exact test. A set that does not fit has no superset that fits, so failing branches are cut.
 * Stops after `nodeLimit` tests or at a full panel. Returns the chosen parts (type ids).
 */
export function fullestFill(
  exact: ExactFit,
  pool: Int32Array,
  weight: Float64Array,
  cap: number,
  nodeLimit: number,
  first = -1,
  value: Float64Array = weight,
  stop: () => boolean = () => false,
): number[] {
  const types: number[] = [];
  for (let t = 0; t < pool.length; t++) if (pool[t] > 0 && exact.fitsAlone(t)) types.push(t);
  types.sort((a, b) => value[b] - value[a] || a - b);
  if (types.length === 0) return [];
  const lead = first >= 0 && pool[first] > 0 && exact.fitsAlone(first) ? first : types[0];
  const left = pool.slice();
  left[lead]--;
  // suffix sums of what could still be added, for the bound
  const suffix = new Float64Array(types.length + 1);
  for (let i = types.length - 1; i >= 0; i--) suffix[i] = suffix[i + 1] + value[types[i]] * left[types[i]];
  const mf = exact.frontiers();
  mf.push(lead);
  const cur = [lead];
  let curW = weight[lead];
  let curV = value[lead];
  let best = cur.slice();
  let bestV = curV;
  let bestW = curW;
  let nodes = 0;
  const dfs = (from: number) => {
    for (let i = from; i < types.length; i++) {
      if (nodes >= nodeLimit || bestW >= cap || ((nodes & 15) === 15 && stop())) return;
      if (curV + suffix[i] <= bestV) return;
      const t = types[i];
      if (left[t] <= 0 || curW + weight[t] > cap) continue;
      if (cur.length >= EXACT_MAX_PARTS) return;
      cur.push(t);
      nodes++;
      if (mf.push(t)) {
        left[t]--;
        curW += weight[t];
        curV += value[t];
        if (curV > bestV) {
          bestV = curV;
          bestW = curW;
          best = cur.slice();
        }
        // the same type again first (repeats), then lighter ones
        dfs(i);
        curW -= weight[t];
        curV -= value[t];
        left[t]++;
      }
      mf.pop();
      cur.pop();
    }
  };
  dfs(0);
  return best;
}
