// Turns the placements of one panel into its ordered cut list and its leftovers, by
// splitting each piece at every edge-to-edge line that clears the kerf (stage by stage).
import type { CutKind } from "./types";

export interface RectUm {
  x: number;
  y: number;
  w: number; // along x
  h: number; // along y
}

export interface CutUm {
  stage: number;
  kind: CutKind;
  axis: "x" | "y";
  at: number;
  from: number;
  to: number;
  setting: number;
  trim: boolean;
  /** breadth-first piece index, for ordering */
  piece: number;
}

export interface PanelLayout {
  cuts: CutUm[];
  leftovers: RectUm[];
  kerfArea: number;
}

type Axis = "x" | "y";

interface Node {
  r: RectUm;
  parts: RectUm[];
  depth: number;
  axis: Axis;
}

function lo(r: RectUm, a: Axis) {
  return a === "x" ? r.x : r.y;
}
function len(r: RectUm, a: Axis) {
  return a === "x" ? r.w : r.h;
}
const other = (a: Axis): Axis => (a === "x" ? "y" : "x");

/** Groups of parts separated along `a` by gaps of at least the kerf, in order. */
function groupsAlong(parts: RectUm[], a: Axis, kerf: number): RectUm[][] {
  const s = parts.slice().sort((p, q) => lo(p, a) - lo(q, a));
  const out: RectUm[][] = [];
  let cur: RectUm[] = [];
  let end = -Infinity;
  for (const p of s) {
    if (cur.length && lo(p, a) >= end + kerf) {
      out.push(cur);
      cur = [];
    }
    cur.push(p);
    end = Math.max(end, lo(p, a) + len(p, a));
  }
  if (cur.length) out.push(cur);
  return out;
}

function sub(r: RectUm, a: Axis, from: number, to: number): RectUm {
  return a === "x" ? { x: from, y: r.y, w: to - from, h: r.h } : { x: r.x, y: from, w: r.w, h: to - from };
}

/**
 * stages 0: any guillotine pattern; 2: rips (y) then crosscuts (x); 3: breakdown crosscuts (x),
 * rips, crosscuts. A piece holding a single part is freed by trim cuts, which do not count as stages.
 * Throws when the placements are not guillotine-cuttable within the stages.
 */
export function layoutPanel(area: RectUm, parts: RectUm[], kerf: number, stages: 0 | 2 | 3): PanelLayout {
  const cuts: CutUm[] = [];
  const leftovers: RectUm[] = [];
  let kerfArea = 0;
  let piece = 0;
  const kindOf = (axis: Axis, depth: number, trim: boolean): CutKind => {
    if (stages === 3 && depth === 1 && !trim) return "breakdown";
    return axis === "y" ? "rip" : "crosscut";
  };
  // `end` bounds the kerf band: a cut that frees a part lying less than a kerf from the piece's
  // edge takes only the sliver between them (the blade runs partly past the edge), never the part
  const addCut = (r: RectUm, axis: Axis, at: number, pieceStart: number, depth: number, trim: boolean, idx: number, end = Infinity) => {
    const a0 = lo(r, axis);
    const a1 = a0 + len(r, axis);
    const band = Math.min(at + kerf, a1, end) - at;
    const cross = len(r, other(axis));
    kerfArea += band * cross;
    const from = lo(r, other(axis));
    cuts.push({ stage: depth, kind: kindOf(axis, depth, trim), axis, at, from, to: from + cross, setting: at - pieceStart, trim, piece: idx });
  };
  const queue: Node[] = [{ r: area, parts, depth: 1, axis: stages === 3 ? "x" : "y" }];
  for (let qi = 0; qi < queue.length; qi++) {
    const n = queue[qi];
    const idx = piece++;
    if (n.parts.length === 0) {
      if (n.r.w > 0 && n.r.h > 0) leftovers.push(n.r);
      continue;
    }
    let axis = n.axis;
    let groups = n.parts.length > 1 ? groupsAlong(n.parts, axis, kerf) : [n.parts];
    // one group that leaves waste beside it is still cut off at this stage (a strip from the sheet)
    const covers = (g: RectUm[], a: Axis) => {
      let gs = Infinity;
      let ge = -Infinity;
      for (const p of g) {
        gs = Math.min(gs, lo(p, a));
        ge = Math.max(ge, lo(p, a) + len(p, a));
      }
      return gs === lo(n.r, a) && ge === lo(n.r, a) + len(n.r, a);
    };
    if (n.parts.length > 1 && groups.length === 1 && covers(groups[0], axis)) {
      if (stages === 0) {
        axis = other(axis);
        groups = groupsAlong(n.parts, axis, kerf);
        if (groups.length === 1 && covers(groups[0], axis)) throw new Error("placements are not guillotine-cuttable");
      } else {
        if (n.depth >= stages) throw new Error(`placements need more than ${stages} stages`);
        queue.push({ r: n.r, parts: n.parts, depth: n.depth + 1, axis: other(axis) });
        piece--;
        continue;
      }
    } else if (n.parts.length > 1 && stages !== 0 && n.depth > stages) {
      throw new Error(`placements need more than ${stages} stages`);
    }
    const trim = n.parts.length === 1;
    if (trim) {
      const p = n.parts[0];
      if (p.x === n.r.x && p.y === n.r.y && p.w === n.r.w && p.h === n.r.h) continue;
      // free the part: cut both sides along the current axis, then the other axis
      let r = n.r;
      for (const a of [axis, other(axis)]) {
        const r0 = lo(r, a);
        const r1 = r0 + len(r, a);
        const p0 = lo(p, a);
        const p1 = p0 + len(p, a);
        if (p0 > r0) {
          const at = Math.max(r0, p0 - kerf);
          addCut(r, a, at, r0, n.depth, true, idx, p0);
          if (at > r0) leftovers.push(sub(r, a, r0, at));
        }
        if (p1 < r1) {
          addCut(r, a, p1, p0, n.depth, true, idx);
          if (p1 + kerf < r1) leftovers.push(sub(r, a, p1 + kerf, r1));
        }
        r = sub(r, a, p0, p1);
      }
      continue;
    }
    const r0 = lo(n.r, axis);
    const r1 = r0 + len(n.r, axis);
    let start = r0;
    for (let gi = 0; gi < groups.length; gi++) {
      const g = groups[gi];
      let gs = Infinity;
      let ge = -Infinity;
      for (const p of g) {
        gs = Math.min(gs, lo(p, axis));
        ge = Math.max(ge, lo(p, axis) + len(p, axis));
      }
      if (gi === 0 && gs > r0) {
        // waste before the first group
        const at = Math.max(r0, gs - kerf);
        addCut(n.r, axis, at, r0, n.depth, false, idx, gs);
        if (at > r0) queue.push({ r: sub(n.r, axis, r0, at), parts: [], depth: n.depth + 1, axis: other(axis) });
        start = gs;
      }
      queue.push({ r: sub(n.r, axis, start, ge), parts: g, depth: n.depth + 1, axis: other(axis) });
      if (ge < r1) {
        addCut(n.r, axis, ge, start, n.depth, false, idx);
        start = Math.min(ge + kerf, r1);
      } else start = r1;
    }
    if (start < r1) queue.push({ r: sub(n.r, axis, start, r1), parts: [], depth: n.depth + 1, axis: other(axis) });
  }
  cuts.sort((a, b) => a.stage - b.stage || a.piece - b.piece || a.at - b.at);
  return { cuts, leftovers, kerfArea };
}
