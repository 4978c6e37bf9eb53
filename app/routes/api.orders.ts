import type { Route } from "./+types/api.orders";
import { requirePermission } from "~/auth.server";

export function loader(args: Route.LoaderArgs) {
  requirePermission(args, "orders:read");
  return Response.json({ rows: [], total: 0 });
}
