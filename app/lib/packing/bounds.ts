// Lower bounds on the number of panels. Sizes are inflated by the kerf (see fill.ts).

export interface BoundItem {
  count: number;
  /** allowed orientations, inflated [along x, along y] */
  orients: [number, number][];
}

export interface BoundBin {
  W: number;
  H: number;
}

/** ceil(total item area / largest panel area) */
export function areaBound(items: BoundItem[], bins: BoundBin[]): number {
  let a = 0;
  for (const it of items) if (it.orients.length) a += it.count * it.orients[0][0] * it.orients[0][1];
  const cap = Math.max(0, ...bins.map((b) => b.W * b.H));
  if (a === 0 || cap === 0) return 0;
  return Math.ceil(a / cap - 1e-12);
}

/**
 * Items wider than half the panel in both directions, in every orientation and on every panel,
 * can't share a panel: no two of them are separable along x or along y.
 */
export function bigItemBound(items: BoundItem[], bins: BoundBin[]): number {
  let n = 0;
  for (const it of items) {
    const big = bins.every((b) => it.orients.every(([w, h]) => w > b.W / 2 && h > b.H / 2));
    if (big && it.orients.length) n += it.count;
  }
  return n;
}

/**
 * Dual-feasible-function bound (Fekete & Schepers) for one panel size, rotation-aware: each item
 * contributes the least of its orientations. f_k(x) = x when (k+1)x is integral, else floor((k+1)x)/k.
 */
export function dffBound(items: BoundItem[], bin: BoundBin): number {
  const fams: ((x: number) => number)[] = [(x) => x];
  for (let k = 1; k <= 8; k++) {
    fams.push((x) => {
      const v = (k + 1) * x;
      const r = Math.round(v);
      return Math.abs(v - r) < 1e-12 ? x : Math.floor(v) / k;
    });
  }
  // big-item families: an item over half counts 1, under eps counts 0, between keeps its size
  for (const eps of [0.1, 0.2, 0.25, 0.3, 0.34, 0.4, 0.45]) {
    fams.push((x) => (x > 1 - eps + 1e-12 ? 1 : x < eps - 1e-12 ? 0 : x));
  }
  let best = 0;
  for (const f of fams) {
    for (const g of fams) {
      let s = 0;
      for (const it of items) {
        if (!it.orients.length) continue;
        let m = Infinity;
        for (const [w, h] of it.orients) m = Math.min(m, f(w / bin.W) * g(h / bin.H));
        s += it.count * m;
      }
      best = Math.max(best, Math.ceil(s - 1e-9));
    }
  }
  return best;
}
