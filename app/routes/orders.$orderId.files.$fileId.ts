import { data } from "react-router";
import type { Route } from "./+types/orders.$orderId.files.$fileId";
import { requirePermission } from "~/auth.server";

export function loader(args: Route.LoaderArgs) {
  requirePermission(args, "orders:read");
  throw data("Not found", { status: 404 });
}
