// Shop-scale bounds on a packing job, checked after its schema (which checks types and signs). Without
// them an absurd job exhausts the engine's memory (a billion parts ends the process, no error to
// catch), rounds parts below the micrometre grid to nothing, or leaves areas in µm² beyond exact doubles.
import type { Job } from "./packing/types";

/** The bounds, in the job's units (mm, ms). Generous for a sheet-goods shop: common practice, not a standard. */
export const JOB_LIMITS = {
  lengthMm: { min: 1, max: 10_000 }, // no panel a shop handles is longer than 10 m; no sawn part shorter than 1 mm
  kerfMm: 20, // table-saw blades take 2–5 mm, a wide dado stack about 20 mm
  trimMm: 500,
  partsPerJob: 100_000, // 100,000 parts plan in about 4 s and 260 MB on a 2-core machine (bin/pack, measured)
  listEntries: 10_000,
  timeLimitMs: 10 * 60_000,
};

export type JobLimitResult = { ok: true } | { ok: false; field: string; error: string };

/** Checks a parsed job against JOB_LIMITS; the error is one line, "field: problem", like parseJob's. */
export function checkJobLimits(job: Job): JobLimitResult {
  const fail = (field: string, problem: string): JobLimitResult => ({ ok: false, field, error: `${field}: ${problem}` });
  const { min, max } = JOB_LIMITS.lengthMm;
  const length = (field: string, mm: number) => (mm < min ? fail(field, `must be at least ${min} mm`) : mm > max ? fail(field, `must be at most ${max} mm`) : null);

  if (job.kerf > JOB_LIMITS.kerfMm) return fail("kerf", `must be at most ${JOB_LIMITS.kerfMm} mm`);
  if (job.trim > JOB_LIMITS.trimMm) return fail("trim", `must be at most ${JOB_LIMITS.trimMm} mm`);
  if (job.timeLimitMs > JOB_LIMITS.timeLimitMs) return fail("timeLimitMs", `must be at most ${JOB_LIMITS.timeLimitMs} ms (10 minutes)`);
  for (const list of ["stock", "parts"] as const) {
    if (job[list].length > JOB_LIMITS.listEntries) return fail(list, `must list at most ${JOB_LIMITS.listEntries} entries`);
    for (const [i, item] of job[list].entries()) {
      const bad = length(`${list}[${i}].length`, item.length) ?? length(`${list}[${i}].width`, item.width);
      if (bad) return bad;
    }
  }
  let parts = 0;
  for (const [i, part] of job.parts.entries()) {
    parts += part.quantity;
    if (parts > JOB_LIMITS.partsPerJob) return fail(`parts[${i}].quantity`, `brings the job past ${JOB_LIMITS.partsPerJob} parts; split it into smaller jobs`);
  }
  for (const [i, stock] of job.stock.entries()) {
    if (stock.quantity !== null && stock.quantity > JOB_LIMITS.partsPerJob) return fail(`stock[${i}].quantity`, `must be at most ${JOB_LIMITS.partsPerJob} (or null for as many as needed)`);
  }
  for (const key of ["ripMax", "sledWidthMax", "stopMin", "stopMax"] as const) {
    const value = job.limits?.[key];
    if (value !== undefined && value > max) return fail(`limits.${key}`, `must be at most ${max} mm`);
  }
  if (job.minOffcut && job.minOffcut.shortSide > max) return fail("minOffcut.shortSide", `must be at most ${max} mm`);
  if (job.minOffcut && job.minOffcut.area > max * max) return fail("minOffcut.area", `must be at most ${max * max} mm²`);
  return { ok: true };
}
