// The database goes away after the session was found, while a loader or action waits on its query.
// To make that moment deterministic, the test holds a lock the request's query needs, waits until the
// app's backend is seen waiting on it (pg_stat_activity), then ends that backend (pg_terminate_backend,
// what a restart does to every connection) or stops the whole cluster, and releases the lock.
import { count, eq } from "drizzle-orm";
import postgres from "postgres";
import request from "supertest";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import * as t from "../../db/schema";
import { appServer, visible } from "../support/app";
import { testCluster } from "../support/database";
import { createShop, signIn, type TestShop } from "../support/factories";
import { createDatabase, getDb } from "~/db.server";

const server = await appServer();
const cluster = testCluster();
let shop: TestShop;
let owner: string;
let bookkeeper: string;

beforeAll(async () => {
  shop = await createShop("Query faults");
  owner = await signIn(server, shop.users.owner);
  bookkeeper = await signIn(server, shop.users.bookkeeper);
});
afterAll(() => cluster.start());

type Sent = PromiseLike<request.Response>;

/** The app's backends (not the locker's) waiting on a lock, polled until one shows up (at most 10 s). */
async function lockWaiters(sql: postgres.TransactionSql, answered: () => request.Response | undefined): Promise<number[]> {
  const deadline = Date.now() + 10_000;
  while (Date.now() < deadline) {
    const early = answered();
    if (early) throw new Error(`the request was answered before it waited on the lock: ${early.status} ${early.text.slice(0, 300)}`);
    // Inside a transaction PostgreSQL keeps showing its first snapshot of pg_stat_activity unless told not to.
    await sql`select pg_stat_clear_snapshot()`;
    const rows = await sql<{ pid: number }[]>`
      select pid from pg_stat_activity
      where wait_event_type = 'Lock' and datname = current_database() and pid <> pg_backend_pid()`;
    if (rows.length > 0) return rows.map((r) => r.pid);
    await new Promise((resolve) => setTimeout(resolve, 20));
  }
  const activity = await sql`select pid, state, wait_event_type, wait_event, left(query, 80) as query from pg_stat_activity where datname = current_database()`;
  throw new Error(`no request came to wait on the lock within 10 s: ${JSON.stringify(activity)}`);
}

/**
 * Sends the request while `table` is locked, ends the backends waiting on it with `cut` (default:
 * pg_terminate_backend, answered by PostgreSQL with 57P01), releases the lock, and gives the answer.
 */
async function cutMidRequest(table: string, send: () => Sent, cut?: (pids: number[]) => void): Promise<request.Response> {
  const locker = postgres(process.env.DATABASE_URL!, { max: 1, fetch_types: false, onnotice: () => {} });
  let answer: Promise<request.Response> | undefined;
  try {
    await locker.begin(async (sql) => {
      await sql`select set_config('lock_timeout', '0', true)`;
      await sql.unsafe(`lock table ${table} in access exclusive mode`);
      let early: request.Response | undefined;
      answer = Promise.resolve(send()).then((res) => (early = res));
      const pids = await lockWaiters(sql, () => early);
      if (cut) cut(pids);
      else for (const pid of pids) await sql`select pg_terminate_backend(${pid})`;
    });
  } catch (error) {
    // Stopping the cluster ends the locker's own connection too; the lock goes with it.
    if (!cut) throw error;
  } finally {
    await locker.end({ timeout: 1 }).catch(() => {});
  }
  return answer!;
}

/**
 * The app recovers by itself: asked again (at most 10 times, 200 ms apart), the page answers 200. A
 * pooled connection that has not yet noticed the database went away may fail one more request with
 * 503, never with a 500.
 */
async function expectRecovers(send: () => Sent) {
  const statuses: number[] = [];
  for (let i = 0; i < 10 && statuses.at(-1) !== 200; i++) {
    if (i > 0) await new Promise((r) => setTimeout(r, 200));
    statuses.push((await send()).status);
  }
  expect(statuses.every((s) => s === 200 || s === 503), statuses.join(", ")).toBe(true);
  expect(statuses.at(-1), statuses.join(", ")).toBe(200);
}

function expectUnavailablePage(res: request.Response) {
  expect(res.status).toBe(503);
  expect(res.type).toBe("text/html");
  const text = visible(res.text);
  expect(text).toContain("Stopwise cannot reach its database");
  expect(text).toContain("Nothing you entered was saved");
  expect(text).not.toMatch(/at \S+ \(|\.server\.ts|CONNECTION_|57P01/); // no stack, no driver detail
}

describe("a query loses its connection after the session was found", () => {
  it("a page's loader answers 503 with the plain message page, and the next request works", async () => {
    const res = await cutMidRequest("customers", () => request(server).get("/customers").set("Cookie", owner));
    expectUnavailablePage(res);
    await expectRecovers(() => request(server).get("/customers").set("Cookie", owner));
  });

  it("a client-side data request for the page answers 503 and carries the message", async () => {
    const res = await cutMidRequest("customers", () => request(server).get("/customers.data").set("Cookie", owner));
    expect(res.status).toBe(503);
    expect(res.text).toContain("cannot reach its database");
    expect(res.text).not.toContain("57P01");
  });

  it("an API read answers 503 JSON with the message and Retry-After", async () => {
    const res = await cutMidRequest("orders", () => request(server).get("/api/orders").set("Cookie", owner));
    expect(res.status).toBe(503);
    expect(res.type).toBe("application/json");
    expect(res.body.error).toContain("Nothing was saved");
    expect(res.headers["retry-after"]).toBe("5");
  });

  it("a download (resource route) answers 503 with the message, not a 500", async () => {
    const res = await cutMidRequest("batches", () => request(server).get("/ledger.csv").set("Cookie", bookkeeper));
    expect(res.status).toBe(503);
    expect(res.text).toContain("cannot reach its database");
  });

  it("a form post answers the 503 page and writes nothing", async () => {
    const name = "Never saved";
    const res = await cutMidRequest("customers", () => request(server).post("/customers/new").set("Cookie", owner).type("form").send({ name }));
    expectUnavailablePage(res);
    const [{ n }] = await getDb().select({ n: count() }).from(t.customers).where(eq(t.customers.name, name));
    expect(n).toBe(0);
  });

  it("PostgreSQL stopping mid-request answers 503, and the app recovers without a restart once it is back", async () => {
    const res = await cutMidRequest("customers", () => request(server).get("/customers").set("Cookie", owner), () => cluster.stop());
    expectUnavailablePage(res);
    cluster.start();
    await expectRecovers(() => request(server).get("/customers").set("Cookie", owner));
  });
});

describe("a new connection whose first statement is cancelled", () => {
  // A 1 ms statement_timeout cancels whatever a connection runs first: the driver's own start-up
  // read when it makes one. Its failure must reach the query that waited, never escape the process.
  it("leaves no unhandled rejection behind, so a server process would live on", async () => {
    const escaped: unknown[] = [];
    const collect = (reason: unknown) => escaped.push(reason);
    process.on("unhandledRejection", collect);
    try {
      for (let i = 0; i < 10; i++) {
        const { client } = createDatabase(`${process.env.DATABASE_URL}?statement_timeout=1`, { max: 1 });
        await client`select 1`.catch(() => {});
        await client.end({ timeout: 1 });
      }
      await new Promise((resolve) => setTimeout(resolve, 100));
    } finally {
      process.off("unhandledRejection", collect);
    }
    expect(escaped).toEqual([]);
  });
});
