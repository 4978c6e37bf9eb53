// The engine's worker thread yields to the server: on Linux it lowers its own thread's priority, and
// only its own, so requests keep the CPU they need while a plan searches (issue 6's latency target).
import { existsSync, readdirSync, readFileSync } from "node:fs";
import { getPriority } from "node:os";
import { Worker } from "node:worker_threads";
import { describe, expect, it } from "vitest";
import { ENGINE_NICENESS } from "~/jobs/thread-priority";
import type { Job } from "~/lib/packing/types";

/** The nice value of each thread of this process (field 19 of /proc/<pid>/task/<tid>/stat). */
function threadNiceness(): Map<number, number> {
  const threads = new Map<number, number>();
  for (const tid of readdirSync(`/proc/${process.pid}/task`)) {
    try {
      const stat = readFileSync(`/proc/${process.pid}/task/${tid}/stat`, "utf8");
      threads.set(Number(tid), Number(stat.slice(stat.lastIndexOf(")") + 2).split(" ")[16]));
    } catch {
      // the thread ended meanwhile
    }
  }
  return threads;
}

const job: Job = {
  kerf: 3.2,
  trim: 10,
  stages: 2,
  objective: "sheets",
  timeLimitMs: 1500,
  seed: 1,
  stock: [{ id: "sheet", length: 2440, width: 1220, quantity: null, cost: 5290, grain: "none", trimmed: true }],
  parts: Array.from({ length: 12 }, (_, i) => ({ id: `p${i}`, length: 150 + i * 37, width: 90 + i * 11, quantity: 15, rotate: true })),
};

describe.skipIf(!existsSync("/proc/thread-self") || getPriority() >= ENGINE_NICENESS)("the engine's worker thread", () => {
  it(`runs at nice ${ENGINE_NICENESS} while the server's own threads keep theirs`, async () => {
    const before = getPriority();
    const existing = new Set(threadNiceness().keys());
    const worker = new Worker(new URL("../../app/jobs/pack-worker-entry.mjs", import.meta.url), { workerData: { job } });
    const progressed = new Promise<void>((resolve, reject) => {
      worker.once("message", () => resolve());
      worker.once("error", reject);
    });
    try {
      await progressed; // the worker is searching, past its start-up
      const started = [...threadNiceness()].filter(([tid]) => !existing.has(tid));
      expect(started.filter(([, nice]) => nice === ENGINE_NICENESS)).toHaveLength(1);
      expect(threadNiceness().get(process.pid)).toBe(before);
    } finally {
      await worker.terminate();
    }
  });
});
