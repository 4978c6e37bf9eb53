import type { Route } from "./+types/catalogue.materials";
import { requirePermission } from "~/auth.server";
import { PageHeader } from "~/components/page-header";

// Not built yet (issue 5).
export function loader(args: Route.LoaderArgs) {
  requirePermission(args, "catalogue:read");
  return null;
}

export default function Page() {
  return <PageHeader eyebrow="Owner" title="Materials">Being built.</PageHeader>;
}
