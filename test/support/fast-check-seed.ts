// One seed for every fast-check property, so a run of bin/test is repeatable and CI does not
// turn on a rare draw. FC_SEED=<number> tries another draw; FC_SEED=random a fresh one each run.
// A failure prints its seed and path: FC_SEED=<that seed> reproduces it.
import fc from "fast-check";

const chosen = process.env.FC_SEED;
if (chosen !== "random") {
  const seed = chosen === undefined ? 20261202 : Number(chosen);
  if (!Number.isSafeInteger(seed)) throw new Error(`FC_SEED must be an integer or "random", not ${JSON.stringify(chosen)}`);
  fc.configureGlobal({ seed });
}
