import type { Route } from "./+types/api.orders";
import { requirePermission } from "~/auth.server";
import { can } from "~/lib/permissions";
import { listOrders, orderListQuery } from "~/models/orders.server";
import { timed } from "~/timing.server";

// The order list as JSON, one page at a time, for the list page's client-side refresh.
export async function loader(args: Route.LoaderArgs) {
  const user = requirePermission(args, "orders:read");
  const query = orderListQuery(args.request);
  const { rows, total } = await timed("queries", () => listOrders(user.shopId, query, { deposits: can(user.role, "deposits:read") }));
  return Response.json({ rows, total, query }, { headers: { "Cache-Control": "no-store" } });
}
