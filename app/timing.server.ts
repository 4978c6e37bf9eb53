// Server-Timing (a W3C header browsers' developer tools show): where a request's time went, by phase.
// Off unless STOPWISE_SERVER_TIMING=1, so production answers carry no internal timings by default;
// bin/bench-plan turns it on to break page latency down into session, queries, merging and rendering.
import { AsyncLocalStorage } from "node:async_hooks";
import type { MiddlewareFunction } from "react-router";

type Phases = Map<string, number>;
const phasesOfRequest = new AsyncLocalStorage<Phases>();

export function serverTimingEnabled(): boolean {
  return process.env.STOPWISE_SERVER_TIMING === "1";
}

/** Runs `work` and adds its duration to the request's phase `phase` (a token: letters, digits, dashes). */
export async function timed<T>(phase: string, work: () => T | Promise<T>): Promise<T> {
  const phases = phasesOfRequest.getStore();
  if (!phases) return work();
  const start = performance.now();
  try {
    return await work();
  } finally {
    phases.set(phase, (phases.get(phase) ?? 0) + performance.now() - start);
  }
}

/** `session;dur=1.2, queries;dur=4.0, rest;dur=9.1`: the named phases, then what the handler spent beyond them. */
export function serverTimingHeader(phases: Phases, totalMs: number): string {
  const named = [...phases].map(([name, ms]) => `${name};dur=${ms.toFixed(1)}`);
  const accounted = [...phases.values()].reduce((sum, ms) => sum + ms, 0);
  return [...named, `rest;dur=${Math.max(0, totalMs - accounted).toFixed(1)}`, `total;dur=${totalMs.toFixed(1)}`].join(", ");
}

/**
 * Outermost middleware: collects the phases of everything after it (session, loaders; the document's
 * render ends when the shell is ready, so "rest" is mostly rendering for pages). The body streamed
 * after that is not in it: a client's latency minus "total" is that flush plus the network.
 */
export const timingMiddleware: MiddlewareFunction<Response> = async (_args, next) => {
  if (!serverTimingEnabled()) return next();
  const phases: Phases = new Map();
  const start = performance.now();
  const response = await phasesOfRequest.run(phases, next);
  response.headers.append("Server-Timing", serverTimingHeader(phases, performance.now() - start));
  return response;
};
