import type { Route } from "./+types/customers.new";
import { requirePermission } from "~/auth.server";
import { PageHeader } from "~/components/page-header";

// Not built yet (issue 5).
export function loader(args: Route.LoaderArgs) {
  requirePermission(args, "customers:write");
  return null;
}

export default function Page() {
  return <PageHeader eyebrow="Owner" title="New customer">Being built.</PageHeader>;
}
