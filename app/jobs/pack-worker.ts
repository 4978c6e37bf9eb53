// Runs the packing engine in a worker thread, so a long plan never blocks the server's event loop.
// Messages to the parent: { type: "progress", bestSheets } while searching, then { type: "done",
// plan, check }: the independent validator's verdict, worked out here too, since proving a plan of
// 2,000 parts sound takes the event loop 50–110 ms the pages would wait for.
import { parentPort, workerData } from "node:worker_threads";
import { pack, validatePlan } from "../lib/packing/index";
import type { Job } from "../lib/packing/types";
import { lowerThisThreadPriority } from "./thread-priority";

// While a plan searches, the server's threads keep answering pages first (issue 6's latency target).
lowerThisThreadPriority();

const job = (workerData as { job: Job }).job;
const plan = pack(job, { onProgress: ({ bestSheets }) => parentPort!.postMessage({ type: "progress", bestSheets }) });
parentPort!.postMessage({ type: "done", plan, check: validatePlan(job, plan) });
