// bin/pack [FILE]: reads a job as JSON (stdin without FILE), writes the plan as JSON.
// Bad input exits 2 with one line on stderr naming the field; never a stack trace.
import { readFileSync } from "node:fs";
import { pack } from "../app/lib/packing/engine";
import { parseJob } from "../app/lib/packing/job-schema";
import { checkJobLimits } from "../app/lib/packing-limits";

function fail(line: string, code = 2): never {
  process.stderr.write(line.replace(/\s+/g, " ").trim() + "\n");
  process.exit(code);
}

// a closed pipe (bin/pack job.json | head) is not an error worth a stack trace
process.stdout.on("error", (e: NodeJS.ErrnoException) => process.exit(e.code === "EPIPE" ? 0 : 1));

function main() {
  const args = process.argv.slice(2);
  if (args.length > 1) fail("usage: bin/pack [FILE]");
  let text: string;
  try {
    text = args.length === 1 && args[0] !== "-" ? readFileSync(args[0], "utf8") : readFileSync(0, "utf8");
  } catch (e) {
    fail(`input: cannot read ${args[0] ?? "stdin"} (${(e as NodeJS.ErrnoException).code ?? "error"})`);
  }
  let data: unknown;
  try {
    data = JSON.parse(text);
  } catch (e) {
    fail(`input: not valid JSON (${(e as Error).message})`);
  }
  const parsed = parseJob(data);
  if (!parsed.ok) fail(parsed.error);
  const bounded = checkJobLimits(parsed.job);
  if (!bounded.ok) fail(bounded.error);
  let plan;
  try {
    plan = pack(parsed.job);
  } catch (e) {
    fail(`engine: ${(e as Error).message}`, 1);
  }
  process.stdout.write(JSON.stringify(plan, null, 2) + "\n");
}

main();
