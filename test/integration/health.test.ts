import request from "supertest";
import { afterAll, describe, expect, it } from "vitest";
import { appServer } from "../support/app";
import { testCluster } from "../support/database";

describe("/api/health", async () => {
  const server = await appServer();
  const cluster = testCluster();
  afterAll(() => {
    cluster.start(); // leave the database up for the suites that follow, even if a check failed
  });

  it("answers 200 when the database is reachable", async () => {
    const res = await request(server).get("/api/health");
    expect(res.status).toBe(200);
    expect(res.body).toEqual({ status: "ok", database: "reachable" });
    expect(res.headers["cache-control"]).toBe("no-store");
  });

  it("answers 503 with a JSON reason while the database is stopped, and 200 again once it is back", async () => {
    cluster.stop();
    const down = await request(server).get("/api/health");
    expect(down.status).toBe(503);
    expect(down.body.status).toBe("unavailable");
    expect(down.body.database).toBe("unreachable");
    expect(typeof down.body.reason).toBe("string");
    expect(down.body.reason.length).toBeGreaterThan(0);

    cluster.start();
    const up = await request(server).get("/api/health");
    expect(up.status).toBe(200);
  });
});
