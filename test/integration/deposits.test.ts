// Deposits end to end over HTTP: the owner confirms and the customer's e-mail carries a payment link;
// the link opens a Checkout Session at the local fake payment service (started by bin/test); webhook
// events are verified, recorded once, in minor units; the owner refunds; the bookkeeper reads.
import { execFileSync } from "node:child_process";
import { parse } from "csv-parse/sync";
import { and, desc, eq } from "drizzle-orm";
import request from "supertest";
import { beforeAll, describe, expect, it } from "vitest";
import * as t from "../../db/schema";
import { appServer, visible } from "../support/app";
import { createShop, signIn, type TestShop } from "../support/factories";
import { createCatalogue } from "../support/order-factories";
import { linkIn, waitForMail, mailTo } from "../support/outbox";
import { deliver, eventBody, payOnFake, retrieveSession, sign } from "../support/payments";
import { freePort, startApp } from "../support/server";
import { getDb } from "~/db.server";
import { depositLedger } from "~/models/deposit-ledger.server";
import { createOrder } from "~/models/orders.server";
import { orderHistory } from "~/models/order-history.server";

const server = await appServer();
const db = getDb();
let shop: TestShop;
let cat: Awaited<ReturnType<typeof createCatalogue>>;
let owner: string;

beforeAll(async () => {
  shop = await createShop("Deposits");
  await db.update(t.shops).set({ depositRule: "percent", depositPercent: 30 }).where(eq(t.shops.id, shop.id));
  cat = await createCatalogue(shop.id);
  owner = await signIn(server, shop.users.owner);
});

/** A draft order of a welcome sign and 18 table numbers: €85.00 + 18 × €6.50 = €202.00. */
async function draftOrder() {
  return createOrder(shop.id, { customerId: cat.customer.id, eventDate: "2027-06-12", dueDate: "2027-05-29", notes: "" }, [
    { productId: cat.sign.id, quantity: 1, personalisation: ["Welcome"], notes: "", files: [] },
    { productId: cat.tableNumber.id, quantity: 18, personalisation: [], notes: "", files: [] },
  ]);
}

async function confirmWithDeposit(orderId: string) {
  const res = await request(server).post(`/orders/${orderId}`).set("Cookie", owner).field("intent", "move").field("to", "confirmed").field("deposit", "yes");
  expect(res.status, res.text.slice(0, 300)).toBe(302);
  const [deposit] = await db.select().from(t.deposits).where(eq(t.deposits.orderId, orderId));
  return deposit;
}

/** Confirms, follows the link to the fake's checkout and presses Pay there; returns the completed session. */
async function paidSession(orderId: string) {
  const deposit = await confirmWithDeposit(orderId);
  const checkout = await request(server).get(`/pay/${deposit.linkToken}/checkout`);
  expect(checkout.status).toBe(302);
  await payOnFake(checkout.headers.location);
  const [row] = await db.select().from(t.deposits).where(eq(t.deposits.id, deposit.id));
  return { deposit, session: await retrieveSession(row.checkoutSessionId!) };
}

const movesOf = (depositId: string) => db.select().from(t.depositMoves).where(eq(t.depositMoves.depositId, depositId));
const depositRow = async (id: string) => (await db.select().from(t.deposits).where(eq(t.deposits.id, id)))[0];

describe("deposits", () => {
  it("confirming asks the shop's 30 %, e-mails the link, and the link opens one checkout at the payment service", async () => {
    const order = await draftOrder();
    const page = visible((await request(server).get(`/orders/${order.id}`).set("Cookie", owner)).text);
    expect(page).toMatch(/Ask a deposit of <strong[^>]*>€60\.60<\/strong> with a payment link in the e-mail/);

    const seen = mailTo(cat.customer.email).length;
    const deposit = await confirmWithDeposit(order.id);
    expect(deposit).toMatchObject({ shopId: shop.id, amountMinor: 6060, currency: "EUR", status: "requested" });
    const mail = await waitForMail(cat.customer.email, seen);
    expect(mail.text).toContain("To start work we ask a deposit of €60.60");
    const link = linkIn(mail);
    expect(link).toMatch(new RegExp(`/pay/${deposit.linkToken}$`));

    const payPage = visible((await request(server).get(new URL(link).pathname)).text);
    expect(payPage).toContain("asks a deposit of <strong class=\"tabular-nums\">€60.60</strong> towards your order");
    expect(payPage).toContain("Pay €60.60 now");

    const first = await request(server).get(`/pay/${deposit.linkToken}/checkout`);
    expect(first.status).toBe(302);
    expect(first.headers.location).toMatch(new RegExp(`^http://127\\.0\\.0\\.1:${process.env.STRIPE_API_PORT}/pay/cs_fake_`));
    const again = await request(server).get(`/pay/${deposit.linkToken}/checkout`);
    expect(again.headers.location).toBe(first.headers.location); // the open session is reused
    const session = await retrieveSession((await depositRow(deposit.id)).checkoutSessionId!);
    expect(session).toMatchObject({ amount_total: 6060, currency: "eur", status: "open", metadata: { shopId: shop.id, depositId: deposit.id } });

    const orderPage = visible((await request(server).get(`/orders/${order.id}`).set("Cookie", owner)).text);
    expect(orderPage).toContain("Deposit requested");
    expect(orderPage).toMatch(/data-testid="balance-due">€202\.00/);
  });

  it("refuses unsigned, wrongly signed and tampered webhook calls with 400, and records nothing", async () => {
    const order = await draftOrder();
    const { deposit, session } = await paidSession(order.id);
    const body = eventBody("checkout.session.completed", session);

    const unsigned = await deliver(server, body, null);
    expect(unsigned.status).toBe(400);
    expect(unsigned.body.error).toMatch(/Signature refused/);
    expect((await deliver(server, body, sign(body, "whsec_not_the_shops"))).status).toBe(400);
    const tampered = body.replace('"amount_total":6060', '"amount_total":1');
    expect(tampered).not.toBe(body);
    expect((await deliver(server, tampered, sign(body))).status).toBe(400);
    expect((await deliver(server, body, "t=1,v1=deadbeef")).status).toBe(400);
    // A correct signature made five minutes ago is stale (the SDK's default tolerance is 300 s).
    const stale = new (await import("stripe")).default("sk_test_x").webhooks.generateTestHeaderString({ payload: body, secret: process.env.STRIPE_WEBHOOK_SECRET!, timestamp: Math.floor(Date.now() / 1000) - 600 });
    expect((await deliver(server, body, stale)).status).toBe(400);

    expect(await movesOf(deposit.id)).toEqual([]);
    expect((await depositRow(deposit.id)).status).toBe("requested");
  });

  it("a correctly signed event records the payment once, in minor units, however often it is delivered", async () => {
    const order = await draftOrder();
    const { deposit, session } = await paidSession(order.id);
    const body = eventBody("checkout.session.completed", session);

    const first = await deliver(server, body);
    expect(first.status).toBe(200);
    expect(first.body).toEqual({ received: true, outcome: "recorded" });
    const second = await deliver(server, body);
    expect(second.body.outcome).toBe("duplicate");
    // The same payment reported under another event id still records once.
    const other = await deliver(server, eventBody("checkout.session.async_payment_succeeded", session));
    expect(other.body.outcome).toBe("duplicate");

    const moves = await movesOf(deposit.id);
    expect(moves).toHaveLength(1);
    expect(moves[0]).toMatchObject({ kind: "payment", amountMinor: 6060, currency: "EUR", providerRef: session.payment_intent });
    expect(await depositRow(deposit.id)).toMatchObject({ status: "paid", paymentIntentId: session.payment_intent });

    const orderPage = visible((await request(server).get(`/orders/${order.id}`).set("Cookie", owner)).text);
    expect(orderPage).toContain("Deposit paid");
    expect(orderPage).toMatch(/data-testid="balance-due">€141\.40/);
    // The customer coming back sees it paid.
    expect(visible((await request(server).get(`/pay/${deposit.linkToken}`)).text)).toContain("your deposit of €60.60 is paid");
    // The webhook is exempt from the cross-site check by its exact path only.
    const foreign = eventBody("customer.created", { id: "cus_2", object: "customer" });
    const exempt = await request(server).post("/webhooks/payments").set("Content-Type", "application/json").set("Sec-Fetch-Site", "cross-site").set("Origin", "https://elsewhere.example").set("Stripe-Signature", sign(foreign)).send(foreign);
    expect(exempt.status).toBe(200);
    for (const path of ["/webhooks/payments/", "/webhooks/paymentsx", "/webhooks"]) {
      const res = await request(server).post(path).set("Content-Type", "application/json").set("Sec-Fetch-Site", "cross-site").set("Stripe-Signature", sign(foreign)).send(foreign);
      expect(res.status, path).toBe(403);
    }
    // An event the app does not handle is acknowledged and changes nothing.
    expect((await deliver(server, eventBody("customer.created", { id: "cus_1", object: "customer" }))).body.outcome).toBe("ignored");
  });

  it("only the owner refunds: the bookkeeper reads the deposit, planner and sawyer are refused; the refund is recorded once", async () => {
    const order = await draftOrder();
    const { deposit, session } = await paidSession(order.id);
    await deliver(server, eventBody("checkout.session.completed", session));

    const bookkeeper = await signIn(server, shop.users.bookkeeper);
    const read = visible((await request(server).get(`/orders/${order.id}`).set("Cookie", bookkeeper)).text);
    expect(read).toContain("Deposit paid");
    expect(read).not.toContain("Refund the deposit");
    for (const role of ["bookkeeper", "planner", "sawyer"] as const) {
      const cookie = await signIn(server, shop.users[role]);
      const res = await request(server).post(`/orders/${order.id}`).set("Cookie", cookie).field("intent", "refund-deposit");
      expect(res.status, role).toBe(403);
    }
    expect((await request(server).get(`/orders/${order.id}`).set("Cookie", await signIn(server, shop.users.sawyer))).status).toBe(403);
    expect(await movesOf(deposit.id)).toHaveLength(1);

    const paidPage = visible((await request(server).get(`/orders/${order.id}`).set("Cookie", owner)).text);
    expect(paidPage).toContain("Refund €60.60");
    expect(paidPage).not.toContain("E-mail the link again"); // paid: no reminder to send
    const refund = await request(server).post(`/orders/${order.id}`).set("Cookie", owner).field("intent", "refund-deposit");
    expect(refund.status, refund.text.slice(0, 300)).toBe(302);
    const moves = await movesOf(deposit.id);
    const refundMove = moves.find((m) => m.kind === "refund")!;
    expect(refundMove).toMatchObject({ amountMinor: 6060, currency: "EUR", eventId: null, recordedBy: shop.users.owner.id });
    expect(refundMove.providerRef).toMatch(/^re_fake_/);
    expect(await depositRow(deposit.id)).toMatchObject({ status: "refunded" });

    // The service's own refund.created event for the same refund changes nothing more.
    const refundEvent = { id: refundMove.providerRef, object: "refund", amount: 6060, currency: "eur", status: "succeeded", payment_intent: session.payment_intent, metadata: { shopId: shop.id, depositId: deposit.id } };
    expect((await deliver(server, eventBody("refund.created", refundEvent))).body.outcome).toBe("duplicate");
    expect(await movesOf(deposit.id)).toHaveLength(2);

    const again = await request(server).post(`/orders/${order.id}`).set("Cookie", owner).field("intent", "refund-deposit");
    expect(again.status).toBe(409);
    expect(visible(again.text)).toContain("The deposit was already refunded.");
    const page = visible((await request(server).get(`/orders/${order.id}`).set("Cookie", owner)).text);
    expect(page).toContain("Deposit refunded");
    expect(page).toMatch(/data-testid="balance-due">€202\.00/);

    // The history tells the deposit's story from its own records, to those who may read deposits.
    const words = (html: string) => html.replace(/<!-- -->/g, "").replace(/<[^>]+>/g, "");
    const told = words(page);
    const steps = ["Confirmed the order", "Asked a deposit of €60.60", "The customer paid €60.60 of the deposit", `Refunded €60.60 of the deposit · owner ${shop.name.split(" ").pop()}`];
    expect(steps.map((step) => told.indexOf(step)).every((i) => i >= 0), told.slice(told.indexOf("History"))).toBe(true);
    expect(steps.map((step) => told.indexOf(step))).toEqual(steps.map((step) => told.indexOf(step)).sort((a, b) => b - a)); // newest first
    const planner = words((await request(server).get(`/orders/${order.id}`).set("Cookie", await signIn(server, shop.users.planner))).text);
    expect(planner).toContain("Confirmed the order");
    expect(planner).not.toContain("of the deposit");
    expect(planner).not.toContain("Asked a deposit");
  });

  it("a deposit can be asked after confirming; a cancelled checkout leaves it asked", async () => {
    const order = await draftOrder();
    expect((await request(server).post(`/orders/${order.id}`).set("Cookie", owner).field("intent", "move").field("to", "confirmed")).status).toBe(302);
    expect(await db.select().from(t.deposits).where(eq(t.deposits.orderId, order.id))).toEqual([]);
    const seen = mailTo(cat.customer.email).length;
    expect((await request(server).post(`/orders/${order.id}`).set("Cookie", owner).field("intent", "request-deposit")).status).toBe(302);
    const mail = await waitForMail(cat.customer.email, seen);
    expect(mail.subject).toMatch(/^Deposit for your order #\d+ with /);
    const token = new URL(linkIn(mail)).pathname.split("/")[2];
    // Unpaid, the owner can e-mail the same link again; asking twice keeps one deposit.
    const asked = visible((await request(server).get(`/orders/${order.id}`).set("Cookie", owner)).text);
    expect(asked).toContain("E-mail the link again");
    expect(visible((await request(server).get(`/orders/${order.id}`).set("Cookie", await signIn(server, shop.users.bookkeeper))).text)).not.toContain("E-mail the link again");
    const resent = await request(server).post(`/orders/${order.id}`).set("Cookie", owner).field("intent", "request-deposit");
    expect(resent.status).toBe(200);
    expect(visible(resent.text)).toContain("The payment link was e-mailed to the customer again.");
    expect(new URL(linkIn(await waitForMail(cat.customer.email, seen + 1))).pathname).toBe(`/pay/${token}`); // the same link
    expect(await db.select().from(t.deposits).where(eq(t.deposits.orderId, order.id))).toHaveLength(1);

    const checkout = await request(server).get(`/pay/${token}/checkout`);
    const url = new URL(checkout.headers.location);
    const cancel = await fetch(`${url.origin}${url.pathname}/cancel`, { method: "POST", redirect: "manual" });
    expect(cancel.headers.get("location")).toMatch(new RegExp(`/pay/${token}\\?cancelled=1$`));
    expect(visible((await request(server).get(`/pay/${token}?cancelled=1`)).text)).toContain("No payment was taken.");
    const [deposit] = await db.select().from(t.deposits).where(eq(t.deposits.orderId, order.id));
    expect(deposit.status).toBe("requested");
    expect((await request(server).get("/pay/no-such-link-token-at-all-0000")).status).toBe(404);
  });

  it("a deposit below the payment service's smallest payment is not offered, and a hand-made ask leaves the order as it was", async () => {
    const tiny = await createShop("Tiny deposits");
    await db.update(t.shops).set({ depositRule: "percent", depositPercent: 1 }).where(eq(t.shops.id, tiny.id));
    const tinyCat = await createCatalogue(tiny.id);
    const tinyOwner = await signIn(server, tiny.users.owner);
    // One place card: 1 % of €1.80 is €0.02, below the €0.50 the service takes at least.
    const order = await createOrder(tiny.id, { customerId: tinyCat.customer.id, eventDate: "2027-06-12", dueDate: "2027-05-29", notes: "" }, [
      { productId: tinyCat.placeCard.id, quantity: 1, personalisation: [], notes: "", files: [] },
    ]);
    const page = visible((await request(server).get(`/orders/${order.id}`).set("Cookie", tinyOwner)).text);
    expect(page).toContain("A deposit of €0.02 is below the smallest payment the payment service takes (€0.50). The order confirms without one; take it another way.");
    expect(page).not.toContain("Ask a deposit of");
    const seen = mailTo(tinyCat.customer.email).length;
    const refused = await request(server).post(`/orders/${order.id}`).set("Cookie", tinyOwner).field("intent", "move").field("to", "confirmed").field("deposit", "yes");
    expect(refused.status).toBe(409);
    expect(visible(refused.text)).toContain("The order was not confirmed: untick the deposit to confirm it without one.");
    const [row] = await db.select({ status: t.orders.status, sent: t.orders.confirmationSentAt }).from(t.orders).where(eq(t.orders.id, order.id));
    expect(row).toEqual({ status: "draft", sent: null });
    // Without the deposit it confirms as usual; the deposit area then says the same, with no ask button.
    expect((await request(server).post(`/orders/${order.id}`).set("Cookie", tinyOwner).field("intent", "move").field("to", "confirmed")).status).toBe(302);
    await waitForMail(tinyCat.customer.email, seen);
    const confirmed = visible((await request(server).get(`/orders/${order.id}`).set("Cookie", tinyOwner)).text);
    expect(confirmed).toContain("A deposit of €0.02 is below the smallest payment the payment service takes (€0.50). Take this one another way.");
    expect(confirmed).not.toContain("Ask a deposit of");
    const asked = await request(server).post(`/orders/${order.id}`).set("Cookie", tinyOwner).field("intent", "request-deposit");
    expect(asked.status).toBe(409);
    expect(visible(asked.text)).toContain("A deposit of €0.02 is below the smallest payment the payment service takes (€0.50). No payment link was made.");
    expect(await db.select().from(t.deposits).where(eq(t.deposits.orderId, order.id))).toEqual([]);
  });

  it("a checkout session the payment service no longer knows (a restarted fake, a purged session) is replaced by a new one", async () => {
    const order = await draftOrder();
    const deposit = await confirmWithDeposit(order.id);
    await db.update(t.deposits).set({ checkoutSessionId: "cs_fake_forgotten" }).where(eq(t.deposits.id, deposit.id));
    const res = await request(server).get(`/pay/${deposit.linkToken}/checkout`);
    expect(res.status).toBe(302);
    const fresh = (await depositRow(deposit.id)).checkoutSessionId!;
    expect(fresh).not.toBe("cs_fake_forgotten");
    expect(res.headers.location).toMatch(new RegExp(`/pay/${fresh}$`));
  });

  it("when the payment service cannot be reached or refuses, the customer is sent back to the deposit's page with a plain message", async () => {
    const order = await draftOrder();
    const deposit = await confirmWithDeposit(order.id);
    const app = await startApp({ STRIPE_API_PORT: String(await freePort()) }); // nothing listens there
    try {
      const res = await fetch(`${app.url}/pay/${deposit.linkToken}/checkout`, { redirect: "manual" });
      expect(res.status).toBe(302);
      expect(res.headers.get("location")).toBe(`/pay/${deposit.linkToken}?unavailable=1`);
      const page = visible(await (await fetch(`${app.url}/pay/${deposit.linkToken}?unavailable=1`)).text());
      expect(page).toContain("The payment service could not be reached. Nothing was charged");
      expect((await depositRow(deposit.id)).checkoutSessionId).toBeNull();
    } finally {
      await app.stop();
    }
    // A service that answers "no" (here: the wrong key) is told apart from one that does not answer.
    const refusing = await startApp({ STRIPE_SECRET_KEY: "sk_test_not_this_shops" });
    try {
      const res = await fetch(`${refusing.url}/pay/${deposit.linkToken}/checkout`, { redirect: "manual" });
      expect(res.headers.get("location")).toBe(`/pay/${deposit.linkToken}?refused=1`);
      expect(visible(await (await fetch(`${refusing.url}${res.headers.get("location")}`)).text())).toContain("would not open a checkout for this deposit");
    } finally {
      await refusing.stop();
    }
  });

  it("the order list shows each order's latest deposit and filters by it, for those who see deposits", async () => {
    await draftOrder(); // one with no deposit asked
    const rows = await db.select({ number: t.orders.number, id: t.orders.id }).from(t.orders).where(eq(t.orders.shopId, shop.id));
    const latest = new Map<number, string | null>();
    for (const o of rows) {
      const [d] = await db.select({ status: t.deposits.status }).from(t.deposits).where(eq(t.deposits.orderId, o.id)).orderBy(desc(t.deposits.requestedAt)).limit(1);
      latest.set(o.number, d?.status ?? null);
    }
    const kinds = new Set(latest.values());
    expect([...kinds].map(String).sort()).toEqual(["null", "paid", "refunded", "requested"]); // the tests above made each kind
    const list = await request(server).get("/api/orders?size=100").set("Cookie", owner);
    expect(new Map(list.body.rows.map((r: { number: number; deposit: string | null }) => [r.number, r.deposit]))).toEqual(latest);
    for (const kind of ["requested", "paid", "refunded", "none"] as const) {
      const filtered = await request(server).get(`/api/orders?size=100&deposit=${kind}`).set("Cookie", owner);
      const expected = [...latest].filter(([, s]) => s === (kind === "none" ? null : kind)).map(([n]) => n).sort();
      expect(filtered.body.rows.map((r: { number: number }) => r.number).sort(), kind).toEqual(expected);
    }
    const page = visible((await request(server).get("/orders?deposit=paid&size=100").set("Cookie", owner)).text);
    expect(page).toContain(">Deposit<");
    expect(page).toContain(">Paid</span>");
    expect(page).not.toContain(">Asked, not paid</span>");
    // The planner reads orders but not deposits: no column, no figures, the filter is ignored.
    const planner = await signIn(server, shop.users.planner);
    const theirs = await request(server).get("/api/orders?size=100&deposit=paid").set("Cookie", planner);
    expect(theirs.body.total).toBe(rows.length);
    expect(theirs.body.rows.every((r: { deposit: unknown }) => r.deposit === null)).toBe(true);
    expect(visible((await request(server).get("/orders").set("Cookie", planner)).text)).not.toContain(">Deposit<");
  });

  it("the history keeps a deposit's story in order when the service stamps it all within one second", async () => {
    const order = await draftOrder();
    const askedAt = new Date("2027-01-05T10:00:00.700Z");
    const stamped = new Date("2027-01-05T10:00:00.000Z"); // the payment and its refund, to the second: before the ask
    const [deposit] = await db
      .insert(t.deposits)
      .values({ shopId: shop.id, orderId: order.id, amountMinor: 6060, currency: "EUR", status: "refunded", linkToken: `story-${order.id}`, paymentIntentId: `pi_story_${order.id}`, requestedAt: askedAt, paidAt: stamped, refundedAt: stamped })
      .returning();
    await db.insert(t.depositMoves).values([
      { shopId: shop.id, depositId: deposit.id, kind: "refund", amountMinor: 6060, currency: "EUR", providerRef: `re_story_${order.id}`, occurredAt: stamped, recordedBy: shop.users.owner.id },
      { shopId: shop.id, depositId: deposit.id, kind: "payment", amountMinor: 6060, currency: "EUR", eventId: `evt_story_${order.id}`, providerRef: `pi_story_${order.id}`, occurredAt: stamped },
    ]);
    const told = (await orderHistory(shop.id, order.id, { deposits: true })).map((e) => e.text);
    expect(told.slice(-3)).toEqual(["Asked a deposit of €60.60", "The customer paid €60.60 of the deposit", "Refunded €60.60 of the deposit"]);
    expect(await orderHistory(shop.id, order.id)).toEqual([expect.objectContaining({ text: "Took the order, with 2 lines" })]); // without deposits: none of it
  });

  it("the deposits ledger counts a payment in the day and month on the shop's clock", async () => {
    const ny = await createShop("Deposit books NY");
    await db.update(t.shops).set({ timeZone: "America/New_York", currency: "USD" }).where(eq(t.shops.id, ny.id));
    const c = await createCatalogue(ny.id);
    const order = await createOrder(ny.id, { customerId: c.customer.id, eventDate: "2026-04-18", dueDate: "2026-04-04", notes: "" }, [{ productId: c.sign.id, quantity: 1, personalisation: [], notes: "", files: [] }]);
    await db.update(t.orders).set({ status: "confirmed" }).where(eq(t.orders.id, order.id));
    // Paid at 03:00 UTC on 1 March 2026: 22:00 on 28 February in New York (UTC−5 until 8 March, IANA rules).
    const paidAt = new Date("2026-03-01T03:00:00Z");
    const [deposit] = await db
      .insert(t.deposits)
      .values({ shopId: ny.id, orderId: order.id, amountMinor: 2550, currency: "USD", status: "paid", linkToken: `tz-${order.id}`, paymentIntentId: `pi_tz_${order.id}`, requestedAt: new Date("2026-02-27T15:00:00Z"), paidAt })
      .returning();
    await db.insert(t.depositMoves).values({ shopId: ny.id, depositId: deposit.id, kind: "payment", amountMinor: 2550, currency: "USD", eventId: `evt_tz_${order.id}`, providerRef: `pi_tz_${order.id}`, occurredAt: paidAt });
    const feb = await depositLedger(ny.id, new URLSearchParams({ month: "2026-02" }));
    expect(feb.orders.map((o) => [o.orderNumber, o.receivedInPeriodMinor])).toEqual([[order.number, 2550]]);
    const march = await depositLedger(ny.id, new URLSearchParams({ month: "2026-03" }));
    expect(march.orders).toEqual([]);
    if (feb.months.some((m) => m.month === "2026-02")) {
      // the last twelve months reach back to February 2026 until February 2027
      expect(feb.months.find((m) => m.month === "2026-02")?.receivedMinor).toBe(2550);
      expect(feb.months.find((m) => m.month === "2026-03")?.receivedMinor).toBe(0);
    }
  });

  it("the bookkeeper's deposits ledger lists each order's deposit and balance, per month, and its CSV parses back to the same figures", async () => {
    const fresh = await createShop("Deposit books");
    await db.update(t.shops).set({ depositRule: "fixed", depositFixedMinor: 5000, currency: "GBP" }).where(eq(t.shops.id, fresh.id));
    const c = await createCatalogue(fresh.id);
    const make = () =>
      createOrder(fresh.id, { customerId: c.customer.id, eventDate: "2027-06-12", dueDate: "2027-05-29", notes: "" }, [{ productId: c.sign.id, quantity: 2, personalisation: [], notes: "", files: [] }]);
    const [paid, asked] = [await make(), await make()];
    const freshOwner = await signIn(server, fresh.users.owner);
    for (const o of [paid, asked]) {
      expect((await request(server).post(`/orders/${o.id}`).set("Cookie", freshOwner).field("intent", "move").field("to", "confirmed").field("deposit", "yes")).status).toBe(302);
    }
    const [d] = await db.select().from(t.deposits).where(and(eq(t.deposits.shopId, fresh.id), eq(t.deposits.orderId, paid.id)));
    await payOnFake((await request(server).get(`/pay/${d.linkToken}/checkout`)).headers.location);
    const session = await retrieveSession((await depositRow(d.id)).checkoutSessionId!);
    expect((await deliver(server, eventBody("checkout.session.completed", session))).body.outcome).toBe("recorded");

    const month = new Date().toISOString().slice(0, 7);
    const bookkeeper = await signIn(server, fresh.users.bookkeeper);
    const page = await request(server).get(`/ledger/deposits?month=${month}`).set("Cookie", bookkeeper);
    expect(page.status).toBe(200);
    const html = visible(page.text);
    expect(html).toContain(`#${paid.number}`);
    expect(html).toContain(`#${asked.number}`);
    expect(html).toContain("Received £50.00 · refunded £0.00 in this period");
    const monthName = execFileSync("date", ["-d", `${month}-01`, "+%B %Y"], { env: { ...process.env, LC_ALL: "C" }, encoding: "utf8" }).trim(); // GNU date names it
    expect(html).toContain(`${monthName}: orders with deposits`);

    const ledger = await depositLedger(fresh.id, new URLSearchParams({ month }));
    expect(ledger.orders.map((o) => [o.orderNumber, o.askedMinor, o.paidMinor, o.balanceMinor])).toEqual([
      [paid.number, 5000, 5000, 12000],
      [asked.number, 5000, 0, 17000],
    ]);
    expect(ledger.months.at(-1)).toEqual({ month, receivedMinor: 5000, refundedMinor: 0, netMinor: 5000 });

    const csv = await request(server).get(`/ledger/deposits.csv?month=${month}`).set("Cookie", bookkeeper);
    expect(csv.status).toBe(200);
    expect(csv.headers["content-type"]).toContain("text/csv");
    expect(csv.headers["content-disposition"]).toBe(`attachment; filename="stopwise-deposits-${month}.csv"`);
    const [header, ...rest] = csv.text.split("\r\n");
    expect(header).toBe(`# Stopwise deposits ${month}; money in GBP`);
    const records = parse(rest.join("\r\n"), { columns: true, skip_empty_lines: true }) as Record<string, string>[];
    const minor = (text: string) => Math.round(Number(text) * 100);
    expect(
      records.map((r) => ({
        orderNumber: Number(r.order),
        customerName: r.customer,
        orderTotalMinor: minor(r.order_total_GBP),
        askedMinor: minor(r.deposit_asked_GBP),
        paidMinor: minor(r.paid_GBP),
        refundedMinor: minor(r.refunded_GBP),
        receivedInPeriodMinor: minor(r.received_in_period_GBP),
        refundedInPeriodMinor: minor(r.refunded_in_period_GBP),
        balanceMinor: minor(r.balance_after_deposit_GBP),
      })),
    ).toEqual(ledger.orders.map(({ orderId: _id, status: _status, ...rest }) => rest));
    expect(records.map((r) => r.deposit_status)).toEqual(["Deposit paid", "Deposit requested"]);

    for (const role of ["planner", "sawyer"] as const) {
      const cookie = await signIn(server, fresh.users[role]);
      expect((await request(server).get(`/ledger/deposits?month=${month}`).set("Cookie", cookie)).status, role).toBe(403);
      expect((await request(server).get(`/ledger/deposits.csv?month=${month}`).set("Cookie", cookie)).status, role).toBe(403);
    }
  });
});
