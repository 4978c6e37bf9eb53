// The server keeps answering while the engine plans: a 2,000-part batch (invented shop data, 25
// products) is planned with a 5 s budget while autocannon reads the batch page and the order list on
// loopback. The same load runs first with no plan, so the two figures sit side by side in one run.
// Two loads: the rated one the target is checked on (a few people per route, each asking once a
// second, as bin/load does), and the no-pause one that measures capacity (each route's requests
// queue behind the others' on the one Node process). Before the loads, each route is asked once at a
// time and its Server-Timing phases are recorded.
import autocannon from "autocannon";
import { desc, eq } from "drizzle-orm";
import { writeFileSync } from "node:fs";
import { cpus, loadavg } from "node:os";
import * as t from "../db/schema";
import { createShop, signIn } from "../test/support/factories";
import { appServer } from "../test/support/app";
import { ACCEPT_ENCODING, quantile, serverTimingPhases, type Phases } from "../test/support/latency";
import { startApp } from "../test/support/server";
import { getDb } from "~/db.server";
import { createBatches } from "~/models/batches.server";
import { createOrder } from "~/models/orders.server";

const db = getDb();
const budgetMs = Number(process.env.BENCH_BUDGET_MS ?? 5000);
// The rated load: this many people on each route, each asking once a second (the next request waits
// for the answer). Five people reading the batch page and ten the order lists at once, each every
// second, is several times a 2–6 person shop's busiest moment.
const PEOPLE_PER_ROUTE = 5;
const RATE_PER_PERSON = 1;
type Pace = { connections: number; rate?: number };
const RATED: Pace = { connections: PEOPLE_PER_ROUTE, rate: RATE_PER_PERSON };
const NO_PAUSE: Pace = { connections: Number(process.env.BENCH_CONNECTIONS ?? 1) };

// A seeded generator, so every run benches the same invented shop.
let seed = 20261202;
const rand = () => ((seed = (seed * 1103515245 + 12345) % 2 ** 31) / 2 ** 31);

async function seedShop() {
  const shop = await createShop("Bench");
  const [birch] = await db.insert(t.materials).values({ shopId: shop.id, name: "Birch plywood 6 mm", kind: "plywood", thicknessUm: 6000 }).returning();
  await db.insert(t.stockPanels).values({ shopId: shop.id, materialId: birch.id, lengthUm: 2_440_000, widthUm: 1_220_000, costMinor: 5290, onHand: 500 });
  const products = [];
  for (let i = 0; i < 25; i++) {
    const [p] = await db.insert(t.products).values({ shopId: shop.id, name: `Product ${i + 1}`, priceMinor: 500 + i * 100 }).returning();
    const length = Math.round(80 + rand() * 520) * 1000;
    const width = Math.round(50 + rand() * 300) * 1000;
    await db.insert(t.productParts).values({ productId: p.id, materialId: birch.id, name: `Part ${i + 1}`, lengthUm: Math.max(length, width), widthUm: Math.min(length, width), grainLocked: i % 3 === 0 });
    products.push(p);
  }
  const [customer] = await db.insert(t.customers).values({ shopId: shop.id, name: "Bench customer" }).returning();
  // 100 confirmed orders of 20 personalised items each: 2,000 parts due in the batch; 400 more orders fill the list.
  for (let o = 0; o < 500; o++) {
    const due = o < 100;
    const order = await createOrder(shop.id, { customerId: customer.id, eventDate: due ? "2027-01-20" : "2027-06-01", dueDate: due ? "2027-01-10" : "2027-05-20", notes: "" }, [
      { productId: products[o % 25].id, quantity: 20, personalisation: Array.from({ length: 20 }, (_, i) => `Guest ${o * 20 + i + 1}`), notes: "", files: [] },
    ]);
    await db.update(t.orders).set({ status: due ? "confirmed" : "draft" }).where(eq(t.orders.id, order.id));
  }
  const [batchId] = await createBatches(shop.id, "2027-01-15");
  return { shop, batchId };
}

type Result = { route: string; requests: number; p50: number; p95: number; p99: number; rps: number; non2xx: number; errors: number };

const round = (ms: number) => Math.round(ms * 10) / 10;

function load(url: string, cookie: string, paths: string[], seconds: number, pace: Pace): Promise<Result[]> {
  // At a rated pace each person is an autocannon of their own, their starts spread over the first
  // second: started together, every person's request would land in the same instant, once a second.
  const people = pace.rate ? pace.connections : 1;
  const starts = paths.length * people;
  return Promise.all(
    paths.map(async (path, p) => {
      const latencies: number[] = [];
      const runs = await Promise.all(
        Array.from({ length: people }, async (_, k) => {
          if (pace.rate) await new Promise((r) => setTimeout(r, ((p * people + k) / starts) * 1000));
          return new Promise<autocannon.Result>((resolve, reject) => {
            const instance = autocannon(
              {
                url: `${url}${path}`,
                connections: pace.rate ? 1 : pace.connections,
                ...(pace.rate ? { connectionRate: pace.rate } : {}),
                duration: seconds,
                headers: { cookie, "accept-encoding": ACCEPT_ENCODING },
              },
              (error, r) => (error ? reject(error) : resolve(r)),
            );
            // Every response's own latency (ms, to the last byte), so the percentiles are exact.
            instance.on("response", (_client: unknown, _status: number, _bytes: number, responseTime: number) => latencies.push(responseTime));
          });
        }),
      );
      latencies.sort((a, b) => a - b);
      return {
        route: path.replace(/[0-9a-f-]{36}/, ":id"),
        requests: latencies.length,
        p50: round(quantile(latencies, 0.5)),
        p95: round(quantile(latencies, 0.95)),
        p99: round(quantile(latencies, 0.99)),
        rps: runs.reduce((sum, r) => sum + r.requests.average, 0),
        non2xx: runs.reduce((sum, r) => sum + r.non2xx, 0),
        errors: runs.reduce((sum, r) => sum + r.errors, 0),
      } satisfies Result;
    }),
  );
}

type Breakdown = Phases & { route: string };

/** One request at a time before the load: the median of 40 (after 5 not counted). */
async function breakdown(url: string, cookie: string, path: string): Promise<Breakdown> {
  return { route: path.replace(/[0-9a-f-]{36}/, ":id"), ...(await serverTimingPhases(`${url}${path}`, cookie, { samples: 40, warmUp: 5 })) };
}

const loadBefore = loadavg();
const { shop, batchId } = await seedShop();
const app = await startApp({ STOPWISE_SERVER_TIMING: "1" });
const server = await appServer();
const cookie = await signIn(server, shop.users.planner);
const paths = [`/batches/${batchId}`, "/api/orders?sort=due", "/orders"];
const seconds = Math.ceil(budgetMs / 1000);

console.log(`Shop: 500 orders, a batch of 2,000 parts from 25 products. Budget ${budgetMs} ms.`);
const phases: Breakdown[] = [];
for (const path of paths) phases.push(await breakdown(app.url, cookie, path));

/** Asks for a plan, drives the load while it runs, and waits for the plan to end. */
async function whilePlanning(pace: Pace) {
  const started = Date.now();
  const res = await fetch(`${app.url}/batches/${batchId}`, {
    method: "POST",
    headers: { cookie, "content-type": "application/x-www-form-urlencoded", origin: app.url },
    body: new URLSearchParams({ intent: "run-plan", kerfMm: "3.2", trimMm: "10", seconds: String(budgetMs / 1000), stages: "2", objective: "sheets" }),
    redirect: "manual",
  });
  if (res.status !== 302) throw new Error(`run-plan answered ${res.status}`);
  const results = await load(app.url, cookie, paths, seconds, pace);
  let plan: typeof t.plans.$inferSelect | undefined;
  for (;;) {
    [plan] = await db.select().from(t.plans).where(eq(t.plans.batchId, batchId)).orderBy(desc(t.plans.createdAt)).limit(1);
    if (plan && (plan.status === "done" || plan.status === "failed")) break;
    await new Promise((r) => setTimeout(r, 200));
  }
  return { results, plan: plan!, wall: Date.now() - started };
}

const idleRated = await load(app.url, cookie, paths, seconds, RATED);
const rated = await whilePlanning(RATED);
const idle = await load(app.url, cookie, paths, seconds, NO_PAUSE);
const noPause = await whilePlanning(NO_PAUSE);
const busy = rated.results;

const lines: string[] = [];
const say = (text: string) => {
  console.log(text);
  lines.push(text);
};
const row = (label: string, r: Result) => `| ${r.route} | ${label} | ${r.requests} | ${r.p50} | ${r.p95} | ${r.p99} | ${Math.round(r.rps)} | ${r.non2xx} | ${r.errors} |`;
say(`Run ${new Date().toISOString()} on ${cpus().length} cores, load average before the run ${loadBefore.map((l) => l.toFixed(1)).join(" / ")}, after ${loadavg().map((l) => l.toFixed(1)).join(" / ")} (shared machine: other work runs beside it; compare the idle and planning rows of one run, not runs).`);
say(`Production build (NODE_ENV=production), bin/serve.ts with compression; requests ask for ${ACCEPT_ENCODING} like a browser. Seeded shop: 500 orders, a batch of 2,000 parts (100 lines of 20 personalised items, 25 products).`);
say("\n## Where the time goes\n\nOne request at a time before the load, median of 40, from the Server-Timing header (STOPWISE_SERVER_TIMING=1): session = session and user lookup; queries = the loader's reads; merge = merging parts and nesting blanks; rest = the rest of the handler (for pages: the server render up to the shell, loader data serialisation); client = the whole answer as the client saw it, including streaming the body and compression. Milliseconds.\n");
const names = [...new Set(phases.flatMap((b) => [...b.phases.keys()]))].filter((n) => n !== "total");
say(`| route | ${names.join(" | ")} | total | client | kB |\n|---|${names.map(() => "---|").join("")}---|---|---|`);
for (const b of phases) say(`| ${b.route} | ${names.map((n) => (b.phases.has(n) ? b.phases.get(n)!.toFixed(1) : "–")).join(" | ")} | ${(b.phases.get("total") ?? NaN).toFixed(1)} | ${b.client.toFixed(1)} | ${b.kB.toFixed(1)} |`);
const planLine = (run: { plan: typeof t.plans.$inferSelect; wall: number }) => {
  const progress = run.plan.progress as { elapsedMs: number } | null;
  return `Plan: ${run.plan.status}${run.plan.error ? ` (${run.plan.error})` : ""}; ${run.plan.sheets} sheets, ${run.plan.setups} set-ups, yield ${((run.plan.yieldPermille ?? 0) / 10).toFixed(1)} %; engine ${progress?.elapsedMs ?? "?"} ms of a ${budgetMs} ms budget; ${run.wall} ms from request to saved.`;
};
say(`\n## Rated load: the target is checked here\n\nautocannon, all three routes at once for ${seconds} s, each by ${PEOPLE_PER_ROUTE} people on connections of their own asking at most ${RATE_PER_PERSON} request a second each (connectionRate; the next request waits for the answer; their starts spread over the first second), about ${paths.length * PEOPLE_PER_ROUTE * RATE_PER_PERSON} requests a second in all; idle, then while a plan runs. Percentiles are exact over every response (latency to the last byte).\n`);
say("| route | engine | requests | p50 ms | p95 ms | p99 ms | req/s | non-2xx | errors |\n|---|---|---|---|---|---|---|---|---|");
for (let i = 0; i < paths.length; i++) {
  say(row("idle", idleRated[i]));
  say(row("planning", busy[i]));
}
say(`\n${planLine(rated)}`);
const worst = busy.reduce((a, b) => (b.p95 > a.p95 ? b : a));
say(`Target: p95 under 100 ms on every route while planning — ${worst.p95 < 100 ? "met" : "NOT met"} (worst: ${worst.route} at ${worst.p95} ms).`);
say(`\n## Capacity: no pause\n\nThe same three routes, ${NO_PAUSE.connections} connection(s) each with no pause between requests, so every request waits behind the other routes' on the one Node process: throughput, and latency at full pressure, not the target. Idle, then while a second plan runs.\n`);
say("| route | engine | requests | p50 ms | p95 ms | p99 ms | req/s | non-2xx | errors |\n|---|---|---|---|---|---|---|---|---|");
for (let i = 0; i < paths.length; i++) {
  say(row("idle", idle[i]));
  say(row("planning", noPause.results[i]));
}
say(`\n${planLine(noPause)}`);
writeFileSync(new URL("../test/bench/PLAN-LOAD.md", import.meta.url), `# Planning under load (bin/bench-plan)\n\n${lines.join("\n")}\n`);
await app.stop();
process.exit(0);
