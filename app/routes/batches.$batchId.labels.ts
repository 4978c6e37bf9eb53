import { data } from "react-router";
import type { Route } from "./+types/batches.$batchId.labels";
import { requirePermission } from "~/auth.server";

// Being built.
export function loader(args: Route.LoaderArgs) {
  requirePermission(args, "floor:read");
  throw data("Not found", { status: 404 });
}
