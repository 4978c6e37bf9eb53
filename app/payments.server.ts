import Stripe from "stripe";

// The payment service, through the stripe SDK. STRIPE_SECRET_KEY and STRIPE_WEBHOOK_SECRET come from
// the account; STRIPE_API_HOST / STRIPE_API_PORT / STRIPE_API_PROTOCOL point the SDK elsewhere, which
// bin/start and bin/test do: at the local fake in test/fakes/payments.ts. Without a secret key the
// shop can still set a deposit rule, but no payment link is made.
let client: Stripe | undefined;

export function paymentsConfigured(): boolean {
  return Boolean(process.env.STRIPE_SECRET_KEY && process.env.STRIPE_WEBHOOK_SECRET);
}

export function payments(): Stripe {
  if (!client) {
    const key = process.env.STRIPE_SECRET_KEY;
    if (!key) throw new Error("STRIPE_SECRET_KEY is not set: payments are not set up on this server");
    const protocol = process.env.STRIPE_API_PROTOCOL;
    if (protocol && protocol !== "http" && protocol !== "https") throw new Error(`STRIPE_API_PROTOCOL must be http or https, not ${protocol}`);
    client = new Stripe(key, {
      host: process.env.STRIPE_API_HOST || undefined,
      port: process.env.STRIPE_API_PORT ? Number(process.env.STRIPE_API_PORT) : undefined,
      protocol: (protocol as "http" | "https" | undefined) || undefined,
      // Every write carries an idempotency key, so the SDK's own retries never pay or refund twice.
      maxNetworkRetries: 2,
      timeout: 10_000,
    });
  }
  return client;
}

export class WebhookSignatureError extends Error {}

/** The event in a webhook body, after its signature header checks out against STRIPE_WEBHOOK_SECRET. */
export function verifiedEvent(rawBody: string, signature: string | null): Stripe.Event {
  const secret = process.env.STRIPE_WEBHOOK_SECRET;
  if (!secret) throw new WebhookSignatureError("payments are not set up on this server");
  if (!signature) throw new WebhookSignatureError("the Stripe-Signature header is missing");
  try {
    return payments().webhooks.constructEvent(rawBody, signature, secret);
  } catch (error) {
    throw new WebhookSignatureError(error instanceof Error ? error.message : String(error));
  }
}

/** A message for people from a failed call to the payment service. */
export function paymentErrorMessage(error: unknown): string {
  if (error instanceof Stripe.errors.StripeError) return error.message || error.type;
  return error instanceof Error ? error.message : String(error);
}

/** The service answered and said no (4xx), as against not answering at all. */
export function refusedByService(error: unknown): boolean {
  return error instanceof Stripe.errors.StripeError && typeof error.statusCode === "number" && error.statusCode >= 400 && error.statusCode < 500;
}
