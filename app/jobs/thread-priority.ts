// The engine yields to the request handlers: pages come first, the engine takes the CPU they leave.
import { readlinkSync } from "node:fs";
import { setPriority } from "node:os";

/** Niceness of the engine's worker thread (0 is the server's; 19 the lowest). */
export const ENGINE_NICENESS = 10;

/**
 * Lowers the priority of the calling thread only. On Linux every thread has its own nice value and
 * /proc/thread-self names it; elsewhere this does nothing and the thread keeps the process's priority.
 */
export function lowerThisThreadPriority(niceness = ENGINE_NICENESS): boolean {
  try {
    const threadId = Number(readlinkSync("/proc/thread-self").split("/").pop());
    if (!Number.isInteger(threadId) || threadId <= 0) return false;
    setPriority(threadId, niceness);
    return true;
  } catch {
    return false;
  }
}
