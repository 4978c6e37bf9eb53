// Arbitrary, broken and absurd jobs (fast-check): parseJob and checkJobLimits answer with one line
// naming the field, and whatever they accept packs into a plan the validator passes. bin/pack does
// the same from its command line: exit 2 and that one line on stderr, never a stack trace.
import { spawn } from "node:child_process";
import { fileURLToPath } from "node:url";
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { pack, parseJob, validatePlan } from "~/lib/packing";
import type { Job } from "~/lib/packing/types";
import { checkJobLimits } from "~/lib/packing-limits";
import { fakeClock } from "./packing-helpers";

const base = () => ({
  kerf: 3.2,
  trim: 10,
  stages: 2,
  objective: "sheets",
  timeLimitMs: 40,
  seed: 3,
  stock: [
    { id: "full", length: 2440, width: 1220, quantity: null, cost: 52, grain: "length", trimmed: true },
    { id: "offcut", length: 800, width: 450, quantity: 1, cost: 0, grain: "length", trimmed: false },
  ],
  parts: [
    { id: "sign", length: 600, width: 400, quantity: 1, rotate: false },
    { id: "number", length: 210, width: 150, quantity: 18, rotate: true },
  ],
  minOffcut: { shortSide: 100, area: 40_000 },
  limits: { ripMax: 1220, sledWidthMax: 700, stopMin: 20, stopMax: 1500 },
});

const PATHS = [
  "kerf", "trim", "stages", "objective", "timeLimitMs", "seed", "stock", "parts", "minOffcut", "limits",
  "stock.0", "stock.0.id", "stock.0.length", "stock.0.width", "stock.0.quantity", "stock.0.cost", "stock.0.grain", "stock.0.trimmed",
  "stock.1.length", "parts.0", "parts.0.id", "parts.0.length", "parts.0.width", "parts.0.quantity", "parts.0.rotate",
  "parts.1.id", "parts.1.quantity", "parts.1.width", "minOffcut.shortSide", "minOffcut.area", "limits.ripMax", "limits.stopMin", "limits.stopMax",
];

// Wrong types, signs and sizes; absurd numbers; and a few plausible ones, so some jobs get through.
const nasty = fc.oneof(
  fc.constantFrom(-1, 0, 0.0004, 0.5, 1, 7, 1e-9, 1e9, 1e300, -1e300, 2 ** 31, 100_001, 10_001, 21, 600_001, NaN, Infinity, -Infinity),
  fc.constantFrom("", "600", "x", "length", "none", "sheets", "setups", null, true, false, [], {}, [1, 2], { id: "p" }),
  fc.double({ noNaN: true, min: -5000, max: 5000 }),
  fc.integer({ min: -3, max: 400 }),
  fc.string({ maxLength: 8 }),
);

type Mutation = { kind: "set"; path: string; value: unknown } | { kind: "delete"; path: string } | { kind: "unknown"; path: string; key: string; value: unknown } | { kind: "duplicate"; list: "stock" | "parts" };
const mutation: fc.Arbitrary<Mutation> = fc.oneof(
  { weight: 5, arbitrary: fc.record({ kind: fc.constant("set" as const), path: fc.constantFrom(...PATHS), value: nasty }) },
  { weight: 2, arbitrary: fc.record({ kind: fc.constant("delete" as const), path: fc.constantFrom(...PATHS) }) },
  { weight: 1, arbitrary: fc.record({ kind: fc.constant("unknown" as const), path: fc.constantFrom("", "stock.0", "parts.1", "limits", "minOffcut"), key: fc.constantFrom("colour", "qty", "__proto__x", "Length"), value: nasty }) },
  { weight: 1, arbitrary: fc.record({ kind: fc.constant("duplicate" as const), list: fc.constantFrom("stock" as const, "parts" as const) }) },
);

function apply(job: Record<string, unknown>, m: Mutation): Record<string, unknown> {
  if (m.kind === "duplicate") {
    const list = job[m.list];
    if (Array.isArray(list) && list.length) list.push(structuredClone(list[0]));
    return job;
  }
  const keys = m.path ? m.path.split(".") : [];
  let at: Record<string, unknown> = job;
  const last = m.kind === "unknown" ? m.key : keys.pop()!;
  for (const k of keys) {
    if (typeof at[k] !== "object" || at[k] === null) return job; // an earlier mutation replaced the parent
    at = at[k] as Record<string, unknown>;
  }
  if (m.kind === "delete") delete at[last];
  else at[last] = m.value;
  return job;
}

const brokenJob = fc.array(mutation, { minLength: 1, maxLength: 4 }).map((ms) => ms.reduce(apply, base() as Record<string, unknown>));
const anyInput = fc.oneof({ weight: 4, arbitrary: brokenJob }, { weight: 1, arbitrary: fc.anything() });

/** One line, "field: problem", where field is what the checker reported. */
function expectFieldLine(error: string, field: string) {
  expect(error).not.toMatch(/\n/);
  expect(error.startsWith(`${field}: `), error).toBe(true);
  expect(error.length).toBeGreaterThan(field.length + 3);
}

/** What bin/pack should say of this input, found by calling the same checks in-process. */
function verdict(input: unknown): { ok: true; job: Job } | { ok: false; field: string; error: string } {
  const parsed = parseJob(input);
  if (!parsed.ok) return parsed;
  const bounded = checkJobLimits(parsed.job);
  return bounded.ok ? parsed : bounded;
}

describe("packing engine fuzzing", () => {
  it("every input is refused with one line naming the field, or packs into a plan that passes the validator", () => {
    let packed = 0;
    let refused = 0;
    fc.assert(
      fc.property(anyInput, (input) => {
        const v = verdict(input);
        if (!v.ok) {
          refused++;
          expectFieldLine(v.error, v.field);
          return;
        }
        const plan = pack(v.job, { now: fakeClock(0.05) });
        expect(validatePlan(v.job, plan)).toEqual({ ok: true, errors: [] });
        packed++;
      }),
      { numRuns: 400, seed: 20261202 },
    );
    // Both sides were exercised: a fuzz that refuses everything (or nothing) proves little.
    expect(refused).toBeGreaterThan(100);
    expect(packed).toBeGreaterThan(20);
  });

  it("absurd sizes are refused before the engine runs, naming the field", () => {
    const absurd: [string, (job: ReturnType<typeof base>) => void][] = [
      ["parts[1].quantity", (j) => (j.parts[1].quantity = 1e9)],
      ["parts[0].length", (j) => (j.parts[0].length = 1e-9)],
      ["stock[0].length", (j) => (j.stock[0].length = 1e300)],
      ["kerf", (j) => (j.kerf = 1e12)],
      ["timeLimitMs", (j) => (j.timeLimitMs = 1e12)],
      ["stock[1].quantity", (j) => (j.stock[1].quantity = 1e7)],
      ["limits.stopMax", (j) => (j.limits.stopMax = 1e6)],
    ];
    for (const [field, change] of absurd) {
      const job = base();
      change(job);
      const v = verdict(job);
      expect(v.ok, field).toBe(false);
      if (!v.ok) expectFieldLine(v.error, field);
    }
  });
});

const bin = fileURLToPath(new URL("../../bin/pack", import.meta.url));

function runPack(stdin: string): Promise<{ code: number | null; stdout: string; stderr: string }> {
  return new Promise((resolve) => {
    const child = spawn(bin, [], { stdio: ["pipe", "pipe", "pipe"], timeout: 60_000 });
    let stdout = "";
    let stderr = "";
    child.stdout.on("data", (c) => (stdout += c));
    child.stderr.on("data", (c) => (stderr += c));
    child.on("close", (code) => resolve({ code, stdout, stderr }));
    child.stdin.on("error", () => {}); // it may exit before reading everything
    child.stdin.end(stdin);
  });
}

describe("bin/pack fuzzing", () => {
  it("exits 2 with the checks' one line for broken JSON, wrong types, unknown fields and absurd sizes; packs the rest", async () => {
    // JSON text: broken jobs as they are (NaN and Infinity become null), or cut short, or with stray bytes.
    const text = fc.oneof(
      { weight: 3, arbitrary: brokenJob.map((j) => JSON.stringify(j)) },
      { weight: 1, arbitrary: fc.tuple(fc.nat(), fc.constantFrom("", "}", ",", "\u0000", "{{", "'")).map(([cut, junk]) => { const s = JSON.stringify(base()); return s.slice(0, cut % s.length) + junk; }) },
    );
    const cases = fc.sample(text, { numRuns: 32, seed: 42 });
    const results: { input: string; code: number | null; stdout: string; stderr: string }[] = [];
    for (let i = 0; i < cases.length; i += 4) {
      // four at a time: each run starts a node process
      results.push(...(await Promise.all(cases.slice(i, i + 4).map(async (input) => ({ input, ...(await runPack(input)) })))));
    }
    let refused = 0;
    for (const r of results) {
      const lines = r.stderr.split("\n").filter((l) => l !== "");
      expect(r.stderr, r.input).not.toMatch(/\n\s+at |Error:|node:internal/); // no stack trace
      let parsedInput: unknown;
      try {
        parsedInput = JSON.parse(r.input);
      } catch {
        expect(r.code, r.input).toBe(2);
        expect(lines, r.input).toHaveLength(1);
        expect(lines[0]).toMatch(/^input: not valid JSON/);
        refused++;
        continue;
      }
      const v = verdict(parsedInput);
      if (v.ok) {
        expect(r.code, `${r.input}\n${r.stderr}`).toBe(0);
        expect(validatePlan(v.job, JSON.parse(r.stdout)).ok).toBe(true);
      } else {
        expect(r.code, r.input).toBe(2);
        expect(lines, r.input).toEqual([v.error]);
        refused++;
      }
    }
    expect(refused).toBeGreaterThan(15);
  });
});
