// Independent check of a plan against its job. It shares no placement or cut code with the
// engine: it re-derives everything from the job and the plan's placements.
import type { Job, Plan } from "./types";

export interface ValidationResult {
  ok: boolean;
  errors: string[];
}

const um = (mm: number) => Math.round(mm * 1000);

interface Box {
  x0: number;
  y0: number;
  x1: number;
  y1: number;
}

function separate(boxes: Box[], axis: "x" | "y", kerf: number): Box[][] {
  const a0 = axis === "x" ? (b: Box) => b.x0 : (b: Box) => b.y0;
  const a1 = axis === "x" ? (b: Box) => b.x1 : (b: Box) => b.y1;
  const sorted = [...boxes].sort((p, q) => a0(p) - a0(q));
  const groups: Box[][] = [[sorted[0]]];
  let reach = a1(sorted[0]);
  for (let i = 1; i < sorted.length; i++) {
    const b = sorted[i];
    if (a0(b) - reach >= kerf) groups.push([b]);
    else groups[groups.length - 1].push(b);
    reach = Math.max(reach, a1(b));
  }
  return groups;
}

/**
 * Is there a guillotine cutting of these boxes (each cut edge to edge, kerf wide) within `stages`
 * alternations? stages 0 = unlimited; 2 = first cuts along y; 3 = first cuts along x.
 * A piece with a single part is freed by trim cuts that are not counted.
 */
function guillotine(boxes: Box[], kerf: number, stages: number, depth: number, axis: "x" | "y" | null): boolean {
  if (boxes.length <= 1) return true;
  if (stages > 0 && depth > stages) return false;
  const axes: ("x" | "y")[] = axis ? [axis] : ["y", "x"];
  for (const a of axes) {
    const g = separate(boxes, a, kerf);
    const next = a === "x" ? "y" : "x";
    if (g.length > 1) return g.every((part) => guillotine(part, kerf, stages, depth + 1, stages > 0 ? next : null));
    if (stages > 0) return guillotine(boxes, kerf, stages, depth + 1, next);
  }
  return false;
}

export function validatePlan(job: Job, plan: Plan): ValidationResult {
  const errors: string[] = [];
  const kerf = um(job.kerf);
  const trim = um(job.trim);
  const stocks = new Map(job.stock.map((s) => [s.id, s]));
  const parts = new Map(job.parts.map((p) => [p.id, p]));
  const placedCount = new Map<string, number>();
  const stockUse = new Map<string, number>();

  plan.sheets.forEach((sheet, si) => {
    const where = `sheet ${si + 1} (${sheet.stockId})`;
    const stock = stocks.get(sheet.stockId);
    if (!stock) {
      errors.push(`${where}: unknown stock id`);
      return;
    }
    stockUse.set(stock.id, (stockUse.get(stock.id) ?? 0) + 1);
    if (um(sheet.length) !== um(stock.length) || um(sheet.width) !== um(stock.width)) {
      errors.push(`${where}: size ${sheet.length} × ${sheet.width} differs from the stock's ${stock.length} × ${stock.width}`);
    }
    const L = um(stock.length);
    const W = um(stock.width);
    const t = stock.trimmed ? trim : 0;
    const boxes: Box[] = [];
    sheet.placements.forEach((p, pi) => {
      const what = `${where}, placement ${pi + 1} (${p.partId})`;
      const part = parts.get(p.partId);
      if (!part) {
        errors.push(`${what}: unknown part id`);
        return;
      }
      placedCount.set(part.id, (placedCount.get(part.id) ?? 0) + 1);
      const pl = um(p.length);
      const pw = um(p.width);
      const ql = um(part.length);
      const qw = um(part.width);
      const asIs = pl === ql && pw === qw;
      const turned = pl === qw && pw === ql;
      if (p.rotated ? !turned : !asIs) errors.push(`${what}: placed size ${p.length} × ${p.width} does not match the part (rotated: ${p.rotated})`);
      if (p.rotated && ql !== qw && !part.rotate && stock.grain === "length") errors.push(`${what}: grain-locked part turned across the grain`);
      const b: Box = { x0: um(p.x), y0: um(p.y), x1: um(p.x) + pl, y1: um(p.y) + pw };
      if (b.x0 < t || b.y0 < t || b.x1 > L - t || b.y1 > W - t) errors.push(`${what}: outside the trimmed panel`);
      boxes.push(b);
    });
    // pairwise: overlapping, or closer than the kerf where they face each other
    for (let i = 0; i < boxes.length; i++) {
      for (let j = i + 1; j < boxes.length; j++) {
        const a = boxes[i];
        const b = boxes[j];
        const xo = a.x0 < b.x1 && b.x0 < a.x1;
        const yo = a.y0 < b.y1 && b.y0 < a.y1;
        const gx = Math.max(b.x0 - a.x1, a.x0 - b.x1);
        const gy = Math.max(b.y0 - a.y1, a.y0 - b.y1);
        if (xo && yo) errors.push(`${where}: placements ${i + 1} and ${j + 1} overlap`);
        else if (xo && gy < kerf) errors.push(`${where}: placements ${i + 1} and ${j + 1} are ${gy / 1000} mm apart, less than the kerf`);
        else if (yo && gx < kerf) errors.push(`${where}: placements ${i + 1} and ${j + 1} are ${gx / 1000} mm apart, less than the kerf`);
      }
    }
    if (boxes.length > 1 && !guillotine(boxes, kerf, job.stages, 1, job.stages === 2 ? "y" : job.stages === 3 ? "x" : null)) {
      errors.push(
        job.stages === 0
          ? `${where}: no guillotine cutting exists for the placements`
          : `${where}: no guillotine cutting within ${job.stages} stages exists for the placements`,
      );
    }
  });

  for (const [id, n] of stockUse) {
    const q = stocks.get(id)!.quantity;
    if (q !== null && n > q) errors.push(`stock ${id}: ${n} panels used, only ${q} in stock`);
  }
  const unplaced = new Map<string, number>();
  for (const u of plan.unplaced) unplaced.set(u.partId, (unplaced.get(u.partId) ?? 0) + u.quantity);
  for (const part of job.parts) {
    const placed = placedCount.get(part.id) ?? 0;
    const un = unplaced.get(part.id) ?? 0;
    if (placed + un !== part.quantity) {
      errors.push(`part ${part.id}: ${placed} placed + ${un} unplaced, but ${part.quantity} demanded`);
    }
  }
  for (const id of unplaced.keys()) if (!parts.has(id)) errors.push(`unplaced: unknown part id ${id}`);
  if (plan.metrics && plan.metrics.sheets !== plan.sheets.length) errors.push(`metrics.sheets ${plan.metrics.sheets} differs from ${plan.sheets.length} sheets`);
  return { ok: errors.length === 0, errors };
}
