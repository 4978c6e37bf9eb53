import { balanceOf } from "~/lib/deposits";
import { depositRequestEmail, orderConfirmationEmail, orderReadyEmail } from "~/lib/emails";
import { formatDate } from "~/lib/dates";
import { formatMoney } from "~/lib/money";
import { sendMail } from "~/mail.server";
import { orderDeposit, orderMoves } from "./deposits.server";
import type { EventContext } from "./order-history.server";
import { getOrder, recordConfirmation, recordReadyNotice, type OrderDetail } from "./orders.server";
import { getShop } from "./shops.server";

/** The customer's payment link of a deposit (`origin` is where the shop's site is reached). */
export function depositLink(origin: string, linkToken: string): string {
  return `${origin}/pay/${linkToken}`;
}

/**
 * Sends the confirmation e-mail and records the outcome; a failure is kept on the order to show and
 * retry. A deposit asked and not yet paid puts its payment link in the e-mail.
 */
export async function sendConfirmation(shopId: string, orderId: string, origin: string, who: EventContext = {}): Promise<{ sent: true } | { sent: false; error: string }> {
  const [order, shop, deposit] = await Promise.all([getOrder(shopId, orderId), getShop(shopId), orderDeposit(shopId, orderId)]);
  if (!order) return { sent: false, error: "The order is gone." };
  if (!order.customerEmail) {
    const error = "The customer has no e-mail address; add one to the customer and send again.";
    await recordConfirmation(shopId, order.id, { error }, who);
    return { sent: false, error };
  }
  const mail = orderConfirmationEmail({
    shopName: shop.name,
    customerName: order.customerName,
    orderNumber: order.number,
    eventDate: formatDate(order.eventDate),
    dueDate: formatDate(order.dueDate),
    lines: order.lines.map((l) => ({ name: l.productName, quantity: l.quantity, total: formatMoney(l.quantity * l.unitPriceMinor, shop.currency) })),
    total: formatMoney(order.totalMinor, shop.currency),
    deposit: deposit?.status === "requested" ? { amount: formatMoney(deposit.amountMinor, deposit.currency), link: depositLink(origin, deposit.linkToken) } : undefined,
  });
  try {
    await sendMail({ to: order.customerEmail, ...mail });
    await recordConfirmation(shopId, order.id, { sentAt: new Date(), to: order.customerEmail }, who);
    return { sent: true };
  } catch (e) {
    const error = `The e-mail could not be sent: ${e instanceof Error ? e.message : String(e)}`;
    await recordConfirmation(shopId, order.id, { error }, who);
    return { sent: false, error };
  }
}

/** E-mails the payment link of a deposit asked after the order was confirmed. */
export async function sendDepositRequest(shopId: string, orderId: string, origin: string): Promise<void> {
  const [order, shop, deposit] = await Promise.all([getOrder(shopId, orderId), getShop(shopId), orderDeposit(shopId, orderId)]);
  if (!order || !deposit || deposit.status !== "requested") return;
  if (!order.customerEmail) throw new Error("The customer has no e-mail address; add one to the customer first.");
  await sendMail({
    to: order.customerEmail,
    ...depositRequestEmail({
      shopName: shop.name,
      customerName: order.customerName,
      orderNumber: order.number,
      amount: formatMoney(deposit.amountMinor, deposit.currency),
      total: formatMoney(order.totalMinor, shop.currency),
      link: depositLink(origin, deposit.linkToken),
    }),
  });
}

/**
 * Tells the customer a ready order can be collected, with what is still to pay (the total less any
 * deposit held), and records when it went. The caller has read the order and checked it is ready.
 */
export async function sendReadyNotice(shopId: string, order: OrderDetail, who: EventContext = {}): Promise<{ sent: true } | { sent: false; error: string }> {
  const [shop, moves] = await Promise.all([getShop(shopId), orderMoves(shopId, order.id)]);
  if (!order.customerEmail) return { sent: false, error: "The customer has no e-mail address; add one to the customer first." };
  const { balanceMinor } = balanceOf(order.totalMinor, moves);
  const mail = orderReadyEmail({
    shopName: shop.name,
    customerName: order.customerName,
    orderNumber: order.number,
    eventDate: formatDate(order.eventDate),
    balance: balanceMinor > 0 ? formatMoney(balanceMinor, shop.currency) : undefined,
  });
  try {
    await sendMail({ to: order.customerEmail, ...mail });
  } catch (e) {
    return { sent: false, error: `The e-mail could not be sent: ${e instanceof Error ? e.message : String(e)}` };
  }
  await recordReadyNotice(shopId, order.id, { at: new Date(), to: order.customerEmail }, who);
  return { sent: true };
}
