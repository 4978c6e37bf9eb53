import { data } from "react-router";
import type { Route } from "./+types/customers.$customerId";
import { requirePermission } from "~/auth.server";
import { PageHeader } from "~/components/page-header";

// Not built yet (issue 5).
export function loader(args: Route.LoaderArgs) {
  requirePermission(args, "customers:read");
  throw data("Not found", { status: 404 });
}

export default function Page() {
  return <PageHeader eyebrow="Owner" title="Customer">Being built.</PageHeader>;
}
