// Tiling search (stages 0): fills ONE panel from a multiset of parts in a guillotine pattern with
// at most a given waste area. Depth-first: the first pending rectangle gets a part in its corner,
// then one of the two guillotine cuts along that part's edges (the rest of the part's strip is
// filled first, then the rest of the rectangle), or is declared waste while the waste allowance
// lasts. Little waste makes the pruning strong: a rectangle no remaining part fits in is waste at
// once, a side that no sum of part sides reaches leaves a known sliver of waste, and the remaining
// parts must cover what is pending. Failed states (pending rectangles, remaining parts) are
// remembered with the waste they failed on. Sizes are inflated (fill.ts), so kerf and trim hold.
import type { BinContext, Placed } from "./fill";
import { mulberry32 } from "./prng";

export interface TilingOptions {
  /** most waste (inflated µm²) the panel may keep */
  maxWaste: number;
  /** asked now and then: true ends the search */
  stop?: () => boolean;
  /** most search nodes before giving up */
  nodeLimit?: number;
  /** a shuffled dive: part classes in a randomly perturbed biggest-first order */
  rng?: () => number;
  /** how much the order is perturbed (share of a class's area), default 0.5 */
  noise?: number;
}

export type TilingResult =
  | { status: "found"; placed: Placed[]; counts: Int32Array; waste: number }
  /** the search space is exhausted: for tileExactly a proof that no such pattern exists; tilePanel looks
   * only at patterns where every rectangle has a cut along its corner part's edge, so there it proves nothing */
  | { status: "none" }
  /** stopped or out of nodes */
  | { status: "stopped" };

/** parts with the same allowed sizes are one class: choosing among them is pointless */
interface PartClass {
  /** allowed (w, h), each once */
  sizes: { w: number; h: number }[];
  area: number;
  members: number[];
}

/** largest memo before it is cleared */
const MEMO_MAX = 400_000;
/** block sets up to this size are remembered by their exact key too */
const EXACT_KEY_MAX = 64;
/** most work (side length in units of the sides' gcd × distinct sides) for the reachable-sums table */
const REACH_MAX = 20_000_000;

function gcd(a: number, b: number): number {
  while (b) [a, b] = [b, a % b];
  return a;
}

/** 32-bit mix of two integers (for the order-free hash of the pending rectangles) */
function mix(a: number, b: number, seed: number): number {
  let h = Math.imul(a ^ seed, 0x9e3779b1) ^ Math.imul(b + seed, 0x85ebca77);
  h ^= h >>> 15;
  h = Math.imul(h, 0xc2b2ae3d);
  return (h ^ (h >>> 13)) >>> 0;
}

export function tilePanel(ctx: BinContext, avail: Int32Array, opts: TilingOptions): TilingResult {
  const { W, H } = ctx;
  const stop = opts.stop ?? (() => false);
  const nodeLimit = opts.nodeLimit ?? Infinity;

  // classes of parts with the same allowed sizes, biggest first
  const byKey = new Map<string, PartClass>();
  for (let t = 0; t < avail.length; t++) {
    if (avail[t] <= 0) continue;
    const sizes = ctx.orients[t].filter((o) => o.w <= W && o.h <= H).map((o) => ({ w: o.w, h: o.h }));
    if (sizes.length === 0) continue;
    sizes.sort((a, b) => a.w - b.w || a.h - b.h);
    const key = sizes.map((s) => `${s.w}x${s.h}`).join(",");
    let c = byKey.get(key);
    if (!c) byKey.set(key, (c = { sizes, area: sizes[0].w * sizes[0].h, members: [] }));
    for (let i = 0; i < avail[t]; i++) c.members.push(t);
  }
  // biggest first; a shuffled dive scales each area by a random factor
  const keyOf = new Map<PartClass, number>();
  for (const c of byKey.values()) keyOf.set(c, c.area * (opts.rng ? 1 + (opts.noise ?? 0.5) * (opts.rng() - 0.5) : 1));
  const classes = [...byKey.values()].sort(
    (a, b) => keyOf.get(b)! - keyOf.get(a)! || Math.max(b.sizes[0].w, b.sizes[0].h) - Math.max(a.sizes[0].w, a.sizes[0].h),
  );
  const nC = classes.length;
  const cnt = new Int32Array(nC);
  classes.forEach((c, i) => (cnt[i] = c.members.length));
  const area = classes.map((c) => c.area);
  let restArea = 0;
  for (let c = 0; c < nC; c++) restArea += cnt[c] * area[c];

  // largest sum of part sides (any repetition) not above x: a side it does not reach leaves waste
  let unit = gcd(W, H);
  for (const c of classes) for (const s of c.sizes) unit = gcd(gcd(unit, s.w), s.h);
  const span = Math.floor(Math.max(W, H) / unit);
  const sides = [...new Set(classes.flatMap((c) => c.sizes.flatMap((s) => [s.w / unit, s.h / unit])))];
  let reach: Int32Array | null = null;
  if (span * Math.min(sides.length, 64) <= REACH_MAX) {
    const ok = new Uint8Array(span + 1);
    ok[0] = 1;
    for (let x = 1; x <= span; x++) for (const s of sides) if (s <= x && ok[x - s]) { ok[x] = 1; break; }
    reach = new Int32Array(span + 1);
    for (let x = 1; x <= span; x++) reach[x] = ok[x] ? x : reach[x - 1];
  }
  const reached = (x: number) => (reach ? reach[Math.floor(x / unit)] * unit : x);

  // hash of the state: remaining parts and pending rectangles, both order-free
  const classHash = Array.from({ length: nC }, (_, c) => mix(c, 7, 0x1234567));
  const classHash2 = Array.from({ length: nC }, (_, c) => mix(c, 11, 0x7654321));
  let h1 = 0;
  let h2 = 0;
  const memo = new Map<number, number>();
  const stateKey = () => (h1 >>> 0) * 0x100000 + ((h2 >>> 0) & 0xfffff);

  // pending rectangles: a stack (x, y, w, h)
  const stack: number[] = [];
  const pushRect = (x: number, y: number, w: number, h: number) => {
    stack.push(x, y, w, h);
    h1 = (h1 + mix(w, h, 0xabc)) | 0;
    h2 = (h2 + mix(w, h, 0xdef)) | 0;
  };
  const popRect = () => {
    const h = stack.pop()!;
    const w = stack.pop()!;
    stack.length -= 2;
    h1 = (h1 - mix(w, h, 0xabc)) | 0;
    h2 = (h2 - mix(w, h, 0xdef)) | 0;
  };
  const take = (c: number) => {
    cnt[c]--;
    restArea -= area[c];
    h1 = (h1 - classHash[c]) | 0;
    h2 = (h2 - classHash2[c]) | 0;
  };
  const give = (c: number) => {
    cnt[c]++;
    restArea += area[c];
    h1 = (h1 + classHash[c]) | 0;
    h2 = (h2 + classHash2[c]) | 0;
  };

  const out: { c: number; x: number; y: number; w: number; h: number }[] = [];
  let wasteLeft = opts.maxWaste;
  let pendingArea = W * H;
  let nodes = 0;
  let halted = false;

  const solve = (): boolean => {
    if (stack.length === 0) return true;
    if (halted) return false;
    if (++nodes > nodeLimit || ((nodes & 1023) === 0 && stop())) {
      halted = true;
      return false;
    }
    // the remaining parts must cover what is pending, less the waste still allowed
    if (pendingArea - wasteLeft > restArea) return false;
    const key = stateKey();
    const failedAt = memo.get(key);
    if (failedAt !== undefined && failedAt >= wasteLeft) return false;

    const n = stack.length;
    const x = stack[n - 4];
    const y = stack[n - 3];
    const w = stack[n - 2];
    const h = stack[n - 1];
    const a = w * h;
    // a side no sum of part sides reaches leaves a sliver of waste along it
    const sliver = Math.max((w - reached(w)) * h, (h - reached(h)) * w);
    if (sliver > wasteLeft) return remember(key);
    popRect();
    pendingArea -= a;

    let found = false;
    // two passes: parts that span the rectangle's width or height first, then the rest
    for (let pass = 0; pass < 2 && !found && !halted; pass++) {
      for (let c = 0; c < nC && !found && !halted; c++) {
        if (cnt[c] === 0) continue;
        for (const s of classes[c].sizes) {
          if (s.w > w || s.h > h) continue;
          const spans = s.w === w || s.h === h;
          if (spans !== (pass === 0)) continue;
          take(c);
          out.push({ c, x, y, w: s.w, h: s.h });
          found = tryCuts(x, y, w, h, s.w, s.h, area[c]);
          if (!found) {
            out.pop();
            give(c);
          }
          if (found || halted) break;
        }
      }
    }
    // the whole rectangle as waste: at once where nothing fits, else as the last choice
    if (!found && !halted && a <= wasteLeft) {
      wasteLeft -= a;
      found = solve();
      if (!found) wasteLeft += a;
    }
    if (found) return true;
    pendingArea += a;
    pushRect(x, y, w, h);
    if (halted) return false;
    return remember(key);
  };

  const remember = (key: number): false => {
    if (memo.size >= MEMO_MAX) memo.clear();
    const prev = memo.get(key);
    if (prev === undefined || prev < wasteLeft) memo.set(key, wasteLeft);
    return false;
  };

  /** The part (pw × ph) sits in the corner of (w × h): cut along its right edge or its top edge. */
  const tryCuts = (x: number, y: number, w: number, h: number, pw: number, ph: number, pa: number): boolean => {
    // pending area already excludes the whole rectangle; add back what is left to fill
    const rest = w * h - pa;
    pendingArea += rest;
    const fill = (r1: number[] | null, r2: number[] | null): boolean => {
      // r1 is filled first: pushed last
      if (r2) pushRect(r2[0], r2[1], r2[2], r2[3]);
      if (r1) pushRect(r1[0], r1[1], r1[2], r1[3]);
      const ok = solve();
      if (!ok) {
        if (r1) popRect();
        if (r2) popRect();
      }
      return ok;
    };
    let ok = false;
    if (pw === w && ph === h) ok = fill(null, null);
    else if (pw === w) ok = fill([x, y + ph, w, h - ph], null);
    else if (ph === h) ok = fill([x + pw, y, w - pw, h], null);
    else {
      // cut along the part's right edge: its column above it, then the rest to the right
      ok = fill([x, y + ph, pw, h - ph], [x + pw, y, w - pw, h]);
      // cut along its top edge: its row to the right, then the rest above
      if (!ok && !halted) ok = fill([x + pw, y, w - pw, ph], [x, y + ph, w, h - ph]);
    }
    if (!ok) pendingArea -= rest;
    return ok;
  };

  // the panel is the first pending rectangle (its area is pendingArea already)
  stack.push(0, 0, W, H);
  h1 = (h1 + mix(W, H, 0xabc)) | 0;
  h2 = (h2 + mix(W, H, 0xdef)) | 0;
  for (let c = 0; c < nC; c++) {
    h1 = (h1 + cnt[c] * classHash[c]) | 0;
    h2 = (h2 + cnt[c] * classHash2[c]) | 0;
  }
  const usedBefore = restArea;
  if (!solve()) return halted ? { status: "stopped" } : { status: "none" };

  // classes back to part types, each with the orientation of its size
  const counts = new Int32Array(avail.length);
  const next = new Int32Array(nC);
  const placed: Placed[] = out.map((p) => {
    const t = classes[p.c].members[next[p.c]++];
    counts[t]++;
    const o = ctx.orients[t].find((o) => o.w === p.w && o.h === p.h)!;
    return { t, x: p.x, y: p.y, w: p.w, h: p.h, rot: o.rot };
  });
  return { status: "found", placed, counts, waste: W * H - (usedBefore - restArea) };
}

/** A block of parts packed exactly (no waste): a part, or two blocks joined along an equal side. */
interface Block {
  w: number;
  h: number;
  /** every part in it may turn, so the block may turn */
  turn: boolean;
  hash: number;
  hash2: number;
  /** leaf: the part class; join: -1 */
  c: number;
  a?: Block;
  b?: Block;
  /** join: a and b as laid in the join's own frame (turned or not), b beside a (along x) or above it */
  aTurned?: boolean;
  bTurned?: boolean;
  beside?: boolean;
  /** stored w × h is the join's own frame transposed (turnable blocks are kept with w ≥ h) */
  flip?: boolean;
}

const blockHash = (w: number, h: number, turn: boolean) => (mix(w, h, turn ? 0x51 : 0x77) + Math.imul(mix(h, w, 0x3f), 3)) | 0;

/**
 * Exact tiling, bottom up: every guillotine pattern without waste joins, at each cut, two blocks
 * with an equal side, so joining blocks with equal sides from the parts up finds every such
 * pattern; the parts' sides rarely match by chance, so few joins are possible at each step.
 * Finds a pattern of ALL the parts (no waste inside it) that fits the panel, if the search ends
 * within its limits. Failed sets of blocks are remembered.
 */
export function tileExactly(ctx: BinContext, avail: Int32Array, opts: { stop?: () => boolean; nodeLimit?: number } = {}): TilingResult {
  const { W, H } = ctx;
  const stop = opts.stop ?? (() => false);
  const nodeLimit = opts.nodeLimit ?? Infinity;
  const fits = (w: number, h: number, turn: boolean) => (w <= W && h <= H) || (turn && h <= W && w <= H);
  const make = (w: number, h: number, turn: boolean, c: number): Block => {
    if (turn && w < h) [w, h] = [h, w];
    return { w, h, turn, hash: blockHash(w, h, turn), hash2: mix(w * 3 + (turn ? 1 : 0), h, 0x2468ace), c };
  };
  const blocks: Block[] = [];
  for (let t = 0; t < avail.length; t++) {
    if (avail[t] <= 0) continue;
    const sizes = ctx.orients[t].filter((o) => o.w <= W && o.h <= H);
    if (sizes.length === 0) return { status: "none" };
    const o = sizes[0];
    const turn = sizes.length > 1 || o.w === o.h;
    for (let i = 0; i < avail[t]; i++) blocks.push(make(o.w, o.h, turn, t));
  }
  if (blocks.length === 0) return { status: "none" };
  let stateHash = 0;
  let stateHash2 = 0;
  for (const b of blocks) {
    stateHash = (stateHash + b.hash) | 0;
    stateHash2 = (stateHash2 + b.hash2) | 0;
  }
  // failed block sets by a 53-bit hash; small sets also by their exact key, so that "none" is a
  // proof unless a hash alone ever cut a branch
  const failed = new Map<number, string | null>();
  let hashOnly = false;
  const memoKey = () => (stateHash >>> 0) * 0x200000 + ((stateHash2 >>> 0) & 0x1fffff);
  const exactKey = () => (blocks.length <= EXACT_KEY_MAX ? blocks.map((b) => `${b.w}x${b.h}${b.turn ? "t" : ""}`).sort().join(",") : null);
  let nodes = 0;
  let halted = false;

  /** Distinct joins of two blocks, each as a new block (not yet hashed into the state). */
  const joins = (A: Block, B: Block): Block[] => {
    const out: Block[] = [];
    const seen = new Set<string>();
    const aOpts: [number, number, boolean][] = [[A.w, A.h, false]];
    if (A.turn && A.w !== A.h) aOpts.push([A.h, A.w, true]);
    const bOpts: [number, number, boolean][] = [[B.w, B.h, false]];
    if (B.turn && B.w !== B.h) bOpts.push([B.h, B.w, true]);
    const turn = A.turn && B.turn;
    for (const [aw, ah, at] of aOpts)
      for (const [bw, bh, bt] of bOpts)
        for (const beside of [true, false]) {
          if (beside ? ah !== bh : aw !== bw) continue;
          const w = beside ? aw + bw : aw;
          const h = beside ? ah : ah + bh;
          if (!fits(w, h, turn)) continue;
          const blk = make(w, h, turn, -1);
          const k = `${blk.w}x${blk.h}`;
          if (seen.has(k)) continue;
          seen.add(k);
          Object.assign(blk, { a: A, b: B, aTurned: at, bTurned: bt, beside, flip: blk.w !== w });
          out.push(blk);
        }
    return out;
  };

  const solve = (): Block | null => {
    if (blocks.length === 1) return fits(blocks[0].w, blocks[0].h, blocks[0].turn) ? blocks[0] : null;
    if (halted) return null;
    if (++nodes > nodeLimit || ((nodes & 255) === 0 && stop())) {
      halted = true;
      return null;
    }
    const mk = memoKey();
    const seen = failed.get(mk);
    if (seen === null) {
      hashOnly = true;
      return null;
    }
    if (seen !== undefined && seen === exactKey()) return null;
    // blocks by side: a pair can join only along a side they share
    const bySide = new Map<number, number[]>();
    blocks.forEach((b, i) => {
      for (const s of b.turn && b.w !== b.h ? [b.w, b.h] : b.turn ? [b.w] : [b.w, b.h]) {
        let l = bySide.get(s);
        if (!l) bySide.set(s, (l = []));
        if (l[l.length - 1] !== i) l.push(i);
      }
    });
    // rarest shared sides first: a side only two blocks have is most likely a real cut
    const sides = [...bySide.entries()].filter(([, l]) => l.length >= 2).sort((p, q) => p[1].length - q[1].length || q[0] - p[0]);
    const tried = new Set<string>();
    for (const [, l] of sides) {
      for (let i = 0; i < l.length; i++)
        for (let j = i + 1; j < l.length; j++) {
          const A = blocks[l[i]];
          const B = blocks[l[j]];
          // identical pairs of blocks give identical states
          const ka = `${A.w}x${A.h}${A.turn ? "t" : ""}`;
          const kb = `${B.w}x${B.h}${B.turn ? "t" : ""}`;
          const pk = ka < kb ? `${ka},${kb}` : `${kb},${ka}`;
          if (tried.has(pk)) continue;
          tried.add(pk);
          for (const J of joins(A, B)) {
            // ia < ib: J takes A's place, B leaves
            const ia = l[i];
            const ib = l[j];
            blocks[ia] = J;
            blocks.splice(ib, 1);
            stateHash = (stateHash - A.hash - B.hash + J.hash) | 0;
            stateHash2 = (stateHash2 - A.hash2 - B.hash2 + J.hash2) | 0;
            const r = solve();
            if (r) return r;
            stateHash = (stateHash + A.hash + B.hash - J.hash) | 0;
            stateHash2 = (stateHash2 + A.hash2 + B.hash2 - J.hash2) | 0;
            blocks.splice(ib, 0, B);
            blocks[ia] = A;
            if (halted) return null;
          }
        }
    }
    if (failed.size >= MEMO_MAX) failed.clear();
    failed.set(mk, exactKey());
    return null;
  };
  const top = solve();
  if (!top) return halted || hashOnly ? { status: "stopped" } : { status: "none" };

  const placed: Placed[] = [];
  const counts = new Int32Array(avail.length);
  const place = (b: Block, x: number, y: number, turned: boolean) => {
    if (b.c >= 0) {
      const [w, h] = turned ? [b.h, b.w] : [b.w, b.h];
      const o = ctx.orients[b.c].find((o) => o.w === w && o.h === h)!;
      placed.push({ t: b.c, x, y, w, h, rot: o.rot });
      counts[b.c]++;
      return;
    }
    const T = turned !== b.flip;
    const A = b.a!;
    const aw = b.aTurned ? A.h : A.w;
    const ah = b.aTurned ? A.w : A.h;
    place(A, x, y, b.aTurned !== T);
    const [du, dv] = b.beside ? [aw, 0] : [0, ah];
    place(b.b!, x + (T ? dv : du), y + (T ? du : dv), b.bTurned !== T);
  };
  const turnTop = !(top.w <= W && top.h <= H);
  place(top, 0, 0, turnTop);
  let used = 0;
  for (const p of placed) used += p.w * p.h;
  return { status: "found", placed, counts, waste: W * H - used };
}

/** the tiling search applies where the panels at the bound would keep at most this share as waste */
export const TILING_MAX_SLACK = 0.03;
/** share of the time the exact bottom-up search gets before the corner search */
const EXACT_SHARE = 0.7;
/** shuffled dives of the corner search: nodes each, and most of them per panel */
const DIVE_NODES = 3000;
const MAX_DIVES = 2000;

export interface TilingPanels {
  /** panels filled (exactly `panels` of them), or null */
  panels: { placed: Placed[]; counts: Int32Array }[] | null;
  /** a lower bound on panels: `panels + 1` where one panel is proven impossible */
  bound: number;
}

/**
 * Tries to put every part onto `panels` panels that together keep at most the waste the bound
 * leaves: one panel after another, each by the tiling search with the waste still allowed. With
 * one panel and no waste at all, the exact bottom-up search goes first; when it exhausts its tree
 * one panel is impossible. Returns at once where the panels would keep more waste than
 * TILING_MAX_SLACK of their area.
 */
export function tileToBound(ctx: BinContext, demand: Int32Array, panels: number, now: () => number, deadline: number, nodeLimit: number): TilingPanels {
  const A = ctx.W * ctx.H;
  let area = 0;
  for (let t = 0; t < demand.length; t++) {
    if (demand[t] === 0) continue;
    if (ctx.orients[t].length === 0) return { panels: null, bound: panels };
    area += demand[t] * ctx.orients[t][0].w * ctx.orients[t][0].h;
  }
  let slack = panels * A - area;
  if (panels < 1 || slack < 0 || slack > TILING_MAX_SLACK * panels * A) return { panels: null, bound: panels };
  const t0 = now();
  const stop = () => now() > deadline;
  const rng = mulberry32(panels * 7919 + demand.length);
  if (panels === 1 && slack === 0) {
    const exactEnd = t0 + (deadline - t0) * EXACT_SHARE;
    const r = tileExactly(ctx, demand, { stop: () => now() > exactEnd, nodeLimit: nodeLimit / 2 });
    if (r.status === "found") return { panels: [{ placed: r.placed, counts: r.counts }], bound: 1 };
    if (r.status === "none") return { panels: null, bound: 2 };
  }
  const left = demand.slice();
  const out: { placed: Placed[]; counts: Int32Array }[] = [];
  for (let k = 0; k < panels; k++) {
    if (stop()) return { panels: null, bound: panels };
    // a panel without waste first (it leaves the others all the slack), then with all of it: one
    // dive in biggest-first order, then short shuffled dives (a deep wrong choice dooms a long one)
    const share = nodeLimit / panels;
    const panelEnd = now() + (deadline - now()) / (panels - k);
    const half = now() + (panelEnd - now()) / 2;
    const stopHalf = () => now() > half;
    let r: TilingResult = k < panels - 1 && slack > 0 ? tilePanel(ctx, left, { maxWaste: 0, stop: stopHalf, nodeLimit: share / 4 }) : { status: "stopped" };
    if (r.status !== "found") r = tilePanel(ctx, left, { maxWaste: slack, stop: stopHalf, nodeLimit: share / 2 });
    for (let dive = 0; r.status === "stopped" && dive < MAX_DIVES && now() < panelEnd; dive++)
      r = tilePanel(ctx, left, { maxWaste: slack, stop: () => now() > panelEnd, nodeLimit: DIVE_NODES, rng });
    if (r.status !== "found") return { panels: null, bound: panels };
    for (let t = 0; t < left.length; t++) left[t] -= r.counts[t];
    slack -= r.waste;
    out.push({ placed: r.placed, counts: r.counts });
  }
  return left.every((n) => n === 0) ? { panels: out, bound: panels } : { panels: null, bound: panels };
}
