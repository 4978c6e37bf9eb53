import type { Route } from "./+types/webhooks.payments";
import { recordWebhookEvent } from "~/models/deposits.server";
import { verifiedEvent, WebhookSignatureError } from "~/payments.server";

// The payment service's webhook: no session and no CSRF check (app/auth.server.ts exempts exactly
// this path); the Stripe-Signature header over the raw body is what authenticates it. express hands
// the body through untouched (bin/serve.ts has no body parser), so request.text() is the signed bytes.
export async function loader() {
  return new Response("Webhook deliveries are POSTed here.", { status: 405, headers: { Allow: "POST" } });
}

export async function action({ request }: Route.ActionArgs) {
  if (request.method !== "POST") return new Response("Only POST.", { status: 405, headers: { Allow: "POST" } });
  const body = await request.text();
  let event;
  try {
    event = verifiedEvent(body, request.headers.get("Stripe-Signature"));
  } catch (error) {
    if (error instanceof WebhookSignatureError) return Response.json({ error: `Signature refused: ${error.message}` }, { status: 400 });
    throw error;
  }
  // Unknown events and events for no deposit here are acknowledged, so the service stops resending them.
  const outcome = await recordWebhookEvent(event);
  return Response.json({ received: true, outcome });
}
