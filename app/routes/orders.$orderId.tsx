import { data } from "react-router";
import type { Route } from "./+types/orders.$orderId";
import { requirePermission } from "~/auth.server";
import { PageHeader } from "~/components/page-header";

// Not built yet (issue 5).
export function loader(args: Route.LoaderArgs) {
  requirePermission(args, "orders:read");
  throw data("Not found", { status: 404 });
}

export default function Page() {
  return <PageHeader eyebrow="Owner" title="Order">Being built.</PageHeader>;
}
