// The database goes away in the middle of work: the app says so (503), loses nothing committed, and
// carries on without a restart once PostgreSQL is back.
import { count, eq } from "drizzle-orm";
import request from "supertest";
import { afterAll, describe, expect, it } from "vitest";
import * as t from "../../db/schema";
import { appServer } from "../support/app";
import { testCluster } from "../support/database";
import { createShop, signIn } from "../support/factories";
import { getDb } from "~/db.server";

const server = await appServer();
const cluster = testCluster();
afterAll(() => cluster.start());

describe("PostgreSQL restarts during a stream of writes", () => {
  it("answers 503 with a clear message while it is away, keeps every committed write, and recovers by itself", async () => {
    const shop = await createShop("Faults");
    const owner = await signIn(server, shop.users.owner);
    const write = (i: number) => request(server).post("/customers/new").set("Cookie", owner).type("form").send({ name: `Customer ${i}` });

    const statuses: number[] = [];
    for (let i = 0; i < 5; i++) statuses.push((await write(i)).status);
    cluster.stop();
    const away = await write(100);
    const awayApi = await request(server).get("/api/orders").set("Cookie", owner);
    cluster.start();
    for (let i = 5; i < 10; i++) {
      let res = await write(i);
      // A pooled connection notices the restart on first use (503, never 500); a client retry then goes through.
      for (let retry = 0; res.status === 503 && retry < 5; retry++) {
        await new Promise((r) => setTimeout(r, 200));
        res = await write(i);
      }
      statuses.push(res.status);
    }

    expect(away.status).toBe(503);
    expect(away.text).toContain("cannot reach its database");
    expect(awayApi.status).toBe(503);
    expect(awayApi.body.error).toContain("Nothing was saved");
    expect(statuses.every((s) => s === 302)).toBe(true);
    const [{ n }] = await getDb().select({ n: count() }).from(t.customers).where(eq(t.customers.shopId, shop.id));
    expect(n).toBe(10); // every acknowledged write, and not the one refused while away
    expect((await request(server).get("/api/health")).status).toBe(200);
  });
});
