import * as v from "valibot";
import { data } from "react-router";
import type { Route } from "./+types/orders.$orderId.checklist";
import { requirePermission } from "~/auth.server";
import { formatDate } from "~/lib/dates";
import { balanceOf } from "~/lib/deposits";
import { handoverSections } from "~/lib/handover";
import { formatMoney } from "~/lib/money";
import { can } from "~/lib/permissions";
import { orderMoves } from "~/models/deposits.server";
import { getOrder } from "~/models/orders.server";
import { getShop } from "~/models/shops.server";
import { handoverPdf } from "~/pdf/handover.server";
import { paperFrom, pdfResponse } from "~/pdf/fonts.server";

// GET ?paper=a4|letter: the order's handover checklist, every item by its text, to tick when packing.
export async function loader(args: Route.LoaderArgs) {
  const user = requirePermission(args, "orders:read");
  const order = v.is(v.pipe(v.string(), v.uuid()), args.params.orderId) ? await getOrder(user.shopId, args.params.orderId) : null;
  if (!order) throw data("No such order in this shop.", { status: 404 });
  const [shop, moves] = await Promise.all([getShop(user.shopId), can(user.role, "deposits:read") ? orderMoves(user.shopId, order.id) : null]);
  const paper = paperFrom(new URL(args.request.url), shop.displayUnit);
  if (!paper) throw data('Paper must be "a4" or "letter".', { status: 400 });
  const money = moves ? balanceOf(order.totalMinor, moves) : null;
  const pdf = await handoverPdf(
    {
      title: `Order #${order.number} · handover checklist`,
      shopName: shop.name,
      customer: order.customerName,
      contact: order.customerEmail ?? "",
      eventDate: formatDate(order.eventDate),
      dueDate: formatDate(order.dueDate),
      sections: handoverSections(order.lines),
      money: money ? { total: formatMoney(order.totalMinor, shop.currency), paid: formatMoney(money.heldMinor, shop.currency), balance: formatMoney(money.balanceMinor, shop.currency) } : undefined,
    },
    paper,
  );
  return pdfResponse(pdf, `order-${order.number}-checklist.pdf`);
}
