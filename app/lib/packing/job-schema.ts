// The job JSON accepted by bin/pack (and by the app before it calls pack): valibot schema,
// defaults, and one-line error messages that name the field.
import * as v from "valibot";
import type { Job } from "./types";

const positive = (what = "size") =>
  v.pipe(v.number(`must be a number (${what})`), v.finite(`must be a finite number`), v.gtValue(0, `must be greater than 0`));
const nonNegative = () =>
  v.pipe(v.number("must be a number"), v.finite("must be a finite number"), v.minValue(0, "must not be negative"));
const id = () => v.pipe(v.string("must be a string"), v.nonEmpty("must not be empty"));

const stockSchema = v.strictObject(
  {
    id: id(),
    length: positive("mm"),
    width: positive("mm"),
    quantity: v.optional(
      v.nullable(v.pipe(v.number("must be a number or null"), v.integer("must be a whole number"), v.minValue(0, "must not be negative"))),
      null,
    ),
    cost: v.optional(nonNegative(), 0),
    grain: v.optional(v.picklist(["length", "none"], 'must be "length" or "none"'), "none"),
    trimmed: v.optional(v.boolean("must be true or false"), true),
  },
  "unknown field",
);

const partSchema = v.strictObject(
  {
    id: id(),
    length: positive("mm"),
    width: positive("mm"),
    quantity: v.optional(v.pipe(v.number("must be a number"), v.integer("must be a whole number"), v.minValue(1, "must be at least 1")), 1),
    rotate: v.optional(v.boolean("must be true or false"), true),
  },
  "unknown field",
);

export const jobSchema = v.strictObject(
  {
    kerf: nonNegative(),
    trim: v.optional(nonNegative(), 0),
    stages: v.optional(v.picklist([0, 2, 3], "must be 0, 2 or 3"), 0),
    objective: v.optional(v.picklist(["sheets", "setups"], 'must be "sheets" or "setups"'), "sheets"),
    timeLimitMs: v.optional(positive("milliseconds"), 1000),
    seed: v.optional(v.pipe(v.number("must be a number"), v.integer("must be a whole number")), 1),
    stock: v.pipe(v.array(stockSchema, "must be a list"), v.minLength(1, "must list at least one panel")),
    parts: v.pipe(v.array(partSchema, "must be a list"), v.minLength(1, "must list at least one part")),
    minOffcut: v.optional(
      v.strictObject({ shortSide: nonNegative(), area: nonNegative() }, "unknown field"),
    ),
    limits: v.optional(
      v.strictObject(
        {
          ripMax: v.optional(positive("mm")),
          sledWidthMax: v.optional(positive("mm")),
          stopMin: v.optional(nonNegative()),
          stopMax: v.optional(positive("mm")),
        },
        "unknown field",
      ),
    ),
  },
  "unknown field",
);

export type JobParseResult = { ok: true; job: Job } | { ok: false; field: string; error: string };

function fieldName(path: v.IssuePathItem[] | undefined): string {
  let s = "";
  for (const p of path ?? []) {
    const k = (p as { key: unknown }).key;
    if (typeof k === "number") s += `[${k}]`;
    else s += s ? `.${String(k)}` : String(k);
  }
  return s || "job";
}

/** Parses an already JSON-decoded value. The error is one line: "field: problem". */
export function parseJob(input: unknown): JobParseResult {
  if (typeof input !== "object" || input === null || Array.isArray(input)) {
    return { ok: false, field: "job", error: "job: must be a JSON object" };
  }
  const r = v.safeParse(jobSchema, input, { abortEarly: true });
  if (!r.success) {
    const issue = r.issues[0];
    const field = fieldName(issue.path);
    // strict objects report both a missing key (expected: the key) and an unknown one (expected: never)
    const unknown = issue.type === "strict_object" && issue.expected === "never";
    const missing = !unknown && issue.received === "undefined";
    const problem = missing ? "is missing" : unknown ? "is not a known field" : issue.type === "strict_object" ? "must be an object" : issue.message;
    return { ok: false, field, error: `${field}: ${problem}` };
  }
  const job = r.output as Job;
  for (const list of ["stock", "parts"] as const) {
    const seen = new Set<string>();
    const items: { id: string }[] = job[list];
    for (let i = 0; i < items.length; i++) {
      if (seen.has(items[i].id)) {
        const field = `${list}[${i}].id`;
        return { ok: false, field, error: `${field}: duplicate id "${items[i].id}"` };
      }
      seen.add(items[i].id);
    }
  }
  const lim = job.limits;
  if (lim?.stopMin !== undefined && lim.stopMax !== undefined && lim.stopMin > lim.stopMax) {
    return { ok: false, field: "limits.stopMin", error: "limits.stopMin: must not exceed limits.stopMax" };
  }
  return { ok: true, job };
}
