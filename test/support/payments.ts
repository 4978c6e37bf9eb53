// Webhook events signed as the payment service signs them (the SDK's own test-signature helper),
// and the fake's checkout page driven over HTTP as a customer's browser would.
import { randomBytes } from "node:crypto";
import request from "supertest";
import type { Server } from "node:http";
import Stripe from "stripe";

const sdk = new Stripe(process.env.STRIPE_SECRET_KEY ?? "sk_test_unused");

export function webhookSecret(): string {
  const secret = process.env.STRIPE_WEBHOOK_SECRET;
  if (!secret) throw new Error("STRIPE_WEBHOOK_SECRET is not set: run through bin/test");
  return secret;
}

export function eventBody(type: string, object: unknown, id = `evt_test_${randomBytes(8).toString("hex")}`): string {
  return JSON.stringify({ id, object: "event", api_version: Stripe.API_VERSION, created: Math.floor(Date.now() / 1000), type, livemode: false, pending_webhooks: 1, data: { object } });
}

export function sign(body: string, secret = webhookSecret()): string {
  return sdk.webhooks.generateTestHeaderString({ payload: body, secret });
}

/** POSTs a webhook delivery to the app; `signature: null` sends none. */
export function deliver(server: Server, body: string, signature: string | null = sign(body)) {
  const req = request(server).post("/webhooks/payments").set("Content-Type", "application/json");
  if (signature !== null) req.set("Stripe-Signature", signature);
  return req.send(body);
}

/** Presses "Pay" on the fake's checkout page (as the customer's browser posts it); returns where it sends them back. */
export async function payOnFake(checkoutUrl: string): Promise<string> {
  const url = new URL(checkoutUrl);
  const res = await fetch(`${url.origin}${url.pathname}/pay`, { method: "POST", redirect: "manual" });
  if (res.status !== 303) throw new Error(`the fake's pay button answered ${res.status}: ${await res.text()}`);
  return res.headers.get("location")!;
}

/** The payment service's view of a Checkout Session, through the SDK pointed at the fake. */
export function retrieveSession(id: string) {
  return new Stripe(process.env.STRIPE_SECRET_KEY!, {
    host: process.env.STRIPE_API_HOST,
    port: Number(process.env.STRIPE_API_PORT),
    protocol: "http",
  }).checkout.sessions.retrieve(id);
}
