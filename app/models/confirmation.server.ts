import { orderConfirmationEmail } from "~/lib/emails";
import { formatDate } from "~/lib/dates";
import { formatMoney } from "~/lib/money";
import { sendMail } from "~/mail.server";
import { getOrder, recordConfirmation } from "./orders.server";
import { getShop } from "./shops.server";

/** Sends the confirmation e-mail and records the outcome; a failure is kept on the order to show and retry. */
export async function sendConfirmation(shopId: string, orderId: string): Promise<{ sent: true } | { sent: false; error: string }> {
  const [order, shop] = await Promise.all([getOrder(shopId, orderId), getShop(shopId)]);
  if (!order) return { sent: false, error: "The order is gone." };
  if (!order.customerEmail) {
    const error = "The customer has no e-mail address; add one to the customer and send again.";
    await recordConfirmation(order.id, { error });
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
  });
  try {
    await sendMail({ to: order.customerEmail, ...mail });
    await recordConfirmation(order.id, { sentAt: new Date() });
    return { sent: true };
  } catch (e) {
    const error = `The e-mail could not be sent: ${e instanceof Error ? e.message : String(e)}`;
    await recordConfirmation(order.id, { error });
    return { sent: false, error };
  }
}
