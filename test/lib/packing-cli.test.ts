// bin/pack: a good job gives a JSON plan; each kind of bad input exits 2 with one stderr line naming the field.
import { spawnSync } from "node:child_process";
import { mkdtempSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { describe, expect, it } from "vitest";
import { validatePlan } from "~/lib/packing/validate";
import type { Plan } from "~/lib/packing/types";
import { job } from "./packing-helpers";

const bin = path.resolve(__dirname, "../../bin/pack");
const packCli = (stdin: string, args: string[] = []) => spawnSync(bin, args, { input: stdin, encoding: "utf8", timeout: 30_000 });

const good = {
  kerf: 3.2,
  trim: 10,
  stages: 2,
  objective: "setups",
  timeLimitMs: 100,
  seed: 3,
  stock: [{ id: "birch6", length: 2440, width: 1220, quantity: null, cost: 62, grain: "length", trimmed: true }],
  parts: [
    { id: "welcome", length: 600, width: 400, quantity: 1, rotate: false },
    { id: "table-no", length: 210, width: 150, quantity: 18, rotate: false },
  ],
  minOffcut: { shortSide: 100, area: 40000 },
  limits: { ripMax: 650, sledWidthMax: 700, stopMin: 20, stopMax: 1200 },
};

describe("bin/pack", () => {
  it("packs a job from stdin and from a file", () => {
    const r = packCli(JSON.stringify(good));
    expect(r.stderr).toBe("");
    expect(r.status).toBe(0);
    const plan = JSON.parse(r.stdout) as Plan;
    expect(plan.metrics.sheets).toBe(1);
    expect(plan.sheets[0].placements).toHaveLength(19);
    expect(validatePlan(job(good), plan)).toEqual({ ok: true, errors: [] });
    const dir = mkdtempSync(path.join(tmpdir(), "stopwise-pack-"));
    const file = path.join(dir, "job.json");
    writeFileSync(file, JSON.stringify(good));
    const f = packCli("", [file]);
    expect(f.status).toBe(0);
    expect((JSON.parse(f.stdout) as Plan).setups).toEqual(plan.setups);
  });

  const bad: [string, unknown, RegExp][] = [
    ["not JSON", "{kerf: 3", /^input: not valid JSON/],
    ["a missing size", { ...good, parts: [{ id: "a", length: 100, quantity: 1 }] }, /^parts\[0\]\.width: is missing$/],
    ["a non-numeric size", { ...good, stock: [{ ...good.stock[0], length: "2440" }] }, /^stock\[0\]\.length: must be a number/],
    ["a zero size", { ...good, parts: [{ id: "a", length: 0, width: 10 }] }, /^parts\[0\]\.length: must be greater than 0$/],
    ["a negative size", { ...good, stock: [{ ...good.stock[0], width: -1220 }] }, /^stock\[0\]\.width: must be greater than 0$/],
    ["a negative kerf", { ...good, kerf: -0.1 }, /^kerf: must not be negative$/],
    ["an unknown field", { ...good, blade: "thin" }, /^blade: is not a known field$/],
    ["an unknown nested field", { ...good, parts: [{ ...good.parts[0], colour: "red" }] }, /^parts\[0\]\.colour: is not a known field$/],
    ["a duplicate id", { ...good, parts: [good.parts[0], { ...good.parts[1], id: "welcome" }] }, /^parts\[1\]\.id: duplicate id "welcome"$/],
    ["a stage count of 1", { ...good, stages: 1 }, /^stages: must be 0, 2 or 3$/],
    ["a missing kerf", { ...good, kerf: undefined }, /^kerf: is missing$/],
    ["an array instead of a job", [good], /^job: must be a JSON object$/],
  ];
  for (const [what, input, message] of bad) {
    it(`exits 2 with one line naming the field for ${what}`, () => {
      const r = packCli(typeof input === "string" ? input : JSON.stringify(input));
      expect(r.status).toBe(2);
      expect(r.stdout).toBe("");
      const lines = r.stderr.split("\n").filter((l) => l !== "");
      expect(lines).toHaveLength(1);
      expect(lines[0]).toMatch(message);
      expect(r.stderr).not.toMatch(/at .*\.ts:\d+/);
    });
  }

  it("lists a part that fits no panel as unplaced and plans the rest", () => {
    const r = packCli(JSON.stringify({ ...good, parts: [...good.parts, { id: "door", length: 2500, width: 900, quantity: 1, rotate: true }] }));
    expect(r.status).toBe(0);
    const plan = JSON.parse(r.stdout) as Plan;
    expect(plan.unplaced).toEqual([{ partId: "door", quantity: 1, reason: "fits no panel in either allowed orientation" }]);
    expect(plan.sheets[0].placements).toHaveLength(19);
  });
});
