import * as v from "valibot";

const decimal = (label: string, min: number, max: number, unit: string) =>
  v.pipe(
    v.string(`Enter the ${label}.`),
    v.trim(),
    v.nonEmpty(`Enter the ${label}.`),
    v.transform((s) => Number(s.replace(",", "."))),
    v.check((n) => Number.isFinite(n), `The ${label} must be a number.`),
    v.check((n) => n >= min && n <= max, `The ${label} must be between ${min} and ${max} ${unit}.`),
  );

// Kerf: thin-kerf blades cut about 2.4 mm and full-kerf ones about 3.2 mm (TRADE-FACTS §2, common
// practice); 0 is allowed for laser-only or already-cut work, 10 mm is no blade anyone runs.
export const PlanSettingsSchema = v.pipe(
  v.object({
    kerfMm: decimal("kerf", 0, 10, "mm"),
    trimMm: decimal("edge trim", 0, 50, "mm"),
    seconds: decimal("search time", 0.2, 30, "seconds"),
    stages: v.pipe(v.picklist(["0", "2", "3"], "Choose how the saw works the sheet."), v.transform((s) => Number(s) as 0 | 2 | 3)),
    objective: v.picklist(["sheets", "setups"], "Choose what the plan aims for."),
    sawId: v.pipe(v.optional(v.string(), ""), v.check((id) => id === "" || /^[0-9a-f-]{36}$/.test(id), "Choose a saw from the list."), v.transform((id) => id || null)),
    sledId: v.pipe(v.optional(v.string(), ""), v.check((id) => id === "" || /^[0-9a-f-]{36}$/.test(id), "Choose a sled from the list."), v.transform((id) => id || null)),
  }),
  v.transform(({ seconds, ...rest }) => ({ ...rest, timeLimitMs: Math.round(seconds * 1000), seed: Math.floor(Math.random() * 2 ** 31) })),
);
