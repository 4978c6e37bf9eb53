// Takes plan jobs from the shared queue until SIGTERM or SIGINT; the web servers then run with
// STOPWISE_PLAN_RUNNER=0 and keep no state of their own (sessions, limits, jobs, uploads' records
// all live in PostgreSQL).
import { startPlanRunner, stopPlanRunner } from "../app/jobs/plan-runner.server";
import { stopQueue } from "../app/jobs/queue.server";

await startPlanRunner();
console.log("Plan runner waiting for jobs.");
const stop = async () => {
  await stopPlanRunner().catch(() => {});
  await stopQueue().catch(() => {});
  process.exit(0);
};
process.once("SIGTERM", stop);
process.once("SIGINT", stop);
