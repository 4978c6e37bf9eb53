// The server keeps answering while the engine plans: a 2,000-part batch (invented shop data, 25
// products) is planned with a 5 s budget while autocannon reads the batch page and the order list on
// loopback. The same load runs first with no plan, so the two figures sit side by side in one run.
// Before the load, each route is asked once at a time and its Server-Timing phases are recorded.
import autocannon from "autocannon";
import { eq } from "drizzle-orm";
import { writeFileSync } from "node:fs";
import { cpus, loadavg } from "node:os";
import * as t from "../db/schema";
import { createShop, signIn } from "../test/support/factories";
import { appServer } from "../test/support/app";
import { startApp } from "../test/support/server";
import { getDb } from "~/db.server";
import { createBatches } from "~/models/batches.server";
import { createOrder } from "~/models/orders.server";

const db = getDb();
const budgetMs = Number(process.env.BENCH_BUDGET_MS ?? 5000);

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

// What a browser sends: pages are compressed on the way out, and that work is part of the latency.
const ACCEPT_ENCODING = "gzip, deflate, br";

/** The q-quantile by nearest rank over every recorded response (autocannon itself reports p90, p97.5, p99, but no p95). */
function quantile(sorted: number[], q: number): number {
  if (!sorted.length) return NaN;
  return sorted[Math.min(sorted.length - 1, Math.max(0, Math.ceil(q * sorted.length) - 1))];
}

const round = (ms: number) => Math.round(ms * 10) / 10;

function load(url: string, cookie: string, paths: string[], seconds: number): Promise<Result[]> {
  return Promise.all(
    paths.map(
      (path) =>
        new Promise<Result>((resolve, reject) => {
          const latencies: number[] = [];
          const instance = autocannon(
            { url: `${url}${path}`, connections: Number(process.env.BENCH_CONNECTIONS ?? 1), duration: seconds, headers: { cookie, "accept-encoding": ACCEPT_ENCODING } },
            (error, r) => {
              if (error) return reject(error);
              latencies.sort((a, b) => a - b);
              resolve({
                route: path.replace(/[0-9a-f-]{36}/, ":id"),
                requests: latencies.length,
                p50: round(quantile(latencies, 0.5)),
                p95: round(quantile(latencies, 0.95)),
                p99: round(quantile(latencies, 0.99)),
                rps: r.requests.average,
                non2xx: r.non2xx,
                errors: r.errors,
              });
            },
          );
          // Every response's own latency (ms, to the last byte), so the percentiles are exact.
          instance.on("response", (_client: unknown, _status: number, _bytes: number, responseTime: number) => latencies.push(responseTime));
        }),
    ),
  );
}

type Breakdown = { route: string; phases: Map<string, number>; client: number; kB: number };

/** One request at a time, nothing else running: the median of each Server-Timing phase and of the whole answer. */
async function breakdown(url: string, cookie: string, path: string, samples = 40): Promise<Breakdown> {
  const phases = new Map<string, number[]>();
  const client: number[] = [];
  let bytes = 0;
  for (let i = 0; i < samples + 5; i++) {
    const started = performance.now();
    const res = await fetch(`${url}${path}`, { headers: { cookie, "accept-encoding": ACCEPT_ENCODING } });
    const body = await res.arrayBuffer();
    if (i < 5) continue; // warm-up
    client.push(performance.now() - started);
    bytes = body.byteLength;
    for (const entry of (res.headers.get("server-timing") ?? "").split(",")) {
      const match = /^\s*([\w-]+);dur=([\d.]+)/.exec(entry);
      if (match) phases.set(match[1], [...(phases.get(match[1]) ?? []), Number(match[2])]);
    }
  }
  const median = (xs: number[]) => quantile([...xs].sort((a, b) => a - b), 0.5);
  return { route: path.replace(/[0-9a-f-]{36}/, ":id"), phases: new Map([...phases].map(([k, xs]) => [k, median(xs)])), client: median(client), kB: bytes / 1000 };
}

const loadBefore = loadavg();
const { shop, batchId } = await seedShop();
const app = await startApp({ STOPWISE_SERVER_TIMING: "1" });
const server = await appServer();
const cookie = await signIn(server, shop.users.planner);
const paths = [`/batches/${batchId}`, "/api/orders?sort=due", "/orders"];
const seconds = Math.ceil(budgetMs / 1000);

console.log(`Shop: 500 orders, a batch of 2,000 parts from 25 products. Budget ${budgetMs} ms. ${process.env.BENCH_CONNECTIONS ?? 1} connection(s) per route.`);
const phases: Breakdown[] = [];
for (const path of paths) phases.push(await breakdown(app.url, cookie, path));
const idle = await load(app.url, cookie, paths, seconds);

const started = Date.now();
const res = await fetch(`${app.url}/batches/${batchId}`, {
  method: "POST",
  headers: { cookie, "content-type": "application/x-www-form-urlencoded", origin: app.url },
  body: new URLSearchParams({ intent: "run-plan", kerfMm: "3.2", trimMm: "10", seconds: String(budgetMs / 1000), stages: "2", objective: "sheets" }),
  redirect: "manual",
});
if (res.status !== 302) throw new Error(`run-plan answered ${res.status}`);
const busy = await load(app.url, cookie, paths, seconds);
let plan: typeof t.plans.$inferSelect | undefined;
for (;;) {
  [plan] = await db.select().from(t.plans).where(eq(t.plans.batchId, batchId));
  if (plan && (plan.status === "done" || plan.status === "failed")) break;
  await new Promise((r) => setTimeout(r, 200));
}
const wall = Date.now() - started;

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
say(`\n## Under load\n\nautocannon, ${process.env.BENCH_CONNECTIONS ?? 1} connection(s) per route, all three routes at once for ${seconds} s; idle, then while the plan runs. Percentiles are exact over every response (latency to the last byte).\n`);
say("| route | engine | requests | p50 ms | p95 ms | p99 ms | req/s | non-2xx | errors |\n|---|---|---|---|---|---|---|---|---|");
for (let i = 0; i < paths.length; i++) {
  say(row("idle", idle[i]));
  say(row("planning", busy[i]));
}
const progress = plan!.progress as { elapsedMs: number } | null;
say(`\nPlan: ${plan!.status}${plan!.error ? ` (${plan!.error})` : ""}; ${plan!.sheets} sheets, ${plan!.setups} set-ups, yield ${((plan!.yieldPermille ?? 0) / 10).toFixed(1)} %; engine ${progress?.elapsedMs ?? "?"} ms of a ${budgetMs} ms budget; ${wall} ms from request to saved.`);
const worst = busy.reduce((a, b) => (b.p95 > a.p95 ? b : a));
say(`Target: p95 under 100 ms on every route while planning — ${worst.p95 < 100 ? "met" : "NOT met"} (worst: ${worst.route} at ${worst.p95} ms).`);
writeFileSync(new URL("../test/bench/PLAN-LOAD.md", import.meta.url), `# Planning under load (bin/bench-plan)\n\n${lines.join("\n")}\n`);
await app.stop();
process.exit(0);
