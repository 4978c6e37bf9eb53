// Bad input never breaks Stopwise: random, huge, wrongly typed and unknown fields posted to every
// action and API route answer 4xx (or a redirect), never 5xx. Fast-check, a bounded number of runs.
import fc from "fast-check";
import request from "supertest";
import { beforeAll, describe, expect, it } from "vitest";
import { appServer } from "../support/app";
import { batchScenario } from "../support/batch-factories";
import { signIn } from "../support/factories";
import { createBatches } from "~/models/batches.server";

const server = await appServer();
let cookie: string;
let ids: Record<string, string>;

beforeAll(async () => {
  const s = await batchScenario();
  cookie = await signIn(server, s.shop.users.owner);
  const [batchId] = await createBatches(s.shop.id, "2027-01-15", [s.birch6.id]);
  ids = { order: s.wedding.id, batch: batchId, customer: s.wedding.id };
});

const INTENTS = ["invite", "role", "remove", "revoke", "move", "resend", "add-lines", "remove-line", "line-texts", "header", "create", "unhold", "move-line", "hold-line", "run-plan", "cancel-plan", "release", "spoil", "close", "add", "discard", "material", "panel", "delete", "request-deposit", "refund-deposit", ""];
const FIELDS = ["intent", "email", "role", "memberId", "invitationId", "to", "lineId", "customerId", "eventDate", "dueDate", "notes", "name", "phone", "kerfMm", "trimMm", "seconds", "stages", "objective", "planId", "targetBatchId", "dueBy", "materialId", "length", "width", "location", "grain", "offcutId", "part", "quantity", "reason", "line-0-product", "line-0-quantity", "line-0-texts", "line-0-csvHeader", "line-0-followRows", "setupIndex", "countCut", "parts", "price", "leadTimeDays", "unit", "currency", "deposit", "depositRule", "depositPercent", "depositFixedMinor"];

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
  "/sign-up",
  "/forgot-password",
  "/webhooks/payments",
];

describe("fuzzing the actions", () => {
  it("random form bodies to every action never answer 5xx", async () => {
    for (const route of routes()) {
      await fc.assert(
        fc.asyncProperty(body, async (fields) => {
          const res = await request(server).post(route).set("Cookie", cookie).type("form").send(fields);
          if (res.status >= 500) throw new Error(`${route} answered ${res.status} to ${JSON.stringify(fields).slice(0, 300)}`);
        }),
        { numRuns: 25, seed: 20261202 },
      );
    }
  });

  it("random JSON to the floor API and a broken body answer 4xx", async () => {
    await fc.assert(
      fc.asyncProperty(fc.jsonValue({ maxDepth: 3 }), async (json) => {
        const res = await request(server).post(`/api/batches/${ids.batch}/floor`).set("Cookie", cookie).set("Content-Type", "application/json").send(JSON.stringify(json));
        expect(res.status).toBeGreaterThanOrEqual(400);
        expect(res.status).toBeLessThan(500);
      }),
      { numRuns: 40, seed: 7 },
    );
    const broken = await request(server).post(`/api/batches/${ids.batch}/floor`).set("Cookie", cookie).set("Content-Type", "application/json").send("{not json");
    expect(broken.status).toBeLessThan(500);
  });
});
