// Every route of app/routes.ts, for a signed-out visitor and each role: the status it must answer.
// A route added without an entry here fails the first test. OWASP ASVS 4.0.3 V4.1.1 (checks on the
// server), V4.1.3 (least privilege); ASVS 5.0 V8.2.1 (function-level authorisation).
import request from "supertest";
import { beforeAll, beforeEach, describe, expect, it } from "vitest";
import { appServer } from "../support/app";
import { createShop, signIn, type TestShop } from "../support/factories";
import routes from "~/routes";
import type { Role } from "~/lib/permissions";

type Who = "signedOut" | Role;
type Statuses = Record<Who, number>;
type Entry = { get: Statuses; post: Statuses; sample?: string };

const WHO: Who[] = ["signedOut", "owner", "planner", "sawyer", "bookkeeper"];
const all = (status: number): Statuses => ({ signedOut: status, owner: status, planner: status, sawyer: status, bookkeeper: status });
const signedOutThen = (signedOut: number, roles: number): Statuses => ({ ...all(roles), signedOut });
/** A page in the shell: signed-out visitors go to sign-in, other roles get 403. */
const page = (...allowed: Role[]): Statuses => ({
  signedOut: 302,
  owner: allowed.includes("owner") ? 200 : 403,
  planner: allowed.includes("planner") ? 200 : 403,
  sawyer: allowed.includes("sawyer") ? 200 : 403,
  bookkeeper: allowed.includes("bookkeeper") ? 200 : 403,
});
const NO_ACTION = all(405);
/** An id-bearing page asked with an id that exists nowhere: the permission check comes first (403), then 404. */
const notFoundFor = (...allowed: Role[]): Statuses => {
  const statuses = page(...allowed);
  for (const role of allowed) statuses[role] = 404;
  return statuses;
};
const MISSING = "00000000-0000-4000-8000-000000000000";

const MATRIX: Record<string, Entry> = {
  "/api/health": { get: all(200), post: NO_ACTION },
  "/api/me": { get: signedOutThen(401, 200), post: NO_ACTION },
  "/sign-in": { get: signedOutThen(200, 302), post: signedOutThen(400, 302) },
  "/sign-up": { get: signedOutThen(200, 302), post: signedOutThen(400, 302) },
  "/sign-out": { get: all(302), post: all(302) },
  "/forgot-password": { get: all(200), post: all(400) },
  "/reset-password/:token": { get: all(200), post: all(400), sample: "/reset-password/not-a-real-token" },
  "/invitation/:token": { get: all(200), post: all(400), sample: "/invitation/not-a-real-token" },
  "/": { get: page("owner", "planner", "sawyer", "bookkeeper"), post: NO_ACTION },
  "/api/customers": { get: { ...page("owner", "planner", "bookkeeper"), signedOut: 401 }, post: NO_ACTION },
  "/api/orders": { get: { ...page("owner", "planner", "bookkeeper"), signedOut: 401 }, post: NO_ACTION },
  "/orders": { get: page("owner", "planner", "bookkeeper"), post: NO_ACTION },
  "/calendar": { get: page("owner", "planner", "bookkeeper"), post: NO_ACTION },
  "/orders/new": { get: page("owner"), post: { ...page("owner"), owner: 400 } },
  "/orders/:orderId": { get: notFoundFor("owner", "planner", "bookkeeper"), post: { ...page("owner"), owner: 400 }, sample: `/orders/${MISSING}` },
  "/orders/:orderId/checklist": { get: notFoundFor("owner", "planner", "bookkeeper"), post: NO_ACTION, sample: `/orders/${MISSING}/checklist` },
  "/orders/:orderId/files/:fileId": { get: notFoundFor("owner", "planner", "bookkeeper"), post: NO_ACTION, sample: `/orders/${MISSING}/files/${MISSING}` },
  "/customers": { get: page("owner", "planner", "bookkeeper"), post: NO_ACTION },
  "/customers/new": { get: page("owner"), post: { ...page("owner"), owner: 400 } },
  "/customers/:customerId": { get: notFoundFor("owner", "planner", "bookkeeper"), post: { ...page("owner"), owner: 400 }, sample: `/customers/${MISSING}` },
  "/catalogue": { get: page("owner", "planner", "bookkeeper"), post: NO_ACTION },
  "/catalogue/materials": { get: page("owner", "planner", "bookkeeper"), post: { ...page("owner"), owner: 400 } },
  "/catalogue/products/new": { get: page("owner"), post: { ...page("owner"), owner: 400 } },
  "/catalogue/products/:productId": { get: notFoundFor("owner", "planner", "bookkeeper"), post: notFoundFor("owner"), sample: `/catalogue/products/${MISSING}` },
  "/batches": { get: page("owner", "planner", "sawyer", "bookkeeper"), post: { ...page("owner", "planner"), owner: 400, planner: 400 } },
  "/batches/:batchId": { get: notFoundFor("owner", "planner", "sawyer", "bookkeeper"), post: { ...page("owner", "planner"), owner: 400, planner: 400 }, sample: `/batches/${MISSING}` },
  "/batches/:batchId/plans/:planId": { get: notFoundFor("owner", "planner", "sawyer", "bookkeeper"), post: NO_ACTION, sample: `/batches/${MISSING}/plans/${MISSING}` },
  "/batches/:batchId/blanks/:blank": { get: notFoundFor("owner", "planner", "sawyer", "bookkeeper"), post: NO_ACTION, sample: `/batches/${MISSING}/blanks/1` },
  "/api/batches/:batchId/plans": { get: { ...notFoundFor("owner", "planner", "sawyer", "bookkeeper"), signedOut: 401 }, post: NO_ACTION, sample: `/api/batches/${MISSING}/plans` },
  "/rack": { get: page("owner", "planner", "sawyer", "bookkeeper"), post: { ...page("owner", "planner", "sawyer"), owner: 400, planner: 400, sawyer: 400 } },
  "/saw": { get: page("owner", "planner", "sawyer"), post: NO_ACTION },
  "/saw/:batchId": { get: notFoundFor("owner", "planner", "sawyer"), post: notFoundFor("owner", "sawyer"), sample: `/saw/${MISSING}` },
  "/api/batches/:batchId/origins": { get: { ...notFoundFor("owner", "planner", "sawyer", "bookkeeper"), signedOut: 401 }, post: NO_ACTION, sample: `/api/batches/${MISSING}/origins?part=saw:1x1:free` },
  "/api/batches/:batchId/floor": { get: { ...notFoundFor("owner", "planner", "sawyer"), signedOut: 401 }, post: { ...notFoundFor("owner", "sawyer"), signedOut: 401 }, sample: `/api/batches/${MISSING}/floor` },
  "/batches/:batchId/setup-sheet": { get: notFoundFor("owner", "planner", "sawyer"), post: NO_ACTION, sample: `/batches/${MISSING}/setup-sheet` },
  "/batches/:batchId/labels": { get: notFoundFor("owner", "planner", "sawyer"), post: NO_ACTION, sample: `/batches/${MISSING}/labels` },
  "/sleds": { get: page("owner", "planner", "sawyer"), post: { ...page("owner", "sawyer"), owner: 400, sawyer: 400 } },
  "/ledger": { get: page("owner", "bookkeeper"), post: NO_ACTION },
  "/ledger/batches/:batchId": { get: notFoundFor("owner", "bookkeeper"), post: NO_ACTION, sample: `/ledger/batches/${MISSING}` },
  "/api/ledger": { get: { ...page("owner", "bookkeeper"), signedOut: 401 }, post: NO_ACTION },
  "/ledger.csv": { get: page("owner", "bookkeeper"), post: NO_ACTION },
  "/ledger/deposits": { get: page("owner", "bookkeeper"), post: NO_ACTION },
  "/ledger/deposits.csv": { get: page("owner", "bookkeeper"), post: NO_ACTION },
  // The payment service's webhook: no session needed; an unsigned call is refused whoever sends it.
  "/webhooks/payments": { get: all(405), post: all(400) },
  // The customer's payment link: no sign-in; an unknown token is a 404 for everyone.
  "/pay/:token": { get: all(404), post: NO_ACTION, sample: "/pay/not-a-real-payment-link-token" },
  "/pay/:token/checkout": { get: all(404), post: NO_ACTION, sample: "/pay/not-a-real-payment-link-token/checkout" },
  "/settings": { get: page("owner", "planner"), post: { ...page("owner"), owner: 400 } },
  "/team": { get: page("owner"), post: { ...page("owner"), owner: 400 } },
  "/account": { get: page("owner", "planner", "sawyer", "bookkeeper"), post: { ...all(400), signedOut: 302 } },
  "/dev/outbox": { get: page("owner"), post: NO_ACTION },
  "/*": { get: signedOutThen(302, 404), post: signedOutThen(404, 404), sample: "/no-such-place" },
};

type RouteEntry = { path?: string; index?: boolean; children?: RouteEntry[] };
function patterns(entries: RouteEntry[], prefix = ""): string[] {
  return entries.flatMap((entry) => {
    const here = entry.path ? `${prefix}/${entry.path}`.replace(/\/+/g, "/") : prefix;
    const own = entry.path || entry.index ? [here || "/"] : [];
    return [...own, ...patterns(entry.children ?? [], here)];
  });
}

const server = await appServer();
let shop: TestShop;
const cookies = {} as Record<Who, string | null>;

beforeAll(async () => {
  shop = await createShop("Matrix");
});
// Fresh sessions for every route: the POST to /sign-out ends the ones before it.
beforeEach(async () => {
  cookies.signedOut = null;
  for (const role of ["owner", "planner", "sawyer", "bookkeeper"] as Role[]) cookies[role] = await signIn(server, shop.users[role]);
});

describe("route matrix", () => {
  const table = patterns(routes as RouteEntry[]);

  it("has an entry for every route in app/routes.ts, and none for routes that are gone", () => {
    expect(table.filter((p) => !(p in MATRIX))).toEqual([]);
    expect(Object.keys(MATRIX).filter((p) => !table.includes(p))).toEqual([]);
  });

  for (const pattern of Object.keys(MATRIX)) {
    const entry = MATRIX[pattern];
    const url = entry.sample ?? pattern;
    it(`${pattern}: GET and POST answer as the permission table says`, async () => {
      const seen: Record<string, number> = {};
      const expected: Record<string, number> = {};
      for (const who of WHO) {
        const cookie = cookies[who];
        const get = request(server).get(url);
        const post = request(server).post(url).type("form").send({});
        if (cookie) {
          get.set("Cookie", cookie);
          post.set("Cookie", cookie);
        }
        seen[`GET ${who}`] = (await get).status;
        seen[`POST ${who}`] = (await post).status;
        expected[`GET ${who}`] = entry.get[who];
        expected[`POST ${who}`] = entry.post[who];
      }
      expect(seen).toEqual(expected);
    });
  }

  it("sends signed-out visitors to sign-in with the address to come back to", async () => {
    const res = await request(server).get("/ledger?month=2026-11");
    expect(res.headers.location).toBe("/sign-in?redirectTo=%2Fledger%3Fmonth%3D2026-11");
  });

  it("shows the helpful 404 page, inside the shell, for an unknown address", async () => {
    const res = await request(server).get("/no-such-place").set("Cookie", cookies.planner!);
    expect(res.status).toBe(404);
    expect(res.text).toContain("There is nothing at this address");
    expect(res.text).toContain("Sign out");
  });

  it("says which role a refused page needs, on the page and in JSON for API routes", async () => {
    const res = await request(server).get("/ledger").set("Cookie", cookies.sawyer!);
    expect(res.status).toBe(403);
    expect(res.text).toContain("You need the owner or bookkeeper role");
    const api = await request(server).get("/api/me");
    expect(api.status).toBe(401);
    expect(api.body).toEqual({ error: "Sign in first." });
  });
});
