import type { Route } from "./+types/settings";
import { requirePermission } from "~/auth.server";
import { PageHeader } from "~/components/page-header";

// Not built yet (issue 5).
export function loader(args: Route.LoaderArgs) {
  requirePermission(args, "settings:read");
  return null;
}

export default function Page() {
  return <PageHeader eyebrow="Owner" title="Shop settings">Being built.</PageHeader>;
}
