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
