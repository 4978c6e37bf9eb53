// Runs the packing engine in a worker thread, so a long plan never blocks the server's event loop.
// Messages to the parent: { type: "progress", bestSheets } while searching, then { type: "done", plan }.
import { parentPort, workerData } from "node:worker_threads";
import { pack } from "../lib/packing/index";
import type { Job } from "../lib/packing/types";
import { lowerThisThreadPriority } from "./thread-priority";

// While a plan searches, the server's threads keep answering pages first (issue 6's latency target).
lowerThisThreadPriority();

const job = (workerData as { job: Job }).job;
const plan = pack(job, { onProgress: ({ bestSheets }) => parentPort!.postMessage({ type: "progress", bestSheets }) });
parentPort!.postMessage({ type: "done", plan });
