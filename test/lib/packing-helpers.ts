// Shared helpers for the packing tests (not a test file itself).
import { parseJob } from "~/lib/packing/job-schema";
import type { Job } from "~/lib/packing/types";

/** A job from JSON-like input, with the schema's defaults filled in; throws on bad input. */
export function job(input: Record<string, unknown>): Job {
  const r = parseJob(input);
  if (!r.ok) throw new Error(r.error);
  return r.job;
}

/** A clock that advances a fixed step per call: makes the time budget deterministic. */
export function fakeClock(stepMs = 0.01): () => number {
  let t = 0;
  return () => (t += stepMs);
}

export const sheet2440 = (over: Record<string, unknown> = {}) => ({
  id: "birch",
  length: 2440,
  width: 1220,
  quantity: null,
  cost: 60,
  grain: "length",
  trimmed: true,
  ...over,
});

/** A literature instance (../shared/benchmarks format) as a job: kerf and trim 0, stages 0, parts may turn. */
export function instanceJob(
  inst: { bin: { width: number; height: number }; items: { width: number; height: number; demand: number }[] },
  timeLimitMs: number,
): Job {
  return {
    kerf: 0,
    trim: 0,
    stages: 0,
    objective: "sheets",
    timeLimitMs,
    seed: 1,
    stock: [{ id: "bin", length: inst.bin.width, width: inst.bin.height, quantity: null, cost: 1, grain: "none", trimmed: true }],
    parts: inst.items.map((it, i) => ({ id: `i${i}`, length: it.width, width: it.height, quantity: it.demand, rotate: true })),
  };
}
