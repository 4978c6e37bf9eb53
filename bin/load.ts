// A large invented shop under a mix of reads and writes: 10,000 orders, 200 batches, five people
// signed in per role. Seeded with bulk inserts, then autocannon drives every route at once on
// loopback for a fixed time (each route also capped in requests). Prints and writes per-route
// requests/s, p50/p95/p99 (exact, from every response's latency), status classes and errors.
//   LOAD_SECONDS (30)  LOAD_CONNECTIONS per route (1)  LOAD_MAX_REQUESTS per route (20,000)
import autocannon from "autocannon";
import { randomUUID } from "node:crypto";
import { writeFileSync } from "node:fs";
import { cpus, loadavg } from "node:os";
import { generateIdFromEntropySize } from "lucia";
import * as t from "../db/schema";
import { createShop, TEST_PASSWORD } from "../test/support/factories";
import { startApp } from "../test/support/server";
import { getDb } from "~/db.server";
import type { Role } from "~/lib/permissions";
import { hashPassword } from "~/password.server";

const SECONDS = Number(process.env.LOAD_SECONDS ?? 30);
const CONNECTIONS = Number(process.env.LOAD_CONNECTIONS ?? 1);
const MAX_REQUESTS = Number(process.env.LOAD_MAX_REQUESTS ?? 20_000);
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
type Result = { route: Route; latencies: number[]; classes: Record<string, number>; errors: number; timeouts: number; rps: number };

function drive(url: string, route: Route, cookies: string[]): Promise<Result> {
  return new Promise((resolve, reject) => {
    const latencies: number[] = [];
    const classes: Record<string, number> = { "2xx": 0, "3xx": 0, "4xx": 0, "5xx": 0 };
    let n = 0;
    const instance = autocannon(
      {
        url,
        connections: CONNECTIONS,
        duration: SECONDS,
        maxOverallRequests: MAX_REQUESTS, // with duration: whichever comes first ("amount" would override duration)
        timeout: 10,
        requests: [
          {
            method: route.method ?? "GET",
            // Each request: the next of the role's five people, and the next path or body.
            setupRequest: (req: autocannon.Request) => ({
              ...req,
              path: route.paths(),
              headers: {
                cookie: cookies[n++ % cookies.length],
                "accept-encoding": "gzip, deflate, br",
                ...(route.method === "POST" ? { "content-type": "application/x-www-form-urlencoded", origin: url } : {}),
              },
              ...(route.body ? { body: route.body() } : {}),
            }),
          },
        ],
      },
      (error, r) => {
        if (error) return reject(error);
        resolve({ route, latencies: latencies.sort((a, b) => a - b), classes, errors: r.errors, timeouts: r.timeouts, rps: r.requests.average });
      },
    );
    instance.on("response", (_client: unknown, status: number, _bytes: number, ms: number) => {
      latencies.push(ms);
      classes[`${Math.floor(status / 100)}xx`] = (classes[`${Math.floor(status / 100)}xx`] ?? 0) + 1;
    });
  });
}

/** The q-quantile by nearest rank (autocannon reports p97.5 and p99 but no p95). */
const quantile = (sorted: number[], q: number) => (sorted.length ? sorted[Math.min(sorted.length - 1, Math.max(0, Math.ceil(q * sorted.length) - 1))] : NaN);

const loadBefore = loadavg();
const seedStarted = performance.now();
const s = await seedShop();
const seedMs = performance.now() - seedStarted;
const app = await startApp();

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
  { name: "/orders", role: "owner", kind: "page", paths: cycle(["/orders", "/orders?status=confirmed", "/orders?sort=due&page=3"]) },
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

const results = await Promise.all(routes.map((r) => drive(app.url, r, cookies[r.role])));
const loadAfter = loadavg();

const lines: string[] = [];
const say = (text: string) => {
  console.log(text);
  lines.push(text);
};
const round = (x: number) => (Number.isFinite(x) ? Math.round(x * 10) / 10 : NaN);
say(`Run ${new Date().toISOString()} on ${cpus().length} cores; load average before ${loadBefore.map((l) => l.toFixed(1)).join(" / ")}, after ${loadAfter.map((l) => l.toFixed(1)).join(" / ")} (a shared machine: other work runs beside it).`);
say(`Seeded in ${(seedMs / 1000).toFixed(1)} s with bulk inserts: ${ORDERS.toLocaleString("en")} orders (${s.lines.toLocaleString("en")} lines), 800 customers, 30 products, ${BATCHES} open batches (${s.batchLines.toLocaleString("en")} batch lines), ${PEOPLE_PER_ROLE} people signed in per role.`);
say(`Production build, bin/serve.ts with compression and its plan runner; autocannon on loopback, all ${routes.length} routes at once, ${CONNECTIONS} connection(s) each, ${SECONDS} s, at most ${MAX_REQUESTS.toLocaleString("en")} requests a route; each request takes the next of the role's ${PEOPLE_PER_ROLE} sessions. Latency to the last byte, percentiles exact over every response.\n`);
say("| route | role | kind | requests | req/s | p50 ms | p95 ms | p99 ms | 2xx | 3xx | 4xx | 5xx | errors | timeouts |\n|---|---|---|---|---|---|---|---|---|---|---|---|---|---|");
for (const r of results) {
  const l = r.latencies;
  say(`| ${r.route.name} | ${r.route.role} | ${r.route.kind} | ${l.length} | ${round(r.rps)} | ${round(quantile(l, 0.5))} | ${round(quantile(l, 0.95))} | ${round(quantile(l, 0.99))} | ${r.classes["2xx"]} | ${r.classes["3xx"]} | ${r.classes["4xx"]} | ${r.classes["5xx"]} | ${r.errors} | ${r.timeouts} |`);
}
const total = results.reduce((n, r) => n + r.latencies.length, 0);
const fiveXX = results.reduce((n, r) => n + r.classes["5xx"], 0);
const errors = results.reduce((n, r) => n + r.errors, 0);
const reads = results.filter((r) => r.route.kind !== "write");
const worst95 = reads.reduce((a, b) => (quantile(b.latencies, 0.95) > quantile(a.latencies, 0.95) ? b : a));
const worst99 = results.reduce((a, b) => (quantile(b.latencies, 0.99) > quantile(a.latencies, 0.99) ? b : a));
say(`\nAll routes: ${total.toLocaleString("en")} requests in ${SECONDS} s (${Math.round(total / SECONDS)} req/s), ${fiveXX} answered 5xx, ${errors} connection errors. Writes answer 302 (redirect after post) or 200.`);
say(`Targets: zero 5xx — ${fiveXX === 0 && errors === 0 ? "met" : "NOT met"}; p95 under 150 ms for pages and API reads — ${quantile(worst95.latencies, 0.95) < 150 ? "met" : "NOT met"} (worst ${worst95.route.name} at ${round(quantile(worst95.latencies, 0.95))} ms); p99 under 500 ms — ${quantile(worst99.latencies, 0.99) < 500 ? "met" : "NOT met"} (worst ${worst99.route.name} at ${round(quantile(worst99.latencies, 0.99))} ms).`);
writeFileSync(new URL("../test/bench/LOAD.md", import.meta.url), `# A large shop under load (bin/load)\n\nRun with \`flock /tmp/stopwise-bench.lock bin/load\`.\n\n${lines.join("\n")}\n`);
await app.stop();
process.exit(0);
