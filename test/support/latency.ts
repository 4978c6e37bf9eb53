// Latency figures shared by bin/bench-plan and bin/load: exact percentiles over every response, and
// the Server-Timing phases of one route asked once at a time.

/** What a browser sends: pages are compressed on the way out, and that work is part of the latency. */
export const ACCEPT_ENCODING = "gzip, deflate, br";

/** The q-quantile by nearest rank of sorted figures (autocannon reports p90, p97.5 and p99, but no p95). */
export function quantile(sorted: number[], q: number): number {
  if (!sorted.length) return NaN;
  return sorted[Math.min(sorted.length - 1, Math.max(0, Math.ceil(q * sorted.length) - 1))];
}

export type Phases = { phases: Map<string, number>; client: number; kB: number };

/**
 * One request at a time, nothing else running: the median of each Server-Timing phase and of the
 * whole answer as the client saw it, after `warmUp` requests that are not counted.
 */
export async function serverTimingPhases(url: string, cookie: string, { samples, warmUp }: { samples: number; warmUp: number }): Promise<Phases> {
  const phases = new Map<string, number[]>();
  const client: number[] = [];
  let bytes = 0;
  for (let i = 0; i < samples + warmUp; i++) {
    const started = performance.now();
    const res = await fetch(url, { headers: { cookie, "accept-encoding": ACCEPT_ENCODING } });
    const body = await res.arrayBuffer();
    if (i < warmUp) continue;
    client.push(performance.now() - started);
    bytes = body.byteLength;
    for (const entry of (res.headers.get("server-timing") ?? "").split(",")) {
      const match = /^\s*([\w-]+);dur=([\d.]+)/.exec(entry);
      if (match) phases.set(match[1], [...(phases.get(match[1]) ?? []), Number(match[2])]);
    }
  }
  const median = (xs: number[]) => quantile([...xs].sort((a, b) => a - b), 0.5);
  return { phases: new Map([...phases].map(([name, xs]) => [name, median(xs)])), client: median(client), kB: bytes / 1000 };
}
