// Bad input never breaks Stopwise: random, huge, wrongly typed and unknown fields posted to every
// action and API route answer 4xx (or a redirect), never 5xx; a refused request leaves the database
// exactly as it was and says what was wrong. Fast-check, a bounded number of runs.
import fc from "fast-check";
import { eq, sql } from "drizzle-orm";
import request from "supertest";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import * as t from "../../db/schema";
import { appServer } from "../support/app";
import { batchScenario } from "../support/batch-factories";
import { signIn } from "../support/factories";
import { getDb } from "~/db.server";
import { startPlanRunner, stopPlanRunner } from "~/jobs/plan-runner.server";
import { createBatches } from "~/models/batches.server";
import { releasePlan, requestPlan } from "~/models/plans.server";

const server = await appServer();

// Row count and checksum of the fuzzed shop's rows in every table, in one query: tables with a
// shop_id by it, the others through their foreign key to such a table. Sessions (their expiry slides
// as they are used) and the sign-in limiter's counters change on reads by design.
const CHANGE_AS_USED = new Set(["sessions", "rate_limits"]);
let snapshotQuery: string;
let shopId: string;
async function snapshot(): Promise<Record<string, string>> {
  const db = getDb();
  if (!snapshotQuery) {
    const tables = await db.execute<{ name: string; shop: boolean }>(sql`
      select t.table_name as name, exists (select 1 from information_schema.columns c where c.table_schema = 'public' and c.table_name = t.table_name and c.column_name = 'shop_id') as shop
      from information_schema.tables t where t.table_schema = 'public' and t.table_type = 'BASE TABLE' order by 1`);
    const withShop = new Set(tables.filter((r) => r.shop).map((r) => r.name));
    const links = await db.execute<{ child: string; col: string; parent: string }>(sql`
      select kcu.table_name as child, kcu.column_name as col, ccu.table_name as parent
      from information_schema.table_constraints tc
      join information_schema.key_column_usage kcu on kcu.constraint_name = tc.constraint_name and kcu.table_schema = tc.table_schema
      join information_schema.constraint_column_usage ccu on ccu.constraint_name = tc.constraint_name and ccu.table_schema = tc.table_schema
      where tc.constraint_type = 'FOREIGN KEY' and tc.table_schema = 'public'`);
    const id = `'${shopId}'::uuid`;
    const scope = (name: string) => {
      if (name === "shops") return `where t.id = ${id}`;
      if (withShop.has(name)) return `where t.shop_id = ${id}`;
      const link = links.find((l) => l.child === name && withShop.has(l.parent));
      return link ? `where t."${link.col}" in (select id from "${link.parent}" where shop_id = ${id})` : "";
    };
    snapshotQuery = tables
      .filter((r) => !CHANGE_AS_USED.has(r.name))
      .map((r) => `select '${r.name}' as name, count(*) || ':' || md5(coalesce(string_agg(t::text, '|' order by t::text), '')) as sum from "${r.name}" t ${scope(r.name)}`)
      .join(" union all ");
  }
  const rows = await db.execute<{ name: string; sum: string }>(sql.raw(snapshotQuery));
  return Object.fromEntries(rows.map((r) => [r.name, r.sum]));
}

/** Tables whose rows differ between two snapshots. */
const changed = (before: Record<string, string>, after: Record<string, string>) => Object.keys(before).filter((k) => before[k] !== after[k]);

// A refused form names what was wrong: a field's message next to it, or the form's alert; an API
// route (JSON) says it in `error`.
const SAYS_WHY = /aria-invalid="true"|role="alert"|^\{"error":"[^"]+/;
let cookie: string;
let ids: Record<string, string>;

beforeAll(async () => {
  const s = await batchScenario();
  shopId = s.shop.id;
  cookie = await signIn(server, s.shop.users.owner);
  const [batchId] = await createBatches(s.shop.id, "2027-01-15", [s.birch6.id]);
  // A released batch, so the floor API's fuzzing reaches its parsing, not just its 404.
  const [releasedId] = await createBatches(s.shop.id, "2027-01-15", [s.birch3.id]);
  await startPlanRunner();
  const planId = await requestPlan(s.shop.id, releasedId, { kerfMm: 3.2, trimMm: 10, stages: 2, objective: "sheets", timeLimitMs: 300, offcutIds: [], seed: 3 });
  for (let i = 0; i < 200 && (await getDb().select({ status: t.plans.status }).from(t.plans).where(eq(t.plans.id, planId)))[0].status !== "done"; i++) await new Promise((r) => setTimeout(r, 100));
  await releasePlan(s.shop.id, releasedId, planId);
  const [customer] = await getDb().select({ id: t.customers.id }).from(t.customers).where(eq(t.customers.shopId, s.shop.id)).limit(1);
  // A product on the scenario's orders: retiring toggles, deleting is always refused.
  const [product] = await getDb().select({ id: t.orderLines.productId }).from(t.orderLines).where(eq(t.orderLines.orderId, s.wedding.id)).limit(1);
  ids = { order: s.wedding.id, batch: batchId, released: releasedId, customer: customer.id, product: product.id };
});
afterAll(() => stopPlanRunner());

const INTENTS = ["invite", "role", "remove", "revoke", "move", "resend", "ready-notice", "repeat", "add-lines", "remove-line", "line-texts", "header", "create", "unhold", "move-line", "hold-line", "run-plan", "cancel-plan", "release", "spoil", "close", "add", "discard", "material", "panel", "delete", "request-deposit", "refund-deposit", "retire", "restore", "delete-product", "name", "password", ""];
const FIELDS = ["intent", "email", "role", "memberId", "invitationId", "to", "lineId", "customerId", "customer", "eventDate", "dueDate", "notes", "name", "phone", "kerfMm", "trimMm", "seconds", "stages", "objective", "planId", "targetBatchId", "dueBy", "materialId", "length", "width", "location", "grain", "offcutId", "part", "quantity", "reason", "line-0-product", "line-0-quantity", "line-0-texts", "line-0-csvHeader", "line-0-followRows", "setupIndex", "countCut", "parts", "price", "leadTimeDays", "unit", "currency", "deposit", "depositRule", "depositPercent", "depositFixedMinor", "repeatEventDate", "repeatTexts", "current", "password", "confirm"];

const nasty = fc.oneof(
  fc.string(),
  fc.string({ unit: "grapheme", maxLength: 50 }),
  fc.constantFrom("", " ", "-1", "0", "1e309", "NaN", "9".repeat(40), "2027-02-30", "../../etc/passwd", "<script>x</script>", "'; drop table orders; --", "00000000-0000-4000-8000-000000000000", "{}", "[]", "null", "true"),
  fc.integer().map(String),
  fc.double().map(String),
  fc.constant("x".repeat(20_000)),
);
const body = fc.dictionary(fc.oneof(fc.constantFrom(...FIELDS), fc.string({ maxLength: 12 })), nasty, { maxKeys: 8 }).chain((fields) =>
  fc.constantFrom(...INTENTS).map((intent) => ({ ...fields, intent })),
);

const routes = () => [
  "/team",
  "/account",
  "/customers/new",
  `/customers/${ids.customer}`,
  "/orders/new",
  `/orders/${ids.order}`,
  "/batches",
  `/batches/${ids.batch}`,
  "/rack",
  "/sleds",
  "/settings",
  "/catalogue/materials",
  "/catalogue/products/new",
  `/catalogue/products/${ids.product}`,
  "/sign-up",
  "/forgot-password",
  "/webhooks/payments",
];

describe("fuzzing the actions", () => {
  it("random form bodies to every action never answer 5xx; a refusal says why and changes nothing", async () => {
    const statuses: Record<number, number> = {};
    let last: Record<string, string> | undefined; // the state after the previous request
    for (const route of routes()) {
      await fc.assert(
        fc.asyncProperty(body, async (fields) => {
          const before = last ?? (await snapshot());
          const res = await request(server).post(route).set("Cookie", cookie).type("form").send(fields);
          const what = `${route} answered ${res.status} to ${JSON.stringify(fields, (_k, v) => (typeof v === "string" && v.length > 40 ? `${v.slice(0, 10)}…(${v.length})` : v)).slice(0, 400)}`;
          statuses[res.status] = (statuses[res.status] ?? 0) + 1;
          if (res.status >= 500) throw new Error(what);
          last = await snapshot();
          if (res.status >= 400) {
            const diff = changed(before, last);
            if (diff.length) throw new Error(`${what} yet changed ${diff.join(", ")}`);
            if (!SAYS_WHY.test(res.text)) throw new Error(`${what} without a message next to a field or in an alert`);
          }
        }),
        { numRuns: 25 },
      );
    }
    // The bodies must mostly be refused, or the property above says little.
    const refused = Object.entries(statuses).filter(([s]) => Number(s) >= 400).reduce((n, [, c]) => n + c, 0);
    expect(refused).toBeGreaterThan(routes().length * 25 * 0.5);
  }, 240_000); // 425 bounded requests; the machine is shared, so the bound is generous

  it("random JSON to the floor API answers 4xx naming the field and changes nothing, or ticks a real set-up", async () => {
    const jsonish = fc.jsonValue({ maxDepth: 1 });
    const tick = fc.record(
      {
        setupIndex: fc.oneof({ weight: 3, arbitrary: fc.integer({ min: 0, max: 2 }) }, { weight: 1, arbitrary: fc.integer({ min: -2, max: 40 }) }, { weight: 1, arbitrary: jsonish }),
        countCut: fc.oneof({ weight: 2, arbitrary: fc.integer({ min: 0, max: 20 }) }, { weight: 1, arbitrary: fc.integer({ min: -5, max: 200_000 }) }, { weight: 1, arbitrary: jsonish }),
        untick: fc.option(jsonish, { freq: 2, nil: undefined }), // left out (undefined) most of the time
      },
      { requiredKeys: ["setupIndex"] },
    );
    let refused = 0;
    let ticked = 0; // accepted ticks show up in the snapshot: the checksum sees a change when there is one
    await fc.assert(
      fc.asyncProperty(fc.oneof(fc.jsonValue({ maxDepth: 3 }), tick), async (json) => {
        const before = await snapshot();
        const res = await request(server).post(`/api/batches/${ids.released}/floor`).set("Cookie", cookie).set("Content-Type", "application/json").send(JSON.stringify(json));
        const what = `floor API answered ${res.status} to ${JSON.stringify(json).slice(0, 200)}`;
        expect(res.status, what).toBeLessThan(500);
        if (res.status >= 400) {
          refused++;
          expect(changed(before, await snapshot()), what).toEqual([]);
          expect(res.body.error, what).toMatch(/\w/);
          if (res.status === 400) expect(res.body.error, what).toMatch(/^(setupIndex|countCut|untick|The body)/);
        } else {
          expect(res.status, what).toBe(200);
          if (changed(before, await snapshot()).includes("setup_ticks")) ticked++;
        }
      }),
      { numRuns: 60, seed: 7 },
    );
    expect(refused).toBeGreaterThan(30);
    expect(ticked).toBeGreaterThan(0);
    const before = await snapshot();
    const broken = await request(server).post(`/api/batches/${ids.released}/floor`).set("Cookie", cookie).set("Content-Type", "application/json").send("{not json");
    expect(broken.status).toBe(400);
    expect(broken.body.error).toContain("not valid JSON");
    expect(changed(before, await snapshot())).toEqual([]);
  });
});
