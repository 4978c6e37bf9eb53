// The local fake of the payment service, for development and tests: the few Stripe API endpoints
// Stopwise calls (create and retrieve a Checkout Session, create a refund), a checkout page where a
// person pays or cancels, and webhook events signed with the SDK's own test-signature helper.
//   node --import tsx test/fakes/payments.ts
//   (STRIPE_API_PORT, STRIPE_SECRET_KEY, STRIPE_WEBHOOK_SECRET, STRIPE_FAKE_WEBHOOK_URL)
// Its state lives in memory: a restart forgets open sessions (the app opens a new one on the next click).
import express, { type Request, type Response } from "express";
import { randomBytes } from "node:crypto";
import type { Server } from "node:http";
import Stripe from "stripe";

type Session = {
  id: string;
  object: "checkout.session";
  mode: "payment";
  status: "open" | "complete" | "expired";
  payment_status: "unpaid" | "paid";
  amount_total: number;
  currency: string;
  client_reference_id: string | null;
  customer_email: string | null;
  metadata: Record<string, string>;
  payment_intent: string | null;
  success_url: string;
  cancel_url: string;
  url: string | null;
  created: number;
  line_items_name: string;
};
type Refund = { id: string; object: "refund"; amount: number; currency: string; payment_intent: string; status: "succeeded"; metadata: Record<string, string>; reason: string | null; created: number };
type FakeEvent = { id: string; type: string; created: number; object: unknown };

export type PaymentsFake = {
  url: string;
  port: number;
  /** Where events are delivered; tests that start the app after the fake set it then. */
  webhookUrl: string | null;
  /** Every event made, and how its delivery went (for tests and the fake's log). */
  events: (FakeEvent & { delivered: number | string | null })[];
  /** The Stripe-Signature header and body of an event, to deliver again by hand (duplicate delivery). */
  signed(eventId: string): { body: string; signature: string };
  stop(): Promise<void>;
};

const now = () => Math.floor(Date.now() / 1000);
const id = (prefix: string) => `${prefix}_fake_${randomBytes(12).toString("hex")}`;

function stripeError(res: Response, status: number, message: string, param?: string) {
  res.status(status).json({ error: { type: "invalid_request_error", message, param } });
}

const escapeHtml = (text: string) => text.replace(/[&<>"']/g, (c) => `&#${c.charCodeAt(0)};`);

export async function startPaymentsFake(options: { port?: number; secretKey: string; webhookSecret: string; webhookUrl?: string | null; host?: string }): Promise<PaymentsFake> {
  const host = options.host ?? "127.0.0.1";
  const sessions = new Map<string, Session>();
  const bySessionKey = new Map<string, string>();
  const refunds = new Map<string, Refund>();
  const byRefundKey = new Map<string, string>();
  const bodies = new Map<string, string>();
  const signer = new Stripe(options.secretKey);
  const app = express();
  app.disable("x-powered-by");
  let base = "";

  const fake: PaymentsFake = {
    url: "",
    port: 0,
    webhookUrl: options.webhookUrl ?? null,
    events: [],
    signed(eventId) {
      const body = bodies.get(eventId);
      if (!body) throw new Error(`no event ${eventId}`);
      return { body, signature: signer.webhooks.generateTestHeaderString({ payload: body, secret: options.webhookSecret }) };
    },
    stop: () => new Promise((resolve) => server.close(() => resolve())),
  };

  /** Makes an event, signs it, and delivers it (awaited, so the app has it before the customer returns). */
  async function emit(type: string, object: unknown) {
    const event: FakeEvent & { delivered: number | string | null } = { id: id("evt"), type, created: now(), object, delivered: null };
    const body = JSON.stringify({ id: event.id, object: "event", api_version: Stripe.API_VERSION, created: event.created, type, livemode: false, pending_webhooks: 1, data: { object } });
    bodies.set(event.id, body);
    fake.events.push(event);
    if (!fake.webhookUrl) return event;
    const signature = signer.webhooks.generateTestHeaderString({ payload: body, secret: options.webhookSecret });
    for (let attempt = 0; attempt < 3; attempt++) {
      try {
        const res = await fetch(fake.webhookUrl, { method: "POST", headers: { "Content-Type": "application/json", "Stripe-Signature": signature }, body });
        event.delivered = res.status;
        if (res.ok) break;
      } catch (error) {
        event.delivered = error instanceof Error ? error.message : String(error);
      }
      await new Promise((r) => setTimeout(r, 200 * (attempt + 1)));
    }
    if (event.delivered !== 200) console.error(`fake payments: ${type} ${event.id} to ${fake.webhookUrl}: ${event.delivered}`);
    return event;
  }

  // The API: bearer key checked as the service does, form bodies with bracketed keys (qs, via express).
  const api = express.Router();
  api.use(express.urlencoded({ extended: true, limit: "100kb" }));
  api.use((req, res, next) => {
    if (req.headers.authorization !== `Bearer ${options.secretKey}`) return stripeError(res, 401, "Invalid API Key provided.");
    next();
  });

  api.post("/checkout/sessions", (req: Request, res: Response) => {
    const key = req.header("Idempotency-Key");
    if (key && bySessionKey.has(key)) return res.json(sessions.get(bySessionKey.get(key)!));
    const body = req.body as Record<string, any>;
    if (body.mode !== "payment") return stripeError(res, 400, "Only mode=payment is faked.", "mode");
    for (const field of ["success_url", "cancel_url"]) if (typeof body[field] !== "string" || !/^https?:\/\//.test(body[field])) return stripeError(res, 400, `Missing or bad ${field}.`, field);
    const items = Array.isArray(body.line_items) ? body.line_items : [];
    if (items.length === 0) return stripeError(res, 400, "line_items is required.", "line_items");
    let amount = 0;
    let currency = "";
    for (const item of items) {
      const unit = Number(item?.price_data?.unit_amount);
      const quantity = Number(item?.quantity ?? 1);
      if (!Number.isInteger(unit) || unit < 1 || !Number.isInteger(quantity) || quantity < 1) return stripeError(res, 400, "unit_amount and quantity must be positive integers.", "line_items");
      if (currency && currency !== item.price_data.currency) return stripeError(res, 400, "All line items need one currency.", "line_items");
      currency = String(item.price_data.currency ?? "");
      amount += unit * quantity;
    }
    if (!/^[a-z]{3}$/.test(currency)) return stripeError(res, 400, "currency must be a three-letter ISO code in lower case.", "currency");
    const sessionId = id("cs");
    const session: Session = {
      id: sessionId,
      object: "checkout.session",
      mode: "payment",
      status: "open",
      payment_status: "unpaid",
      amount_total: amount,
      currency,
      client_reference_id: body.client_reference_id ?? null,
      customer_email: body.customer_email ?? null,
      metadata: body.metadata ?? {},
      payment_intent: null,
      success_url: body.success_url,
      cancel_url: body.cancel_url,
      url: `${base}/pay/${sessionId}`,
      created: now(),
      line_items_name: String(items[0]?.price_data?.product_data?.name ?? "Payment"),
    };
    sessions.set(sessionId, session);
    if (key) bySessionKey.set(key, sessionId);
    res.json(publicSession(session));
  });

  api.get("/checkout/sessions/:id", (req, res) => {
    const session = sessions.get(req.params.id);
    if (!session) return stripeError(res, 404, `No such checkout.session: '${req.params.id}'`, "id");
    res.json(publicSession(session));
  });

  api.post("/refunds", async (req, res) => {
    const key = req.header("Idempotency-Key");
    if (key && byRefundKey.has(key)) return res.json(refunds.get(byRefundKey.get(key)!));
    const body = req.body as Record<string, any>;
    const session = [...sessions.values()].find((s) => s.payment_intent && s.payment_intent === body.payment_intent);
    if (!session) return stripeError(res, 404, `No such payment_intent: '${body.payment_intent}'`, "payment_intent");
    const refunded = [...refunds.values()].filter((r) => r.payment_intent === session.payment_intent).reduce((a, r) => a + r.amount, 0);
    const amount = body.amount === undefined ? session.amount_total - refunded : Number(body.amount);
    if (!Number.isInteger(amount) || amount < 1) return stripeError(res, 400, "amount must be a positive integer.", "amount");
    if (amount > session.amount_total - refunded) return stripeError(res, 400, `Refund amount (${amount}) is greater than unrefunded amount on charge (${session.amount_total - refunded})`, "amount");
    const refund: Refund = { id: id("re"), object: "refund", amount, currency: session.currency, payment_intent: session.payment_intent!, status: "succeeded", metadata: body.metadata ?? {}, reason: body.reason ?? null, created: now() };
    refunds.set(refund.id, refund);
    if (key) byRefundKey.set(key, refund.id);
    res.json(refund);
    // The service also reports the refund as an event, after answering.
    void emit("refund.created", refund);
  });

  api.use((req, res) => stripeError(res, 404, `Unrecognized request URL (${req.method}: ${req.originalUrl}). The local fake serves only what Stopwise uses.`));
  app.use("/v1", api);

  // The checkout page a customer sees. It says plainly that it is a local stand-in.
  app.get("/pay/:id", (req, res) => {
    const session = sessions.get(req.params.id);
    if (!session) return res.status(404).type("text").send("No such checkout session.");
    const amount = new Intl.NumberFormat("en-GB", { style: "currency", currency: session.currency.toUpperCase() }).format(session.amount_total / 10 ** (session.currency === "jpy" ? 0 : 2));
    const done = session.status !== "open";
    res.type("html").send(`<!doctype html><html lang="en"><head><meta charset="utf-8"><meta name="viewport" content="width=device-width, initial-scale=1"><title>Test checkout</title>
<style>body{font-family:system-ui,sans-serif;background:#eef1f4;margin:0;padding:2rem 1rem;color:#1b1f24}main{max-width:26rem;margin:auto;background:#fff;border-radius:12px;padding:1.5rem;box-shadow:0 1px 4px #0002}
.note{background:#fff4d6;border-radius:8px;padding:.6rem .8rem;font-size:.9rem}.amount{font-size:2rem;font-weight:700;margin:.5rem 0 1rem}button{width:100%;min-height:3rem;font-size:1rem;font-weight:600;border-radius:8px;border:0;margin-top:.6rem;cursor:pointer}
.pay{background:#2d5bd3;color:#fff}.cancel{background:#e4e7eb;color:#1b1f24}</style></head><body><main>
<p class="note">Local test payment page: no card is asked and no money moves.</p>
<h1 style="font-size:1.1rem">${escapeHtml(session.line_items_name)}</h1><p class="amount">${amount}</p>
${done ? `<p>This checkout is ${session.status}.</p>` : `<form method="post" action="/pay/${session.id}/pay"><button class="pay" type="submit">Pay ${amount}</button></form>
<form method="post" action="/pay/${session.id}/cancel"><button class="cancel" type="submit">Cancel and go back</button></form>`}
</main></body></html>`);
  });

  app.post("/pay/:id/pay", async (req, res) => {
    const session = sessions.get(req.params.id);
    if (!session || session.status !== "open") return res.status(409).type("text").send("This checkout is no longer open.");
    session.status = "complete";
    session.payment_status = "paid";
    session.payment_intent = id("pi");
    session.url = null;
    await emit("checkout.session.completed", publicSession(session));
    res.redirect(303, session.success_url.replace("{CHECKOUT_SESSION_ID}", session.id));
  });

  app.post("/pay/:id/cancel", (req, res) => {
    const session = sessions.get(req.params.id);
    if (!session) return res.status(404).type("text").send("No such checkout session.");
    res.redirect(303, session.cancel_url.replace("{CHECKOUT_SESSION_ID}", session.id));
  });

  const server: Server = await new Promise((resolve, reject) => {
    const s = app.listen(options.port ?? 0, host, () => resolve(s));
    s.once("error", reject);
  });
  fake.port = (server.address() as { port: number }).port;
  fake.url = base = `http://${host}:${fake.port}`;
  return fake;
}

function publicSession(s: Session) {
  const { line_items_name: _name, ...rest } = s;
  return rest;
}

// Run directly (bin/start, bin/test): configured by the same variables the app reads.
if (import.meta.url === `file://${process.argv[1]}`) {
  const secretKey = process.env.STRIPE_SECRET_KEY;
  const webhookSecret = process.env.STRIPE_WEBHOOK_SECRET;
  if (!secretKey || !webhookSecret) {
    console.error("STRIPE_SECRET_KEY and STRIPE_WEBHOOK_SECRET must be set");
    process.exit(1);
  }
  const fake = await startPaymentsFake({ port: Number(process.env.STRIPE_API_PORT ?? 12111), secretKey, webhookSecret, webhookUrl: process.env.STRIPE_FAKE_WEBHOOK_URL || null });
  console.log(`fake payments listening on ${fake.url}${fake.webhookUrl ? `, events to ${fake.webhookUrl}` : ""}`);
  const stop = () => fake.stop().then(() => process.exit(0));
  process.once("SIGTERM", stop);
  process.once("SIGINT", stop);
}
