// A large invented shop under a mix of reads and writes: 10,000 orders, 200 batches, five people
// signed in per role. Seeded with bulk inserts; then, on loopback, each bounded in time (and count):
//   1. where each route's time goes (Server-Timing), one request at a time;
//   2. the rated load the targets are checked on: each of the 20 people on their own connection and
//      session, at most LOAD_RATE requests a second, round their role's routes;
//   3. capacity: every route at once, no pause (saturation), reported but not a target.
// Prints and writes per-route requests/s, p50/p95/p99 (exact, from every response's latency), status classes and errors.
//   LOAD_SECONDS per run (30)  LOAD_RATE per person (1)  LOAD_CONNECTIONS per route, capacity run (1)
//   LOAD_MAX_REQUESTS per instance (20,000)
import autocannon from "autocannon";
import { randomUUID } from "node:crypto";
import { readFileSync, writeFileSync } from "node:fs";
import { cpus, loadavg } from "node:os";
import { sql } from "drizzle-orm";
import { generateIdFromEntropySize } from "lucia";
import * as t from "../db/schema";
import { createShop, TEST_PASSWORD } from "../test/support/factories";
import { ACCEPT_ENCODING, quantile, serverTimingPhases, type Phases } from "../test/support/latency";
import { startApp } from "../test/support/server";
import { getDb } from "~/db.server";
import type { Role } from "~/lib/permissions";
import { hashPassword } from "~/password.server";

const SECONDS = Number(process.env.LOAD_SECONDS ?? 30);
const CONNECTIONS = Number(process.env.LOAD_CONNECTIONS ?? 1);
const MAX_REQUESTS = Number(process.env.LOAD_MAX_REQUESTS ?? 20_000);
const RATE = Number(process.env.LOAD_RATE ?? 1);
const ORDERS = 10_000;
const BATCHES = 200;
const PEOPLE_PER_ROLE = 5;
const db = getDb();

// A seeded generator, so every run loads the same invented shop.
let seed = 20261202;
const rand = () => (seed = (seed * 1103515245 + 12345) % 2 ** 31) / 2 ** 31;
const pick = <T>(xs: T[]) => xs[Math.floor(rand() * xs.length)];
const mm = (n: number) => Math.round(n * 1000);

async function insertChunked<T>(rows: T[], insert: (chunk: T[]) => Promise<unknown>, size = 1000) {
  for (let i = 0; i < rows.length; i += size) await insert(rows.slice(i, i + size));
}

async function seedShop() {
  const shop = await createShop("Load");
  const passwordHash = await hashPassword(TEST_PASSWORD);
  const people: Record<Role, string[]> = { owner: [shop.users.owner.email], planner: [shop.users.planner.email], sawyer: [shop.users.sawyer.email], bookkeeper: [shop.users.bookkeeper.email] };
  const extra = (Object.keys(people) as Role[]).flatMap((role) =>
    Array.from({ length: PEOPLE_PER_ROLE - 1 }, (_, i) => ({ id: generateIdFromEntropySize(10), shopId: shop.id, email: `${role}-${i + 2}-${randomUUID().slice(0, 6)}@load.test`, name: `${role} ${i + 2}`, role, passwordHash })),
  );
  await db.insert(t.users).values(extra);
  for (const u of extra) people[u.role].push(u.email);

  const materials = await db
    .insert(t.materials)
    .values([
      { shopId: shop.id, name: "Birch plywood 3 mm", kind: "plywood" as const, thicknessUm: mm(3) },
      { shopId: shop.id, name: "Birch plywood 6 mm", kind: "plywood" as const, thicknessUm: mm(6) },
      { shopId: shop.id, name: "MDF 6 mm", kind: "mdf" as const, thicknessUm: mm(6) },
    ])
    .returning();
  await db.insert(t.stockPanels).values(materials.flatMap((m) => [{ shopId: shop.id, materialId: m.id, lengthUm: mm(2440), widthUm: mm(1220), costMinor: 4800, onHand: 200 }, { shopId: shop.id, materialId: m.id, lengthUm: mm(1220), widthUm: mm(1220), costMinor: 2600, onHand: 100 }]));
  const products = await db
    .insert(t.products)
    .values(Array.from({ length: 30 }, (_, i) => ({ shopId: shop.id, name: `Keepsake ${i + 1}`, priceMinor: 400 + i * 150 })))
    .returning();
  await db.insert(t.productParts).values(products.map((p, i) => ({ productId: p.id, materialId: materials[i % 3].id, name: `Face ${i + 1}`, lengthUm: mm(100 + ((i * 37) % 500)), widthUm: mm(60 + ((i * 53) % 300)), grainLocked: i % 4 === 0 })));
  const customers = await db
    .insert(t.customers)
    .values(Array.from({ length: 800 }, (_, i) => ({ shopId: shop.id, name: `Customer ${i + 1}`, email: `customer${i + 1}@load.test` })))
    .returning({ id: t.customers.id });
  const [saw] = await db.insert(t.saws).values({ shopId: shop.id, name: "Table saw" }).returning();

  const statuses = ["draft", "confirmed", "confirmed", "in_production", "ready", "delivered", "delivered", "cancelled"] as const;
  const orderRows = Array.from({ length: ORDERS }, (_, i) => {
    const day = 1 + Math.floor(rand() * 360);
    const due = new Date(Date.UTC(2026, 0, day)).toISOString().slice(0, 10);
    const event = new Date(Date.UTC(2026, 0, day + 7)).toISOString().slice(0, 10);
    return { id: randomUUID(), shopId: shop.id, number: i + 1, customerId: pick(customers).id, eventDate: event, dueDate: due, status: pick([...statuses]) };
  });
  await insertChunked(orderRows, (chunk) => db.insert(t.orders).values(chunk));
  const lineRows = orderRows.flatMap((o) =>
    Array.from({ length: 1 + Math.floor(rand() * 2) }, () => {
      const product = pick(products);
      const quantity = 1 + Math.floor(rand() * 12);
      const personalised = rand() < 0.5;
      return { id: randomUUID(), orderId: o.id, productId: product.id, quantity, unitPriceMinor: product.priceMinor, personalisation: personalised ? Array.from({ length: quantity }, (_, k) => `Guest ${k + 1}`) : [] };
    }),
  );
  await insertChunked(lineRows, (chunk) => db.insert(t.orderLines).values(chunk));

  // 200 open batches, ten in-production lines each, per the line's product material.
  const materialOf = new Map(products.map((p, i) => [p.id, materials[i % 3].id]));
  const producing = new Set(orderRows.filter((o) => o.status === "in_production").map((o) => o.id));
  const batchable = lineRows.filter((l) => producing.has(l.orderId));
  const batchRows: { id: string; shopId: string; number: number; materialId: string; dueBy: string }[] = [];
  const batchLineRows: { batchId: string; orderLineId: string; materialId: string }[] = [];
  for (let b = 0; b < BATCHES; b++) {
    const materialId = materials[b % 3].id;
    const lines = batchable.filter((l) => materialOf.get(l.productId) === materialId).slice(Math.floor(b / 3) * 10, Math.floor(b / 3) * 10 + 10);
    const id = randomUUID();
    batchRows.push({ id, shopId: shop.id, number: b + 1, materialId, dueBy: "2026-12-31" });
    for (const l of lines) batchLineRows.push({ batchId: id, orderLineId: l.id, materialId });
  }
  await insertChunked(batchRows, (chunk) => db.insert(t.batches).values(chunk));
  await insertChunked(batchLineRows, (chunk) => db.insert(t.batchLines).values(chunk));
  return { shop, people, orderIds: orderRows.map((o) => o.id), batchIds: batchRows.map((b) => b.id), sawId: saw.id, lines: lineRows.length, batchLines: batchLineRows.length };
}

type Route = { name: string; role: Role; kind: "page" | "api" | "write"; paths: () => string; method?: "POST"; body?: () => string };
type Samples = { latencies: number[]; classes: Record<string, number> };
type Run = { byRoute: Map<Route, Samples>; errors: number; timeouts: number; seconds: number };

/**
 * One autocannon instance: `connections` connections, each sending the route `next()` picks, with the
 * cookie `cookieFor` gives, at most `rate` requests a second per connection when set (else as fast as
 * answers come). With one connection and no pipelining, answers come in the order requests were set
 * up, so a queue of route names tells whose latency each answer is.
 */
function drive(url: string, options: { connections: number; rate?: number; next: () => Route; cookieFor: (route: Route) => string; into: Map<Route, Samples> }): Promise<{ errors: number; timeouts: number }> {
  return new Promise((resolve, reject) => {
    const sent: Route[] = [];
    const instance = autocannon(
      {
        url,
        connections: options.connections,
        ...(options.rate ? { connectionRate: options.rate } : {}),
        duration: SECONDS,
        maxOverallRequests: MAX_REQUESTS, // with duration: whichever comes first ("amount" would override duration)
        timeout: 10,
        requests: [
          {
            setupRequest: (req: autocannon.Request) => {
              const route = options.next();
              // Several connections share one instance only when every request is the same route.
              if (options.connections === 1 || sent.length === 0) sent.push(route);
              return {
                ...req,
                method: route.method ?? "GET",
                path: route.paths(),
                headers: {
                  cookie: options.cookieFor(route),
                  "accept-encoding": ACCEPT_ENCODING,
                  ...(route.method === "POST" ? { "content-type": "application/x-www-form-urlencoded", origin: url } : {}),
                },
                ...(route.body ? { body: route.body() } : {}),
              };
            },
          },
        ],
      },
      (error, r) => (error ? reject(error) : resolve({ errors: r.errors, timeouts: r.timeouts })),
    );
    instance.on("response", (_client: unknown, status: number, _bytes: number, ms: number) => {
      const route = options.connections === 1 ? sent.shift()! : sent[0];
      const samples = options.into.get(route)!;
      samples.latencies.push(ms);
      samples.classes[`${Math.floor(status / 100)}xx`] = (samples.classes[`${Math.floor(status / 100)}xx`] ?? 0) + 1;
    });
  });
}

/** CPU seconds used so far by this script's child processes (the app server and its threads), from /proc (Linux). */
function childCpuSeconds(): number {
  try {
    const children = readFileSync(`/proc/${process.pid}/task/${process.pid}/children`, "utf8").trim().split(/\s+/).filter(Boolean);
    let ticks = 0;
    for (const pid of children) {
      const fields = readFileSync(`/proc/${pid}/stat`, "utf8").split(") ")[1].split(" ");
      ticks += Number(fields[11]) + Number(fields[12]); // utime, stime (fields 14 and 15 of stat)
    }
    return ticks / 100; // USER_HZ is 100 on Linux
  } catch {
    return NaN;
  }
}

/** The whole machine's busy and total CPU time so far (all cores), from /proc/stat. */
function machineCpu(): { busy: number; total: number } {
  try {
    const [, ...values] = readFileSync("/proc/stat", "utf8").split("\n")[0].trim().split(/\s+/);
    const [user, nice, system, idle, iowait, irq, softirq, steal] = values.map(Number);
    const busy = user + nice + system + irq + softirq + steal;
    return { busy, total: busy + idle + iowait };
  } catch {
    return { busy: NaN, total: NaN };
  }
}

/** Runs `work`, and says how much CPU the app and the whole machine used meanwhile. */
async function withCpu<T>(work: () => Promise<T>): Promise<T & { appCpu: number; machineBusy: number }> {
  const [app0, m0, t0] = [childCpuSeconds(), machineCpu(), performance.now()];
  const result = await work();
  const [app1, m1, seconds] = [childCpuSeconds(), machineCpu(), (performance.now() - t0) / 1000];
  return { ...result, appCpu: (app1 - app0) / seconds, machineBusy: ((m1.busy - m0.busy) / (m1.total - m0.total)) * cpus().length };
}

const emptySamples = (routes: Route[]) => new Map(routes.map((r) => [r, { latencies: [] as number[], classes: { "2xx": 0, "3xx": 0, "4xx": 0, "5xx": 0 } as Record<string, number> }]));

/** Capacity: every route at once, CONNECTIONS each, no pause; each request takes the next of the role's sessions. */
async function saturate(url: string, routes: Route[], cookies: Record<Role, string[]>): Promise<Run> {
  const byRoute = emptySamples(routes);
  const counters = new Map<Role, number>();
  const ends = await Promise.all(
    routes.map((route) =>
      drive(url, {
        connections: CONNECTIONS,
        next: () => route,
        cookieFor: (r) => {
          const n = counters.get(r.role) ?? 0;
          counters.set(r.role, n + 1);
          return cookies[r.role][n % cookies[r.role].length];
        },
        into: byRoute,
      }),
    ),
  );
  return { byRoute, errors: ends.reduce((n, e) => n + e.errors, 0), timeouts: ends.reduce((n, e) => n + e.timeouts, 0), seconds: SECONDS };
}

/**
 * The rated load: every signed-in person on a connection of their own with their own session, at most
 * RATE requests a second each, going round their role's routes. Starts are spread over the first second
 * so that twenty people do not all click in the same millisecond.
 */
async function rated(url: string, routes: Route[], cookies: Record<Role, string[]>): Promise<Run> {
  const byRoute = emptySamples(routes);
  const people = (Object.keys(cookies) as Role[]).flatMap((role) => cookies[role].map((cookie) => ({ role, cookie })));
  const ends = await Promise.all(
    people.map(async ({ role, cookie }, k) => {
      await new Promise((r) => setTimeout(r, (k * 1000) / people.length));
      const mine = routes.filter((r) => r.role === role);
      let n = k;
      return drive(url, { connections: 1, rate: RATE, next: () => mine[n++ % mine.length], cookieFor: () => cookie, into: byRoute });
    }),
  );
  return { byRoute, errors: ends.reduce((n, e) => n + e.errors, 0), timeouts: ends.reduce((n, e) => n + e.timeouts, 0), seconds: SECONDS };
}

type Breakdown = Phases & { route: Route };

/** One request at a time, nothing else running: the median of 15 (after 3 not counted). */
async function breakdown(url: string, route: Route, cookie: string): Promise<Breakdown> {
  return { route, ...(await serverTimingPhases(`${url}${route.paths()}`, cookie, { samples: 15, warmUp: 3 })) };
}

const loadBefore = loadavg();
const seedStarted = performance.now();
const s = await seedShop();
// Planner statistics, as autovacuum would gather within a minute of a real shop's data arriving:
// without them the first minute after a bulk seed plans every join as if the tables were empty.
await db.execute(sql`analyze`);
const seedMs = performance.now() - seedStarted;
const app = await startApp({ STOPWISE_SERVER_TIMING: "1" });

// Five people per role sign in through the form, as they would.
const cookies = {} as Record<Role, string[]>;
for (const role of Object.keys(s.people) as Role[]) {
  cookies[role] = [];
  for (const email of s.people[role]) {
    const res = await fetch(`${app.url}/sign-in`, { method: "POST", body: new URLSearchParams({ email, password: TEST_PASSWORD }), redirect: "manual" });
    if (res.status !== 302) throw new Error(`sign-in of ${email} answered ${res.status}`);
    cookies[role].push(res.headers.get("set-cookie")!.split(";")[0]);
  }
}

let i = 0;
const cycle = (xs: string[]) => () => xs[i++ % xs.length];
const someOrders = s.orderIds.filter((_, k) => k % 50 === 0).map((id) => `/orders/${id}`);
const someBatches = s.batchIds.filter((_, k) => k % 4 === 0);
let written = 0;
const routes: Route[] = [
  { name: "/ (home: what is waiting)", role: "owner", kind: "page", paths: cycle(["/"]) },
  { name: "/orders", role: "owner", kind: "page", paths: cycle(["/orders", "/orders?status=confirmed", "/orders?sort=due&page=3"]) },
  // A search reads every personalisation text of the shop's orders (no index serves an ilike inside jsonb).
  { name: "/orders?q= (search)", role: "owner", kind: "page", paths: cycle(["/orders?q=Guest%2017", "/orders?q=Walk", "/orders?q=nobody-of-that-name"]) },
  { name: "/orders/:id", role: "owner", kind: "page", paths: cycle(someOrders) },
  { name: "/customers", role: "owner", kind: "page", paths: cycle(["/customers"]) },
  { name: "/api/orders", role: "owner", kind: "api", paths: cycle(["/api/orders?sort=due", "/api/orders?status=confirmed"]) },
  { name: "POST /customers/new", role: "owner", kind: "write", method: "POST", paths: cycle(["/customers/new"]), body: () => new URLSearchParams({ name: `Walk-in ${++written}`, email: "", phone: "", notes: "" }).toString() },
  { name: "/batches", role: "planner", kind: "page", paths: cycle(["/batches"]) },
  { name: "/batches/:id", role: "planner", kind: "page", paths: cycle(someBatches.map((id) => `/batches/${id}`)) },
  { name: "/api/batches/:id/plans", role: "planner", kind: "api", paths: cycle(someBatches.map((id) => `/api/batches/${id}/plans`)) },
  { name: "/saw", role: "sawyer", kind: "page", paths: cycle(["/saw"]) },
  { name: "POST /sleds (kerf)", role: "sawyer", kind: "write", method: "POST", paths: cycle(["/sleds"]), body: () => new URLSearchParams({ intent: "kerf", sawId: s.sawId, kerf: pick(["3.1", "3.2", "3.3"]), note: "" }).toString() },
  { name: "/ledger", role: "bookkeeper", kind: "page", paths: cycle(["/ledger"]) },
  { name: "/api/ledger", role: "bookkeeper", kind: "api", paths: cycle(["/api/ledger"]) },
];

// Warm-up: each route once, so the first figures are not the build's cold start.
for (const r of routes) await fetch(`${app.url}${r.paths()}`, { headers: { cookie: cookies[r.role][0] } }).then((res) => res.arrayBuffer());

const phases: Breakdown[] = [];
for (const r of routes.filter((r) => r.kind !== "write")) phases.push(await breakdown(app.url, r, cookies[r.role][0]));
const ratedRun = await withCpu(() => rated(app.url, routes, cookies));
const capacityRun = await withCpu(() => saturate(app.url, routes, cookies));
const loadAfter = loadavg();

const lines: string[] = [];
const say = (text: string) => {
  console.log(text);
  lines.push(text);
};
const round = (x: number) => (Number.isFinite(x) ? Math.round(x * 10) / 10 : NaN);
const people = PEOPLE_PER_ROLE * 4;

function table(run: Run & { appCpu: number; machineBusy: number }) {
  say("| route | role | kind | requests | req/s | p50 ms | p95 ms | p99 ms | 2xx | 3xx | 4xx | 5xx |\n|---|---|---|---|---|---|---|---|---|---|---|---|");
  for (const [route, { latencies: l, classes }] of run.byRoute) {
    l.sort((a, b) => a - b);
    say(`| ${route.name} | ${route.role} | ${route.kind} | ${l.length} | ${round(l.length / run.seconds)} | ${round(quantile(l, 0.5))} | ${round(quantile(l, 0.95))} | ${round(quantile(l, 0.99))} | ${classes["2xx"]} | ${classes["3xx"]} | ${classes["4xx"]} | ${classes["5xx"]} |`);
  }
  const all = [...run.byRoute.values()];
  const total = all.reduce((n, r) => n + r.latencies.length, 0);
  const fiveXX = all.reduce((n, r) => n + r.classes["5xx"], 0);
  say(`\nAll routes: ${total.toLocaleString("en")} requests in ${run.seconds} s (${round(total / run.seconds)} req/s), ${fiveXX} answered 5xx, ${run.errors} connection errors, ${run.timeouts} timeouts. Writes answer 302 (redirect after post).`);
  say(`CPU meanwhile (from /proc): the app process used ${run.appCpu.toFixed(2)} of a core; the whole machine was busy ${run.machineBusy.toFixed(2)} of its ${cpus().length} cores (PostgreSQL, autocannon and everything else running beside it).`);
  return { total, fiveXX };
}

/** The targets, checked on one run: zero 5xx, p95 < 150 ms for pages and API reads, p99 < 500 ms. */
function verdict(run: Run, fiveXX: number) {
  const entries = [...run.byRoute];
  const reads = entries.filter(([r]) => r.kind !== "write");
  const worst = (xs: typeof entries, q: number) => xs.reduce((a, b) => (quantile(b[1].latencies, q) > quantile(a[1].latencies, q) ? b : a));
  const [w95, s95] = worst(reads, 0.95);
  const [w99, s99] = worst(entries, 0.99);
  const p95 = quantile(s95.latencies, 0.95);
  const p99 = quantile(s99.latencies, 0.99);
  const met = (ok: boolean) => (ok ? "met" : "NOT met");
  return `zero 5xx — ${met(fiveXX === 0 && run.errors === 0 && run.timeouts === 0)}; p95 under 150 ms for pages and API reads — ${met(p95 < 150)} (worst ${w95.name} at ${round(p95)} ms); p99 under 500 ms — ${met(p99 < 500)} (worst ${w99.name} at ${round(p99)} ms)`;
}

say(`Run ${new Date().toISOString()} on ${cpus().length} cores; load average before ${loadBefore.map((l) => l.toFixed(1)).join(" / ")}, after ${loadAfter.map((l) => l.toFixed(1)).join(" / ")} (a shared machine: other work runs beside it; compare rows of one run, not runs).`);
say(`Seeded in ${(seedMs / 1000).toFixed(1)} s with bulk inserts, then ANALYZE: ${ORDERS.toLocaleString("en")} orders (${s.lines.toLocaleString("en")} lines), 800 customers, 30 products, ${BATCHES} open batches (${s.batchLines.toLocaleString("en")} batch lines), ${PEOPLE_PER_ROLE} people signed in per role (${people}).`);
say(`Production build, one bin/serve.ts process with compression and its plan runner; autocannon on loopback; requests ask for gzip/br like a browser. Latency to the last byte; percentiles exact over every response.`);

say(`\n## Where the time goes\n\nOne request at a time before the load, median of 15, from the Server-Timing header (STOPWISE_SERVER_TIMING=1): session = session and user lookup; queries = the loader's reads (where wrapped in timed()); rest = the rest of the handler (for pages: the server render up to the shell and the loader data's serialisation); client = the whole answer as the client saw it, including streaming the body and compression. Milliseconds.\n`);
const names = [...new Set(phases.flatMap((b) => [...b.phases.keys()]))].filter((n) => n !== "total");
say(`| route | ${names.join(" | ")} | total | client | kB |\n|---|${names.map(() => "---|").join("")}---|---|---|`);
for (const b of phases) say(`| ${b.route.name} | ${names.map((n) => (b.phases.has(n) ? b.phases.get(n)!.toFixed(1) : "–")).join(" | ")} | ${(b.phases.get("total") ?? NaN).toFixed(1)} | ${b.client.toFixed(1)} | ${b.kB.toFixed(1)} |`);

say(`\n## Rated load: the targets are checked here\n\nEvery one of the ${people} signed-in people on a connection of their own, with their own session, sending at most ${RATE} request a second (autocannon's connectionRate; the next request waits for the answer) for ${SECONDS} s, going round their role's routes (owner ${routes.filter((r) => r.role === "owner").length}, planner ${routes.filter((r) => r.role === "planner").length}, sawyer and bookkeeper 2 each); starts spread over the first second. About ${people * RATE} requests a second in all. Generous for the shop this is made for: 2–6 people, each loading a page every several seconds at the busiest — here ${people} people each ask once a second without pause, several times a real shop's peak (static assets aside, which express serves from disk).\n`);
const ratedTotals = table(ratedRun);
const ratedVerdict = verdict(ratedRun, ratedTotals.fiveXX);
say(`Targets (on this run): ${ratedVerdict}.`);

say(`\n## Capacity: saturation, not a target\n\nAll ${routes.length} routes at once, ${CONNECTIONS} connection(s) each, no pause (a closed loop: each connection sends its next request the moment an answer arrives) for ${SECONDS} s, at most ${MAX_REQUESTS.toLocaleString("en")} requests a route; each request takes the next of the role's ${PEOPLE_PER_ROLE} sessions. This measures how much one process answers at full pressure, and latency there is mostly queueing.\n`);
const capacityTotals = table(capacityRun);
say(`The same targets on this run, for comparison only: ${verdict(capacityRun, capacityTotals.fiveXX)}.`);
writeFileSync(new URL("../test/bench/LOAD.md", import.meta.url), `# A large shop under load (bin/load)\n\nRun with \`flock /tmp/stopwise-bench.lock bin/load\`.\n\n${lines.join("\n")}\n`);
await app.stop();
process.exit(0);
