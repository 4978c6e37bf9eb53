export { pack, DEFAULT_MIN_OFFCUT } from "./engine";
export { validatePlan, type ValidationResult } from "./validate";
export { parseJob, jobSchema, type JobParseResult } from "./job-schema";
export { areaBound, bigItemBound, dffBound } from "./bounds";
export { deriveSetups } from "./setups";
export { mmToUm, umToMm } from "./units";
export type * from "./types";
