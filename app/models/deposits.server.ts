import { randomBytes } from "node:crypto";
import { and, asc, desc, eq, inArray } from "drizzle-orm";
import Stripe from "stripe";
import { customers, depositMoves, deposits, orders, shops } from "../../db/schema";
import { getDb } from "~/db.server";
import { balanceOf, depositFor, unchargeableDeposit, type DepositStatus } from "~/lib/deposits";
import { payments } from "~/payments.server";
import { orderTotal } from "./order-sql.server";

/** A deposit that cannot be asked or refunded as things stand; the message is for people. */
export class DepositError extends Error {}

type Tx = Parameters<Parameters<ReturnType<typeof getDb>["transaction"]>[0]>[0];

/** What the shop's rule would ask of this order now, in the shop's currency; null when it asks nothing. */
async function proposal(shopId: string, orderId: string): Promise<{ amountMinor: number; currency: string } | null> {
  const [row] = await getDb()
    .select({ total: orderTotal(orderId), depositRule: shops.depositRule, depositPercent: shops.depositPercent, depositFixedMinor: shops.depositFixedMinor, currency: shops.currency })
    .from(orders)
    .innerJoin(shops, eq(shops.id, orders.shopId))
    .where(and(eq(orders.id, orderId), eq(orders.shopId, shopId)));
  const amountMinor = row ? depositFor(row, Number(row.total)) : null;
  return amountMinor === null ? null : { amountMinor, currency: row.currency };
}

/** What the shop's rule would ask of this order now; null when it asks nothing. */
export async function proposedDeposit(shopId: string, orderId: string): Promise<number | null> {
  return (await proposal(shopId, orderId))?.amountMinor ?? null;
}

/** Why the payment service would not take the deposit the rule asks of this order now; null when it would, or nothing is asked. */
export async function proposedDepositRefusal(shopId: string, orderId: string): Promise<string | null> {
  const proposed = await proposal(shopId, orderId);
  return proposed && unchargeableDeposit(proposed.amountMinor, proposed.currency);
}

/**
 * Asks a deposit of an order by the shop's rule: one open or paid deposit per order at a time (a
 * refunded one may be asked again). The order row is locked so a double click asks once.
 */
export async function openDeposit(shopId: string, orderId: string): Promise<{ id: string; linkToken: string; amountMinor: number; currency: string; again: boolean }> {
  return getDb().transaction(async (tx) => {
    const [order] = await tx.select({ id: orders.id, status: orders.status }).from(orders).where(and(eq(orders.id, orderId), eq(orders.shopId, shopId))).for("update");
    if (!order) throw new DepositError("No such order in this shop.");
    if (order.status === "draft" || order.status === "cancelled" || order.status === "delivered") throw new DepositError(`A ${order.status} order takes no deposit.`);
    const [active] = await tx
      .select({ id: deposits.id, linkToken: deposits.linkToken, amountMinor: deposits.amountMinor, currency: deposits.currency, status: deposits.status })
      .from(deposits)
      .where(and(eq(deposits.shopId, shopId), eq(deposits.orderId, order.id), inArray(deposits.status, ["requested", "paid", "refund_pending"])));
    if (active) {
      if (active.status === "requested") return { ...active, again: true }; // asked before and not paid: the same link
      throw new DepositError("This order's deposit is already paid.");
    }
    const [shop] = await tx.select().from(shops).where(eq(shops.id, shopId));
    const [{ total }] = await tx.select({ total: orderTotal(order.id) }).from(orders).where(eq(orders.id, order.id));
    const amountMinor = depositFor(shop, Number(total));
    if (amountMinor === null) throw new DepositError("The shop's deposit rule asks nothing of this order: set one in Settings.");
    const unchargeable = unchargeableDeposit(amountMinor, shop.currency);
    if (unchargeable) throw new DepositError(`${unchargeable} No payment link was made.`);
    const [row] = await tx
      .insert(deposits)
      .values({ shopId, orderId: order.id, amountMinor, currency: shop.currency, linkToken: randomBytes(24).toString("base64url") })
      .returning({ id: deposits.id, linkToken: deposits.linkToken, amountMinor: deposits.amountMinor, currency: deposits.currency });
    return { ...row, again: false };
  });
}

/** The order's latest deposit with its money moves, for the order page; null when none was asked. */
export async function orderDeposit(shopId: string, orderId: string) {
  const db = getDb();
  const [deposit] = await db
    .select()
    .from(deposits)
    .where(and(eq(deposits.shopId, shopId), eq(deposits.orderId, orderId)))
    .orderBy(desc(deposits.requestedAt))
    .limit(1);
  if (!deposit) return null;
  const moves = await db
    .select({ kind: depositMoves.kind, amountMinor: depositMoves.amountMinor, occurredAt: depositMoves.occurredAt, providerRef: depositMoves.providerRef })
    .from(depositMoves)
    .where(and(eq(depositMoves.shopId, shopId), eq(depositMoves.depositId, deposit.id)))
    .orderBy(asc(depositMoves.occurredAt));
  return { ...deposit, moves };
}

/** Every deposit move of an order (any of its deposits), for its balance. */
export async function orderMoves(shopId: string, orderId: string) {
  return getDb()
    .select({ kind: depositMoves.kind, amountMinor: depositMoves.amountMinor })
    .from(depositMoves)
    .innerJoin(deposits, eq(deposits.id, depositMoves.depositId))
    .where(and(eq(depositMoves.shopId, shopId), eq(deposits.orderId, orderId)));
}

/**
 * The deposit behind a payment link, with what its public page shows. The token alone selects it: it
 * lets its holder pay this deposit and see the shop, order number and amount, nothing more.
 */
export async function depositByToken(token: string) {
  if (!/^[A-Za-z0-9_-]{20,64}$/.test(token)) return null;
  const [row] = await getDb()
    .select({
      id: deposits.id,
      shopId: deposits.shopId,
      orderId: deposits.orderId,
      amountMinor: deposits.amountMinor,
      currency: deposits.currency,
      status: deposits.status,
      checkoutSessionId: deposits.checkoutSessionId,
      linkToken: deposits.linkToken,
      orderNumber: orders.number,
      orderStatus: orders.status,
      shopName: shops.name,
      customerEmail: customers.email,
    })
    .from(deposits)
    .innerJoin(orders, eq(orders.id, deposits.orderId))
    .innerJoin(shops, eq(shops.id, deposits.shopId))
    .innerJoin(customers, eq(customers.id, orders.customerId))
    .where(eq(deposits.linkToken, token));
  return row ?? null;
}

type LinkDeposit = NonNullable<Awaited<ReturnType<typeof depositByToken>>>;

/**
 * The payment service's checkout page for a deposit: the open Checkout Session when there is one,
 * else a new one. The idempotency key names the session it replaces, so two clicks at once share one.
 */
export async function checkoutUrl(deposit: LinkDeposit, origin: string): Promise<string> {
  if (deposit.status !== "requested") throw new DepositError("This deposit is already paid.");
  if (deposit.orderStatus === "cancelled") throw new DepositError("This order was cancelled; no deposit is due.");
  const stripe = payments();
  if (deposit.checkoutSessionId) {
    const open = await stripe.checkout.sessions.retrieve(deposit.checkoutSessionId).catch((error) => {
      // A session the service no longer knows is replaced like an expired one.
      if (error instanceof Stripe.errors.StripeInvalidRequestError && error.statusCode === 404) return null;
      throw error;
    });
    if (open?.status === "open" && open.url) return open.url;
    if (open?.status === "complete") throw new DepositError("This deposit is paid; the shop's records catch up in a moment.");
  }
  const back = `${origin}/pay/${deposit.linkToken}`;
  const metadata = { shopId: deposit.shopId, depositId: deposit.id, orderId: deposit.orderId };
  const session = await stripe.checkout.sessions.create(
    {
      mode: "payment",
      client_reference_id: deposit.id,
      customer_email: deposit.customerEmail || undefined,
      line_items: [
        {
          quantity: 1,
          price_data: { currency: deposit.currency.toLowerCase(), unit_amount: deposit.amountMinor, product_data: { name: `Deposit for order #${deposit.orderNumber} with ${deposit.shopName}` } },
        },
      ],
      metadata,
      payment_intent_data: { metadata },
      success_url: `${back}?session={CHECKOUT_SESSION_ID}`,
      cancel_url: `${back}?cancelled=1`,
    },
    { idempotencyKey: `deposit-checkout-${deposit.id}-${deposit.checkoutSessionId ?? "first"}` },
  );
  if (!session.url) throw new DepositError("The payment service gave no checkout page.");
  await getDb()
    .update(deposits)
    .set({ checkoutSessionId: session.id })
    .where(and(eq(deposits.id, deposit.id), eq(deposits.shopId, deposit.shopId)));
  return session.url;
}

/** Whether the session the customer came back from paid this deposit (for the thank-you page only). */
export async function sessionPaid(deposit: LinkDeposit, sessionId: string): Promise<boolean> {
  if (!/^cs_[A-Za-z0-9_]{1,200}$/.test(sessionId)) return false;
  try {
    const session = await payments().checkout.sessions.retrieve(sessionId);
    return session.metadata?.depositId === deposit.id && session.payment_status === "paid";
  } catch {
    return false;
  }
}

export type WebhookOutcome = "recorded" | "duplicate" | "ignored";

const idOf = (value: string | { id: string } | null | undefined) => (typeof value === "string" ? value : (value?.id ?? null));

/**
 * Records what a verified webhook event says about a deposit. The deposit is found by both the shop
 * id and the deposit id that Stopwise put in the session's (or refund's) metadata, so an event can
 * only touch the deposit it was made for, in its own shop. The same event id (or the same payment or
 * refund under another event) never records twice.
 */
export async function recordWebhookEvent(event: Stripe.Event): Promise<WebhookOutcome> {
  switch (event.type) {
    case "checkout.session.completed":
    case "checkout.session.async_payment_succeeded": {
      const session = event.data.object;
      if (session.payment_status !== "paid" || session.amount_total === null || !session.currency) return "ignored";
      const shopId = session.metadata?.shopId;
      const depositId = session.metadata?.depositId;
      const paymentIntentId = idOf(session.payment_intent);
      if (!isUuid(shopId) || !isUuid(depositId) || !paymentIntentId) return "ignored";
      return getDb().transaction(async (tx) => {
        const deposit = await lockDeposit(tx, shopId, depositId);
        if (!deposit || deposit.currency.toLowerCase() !== session.currency!.toLowerCase()) return "ignored";
        const occurredAt = new Date(event.created * 1000);
        const inserted = await tx
          .insert(depositMoves)
          .values({ shopId, depositId, kind: "payment", amountMinor: session.amount_total!, currency: deposit.currency, eventId: event.id, providerRef: paymentIntentId, occurredAt })
          .onConflictDoNothing()
          .returning({ id: depositMoves.id });
        if (inserted.length === 0) return "duplicate";
        await tx
          .update(deposits)
          .set({ status: "paid", paidAt: occurredAt, paymentIntentId, checkoutSessionId: session.id })
          .where(and(eq(deposits.id, depositId), eq(deposits.shopId, shopId)));
        return "recorded";
      });
    }
    case "refund.created":
    case "refund.updated": {
      const refund = event.data.object;
      if (refund.status !== "succeeded") return "ignored";
      const shopId = refund.metadata?.shopId;
      const depositId = refund.metadata?.depositId;
      if (!isUuid(shopId) || !isUuid(depositId)) return "ignored";
      return getDb().transaction(async (tx) => {
        const deposit = await lockDeposit(tx, shopId, depositId);
        if (!deposit || !deposit.paymentIntentId || deposit.paymentIntentId !== idOf(refund.payment_intent)) return "ignored";
        return recordRefund(tx, deposit, { refundId: refund.id, amountMinor: refund.amount, eventId: event.id, occurredAt: new Date(event.created * 1000), userId: null });
      });
    }
    default:
      return "ignored";
  }
}

const UUID = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;
function isUuid(value: string | undefined): value is string {
  return typeof value === "string" && UUID.test(value);
}

async function lockDeposit(tx: Tx, shopId: string, depositId: string) {
  const [row] = await tx
    .select()
    .from(deposits)
    .where(and(eq(deposits.id, depositId), eq(deposits.shopId, shopId)))
    .for("update");
  return row ?? null;
}

async function recordRefund(
  tx: Tx,
  deposit: typeof deposits.$inferSelect,
  refund: { refundId: string; amountMinor: number; eventId: string | null; occurredAt: Date; userId: string | null },
): Promise<WebhookOutcome> {
  const inserted = await tx
    .insert(depositMoves)
    .values({
      shopId: deposit.shopId,
      depositId: deposit.id,
      kind: "refund",
      amountMinor: refund.amountMinor,
      currency: deposit.currency,
      eventId: refund.eventId,
      providerRef: refund.refundId,
      occurredAt: refund.occurredAt,
      recordedBy: refund.userId,
    })
    .onConflictDoNothing()
    .returning({ id: depositMoves.id });
  if (inserted.length === 0) return "duplicate";
  const moves = await tx.select({ kind: depositMoves.kind, amountMinor: depositMoves.amountMinor }).from(depositMoves).where(eq(depositMoves.depositId, deposit.id));
  const { heldMinor } = balanceOf(0, moves);
  await tx
    .update(deposits)
    .set(heldMinor <= 0 ? { status: "refunded", refundedAt: refund.occurredAt } : { status: "paid" })
    .where(eq(deposits.id, deposit.id));
  return "recorded";
}

/**
 * Refunds what the customer paid towards the order's deposit, through the payment service. A
 * refund the service settles at once is recorded from its answer; one it settles later arrives as
 * a webhook event. The idempotency key makes a second click return the same refund.
 */
export async function refundDeposit(shopId: string, orderId: string, userId: string): Promise<DepositStatus> {
  const deposit = await orderDeposit(shopId, orderId);
  if (!deposit) throw new DepositError("This order has no deposit.");
  if (deposit.status === "refunded") throw new DepositError("The deposit was already refunded.");
  if (deposit.status !== "paid" || !deposit.paymentIntentId) throw new DepositError("Only a paid deposit can be refunded.");
  const { heldMinor } = balanceOf(0, deposit.moves);
  if (heldMinor <= 0) throw new DepositError("Nothing of this deposit is left to refund.");
  const refund = await payments().refunds.create(
    { payment_intent: deposit.paymentIntentId, amount: heldMinor, reason: "requested_by_customer", metadata: { shopId, depositId: deposit.id, orderId } },
    { idempotencyKey: `deposit-refund-${deposit.id}-${deposit.moves.length}` },
  );
  if (refund.status === "succeeded") {
    await getDb().transaction(async (tx) => {
      const locked = await lockDeposit(tx, shopId, deposit.id);
      if (locked) await recordRefund(tx, locked, { refundId: refund.id, amountMinor: refund.amount, eventId: null, occurredAt: new Date(refund.created * 1000), userId });
    });
    return "refunded";
  }
  if (refund.status === "failed" || refund.status === "canceled") throw new DepositError(`The payment service did not refund: ${refund.failure_reason ?? refund.status}.`);
  await getDb()
    .update(deposits)
    .set({ status: "refund_pending" })
    .where(and(eq(deposits.id, deposit.id), eq(deposits.shopId, shopId), eq(deposits.status, "paid")));
  return "refund_pending";
}
