import type { Route } from "./+types/area-placeholder";
import { requirePermission } from "~/auth.server";
import { AreaPlaceholder } from "~/components/area-placeholder";
import { areaFor } from "~/components/areas";

// One module serves every area that is not built yet (see app/routes.ts); each asks its own permission.
export function loader(args: Route.LoaderArgs) {
  const area = areaFor(new URL(args.request.url).pathname);
  requirePermission(args, area.permission);
  return { path: area.path };
}

export default function Page({ loaderData }: Route.ComponentProps) {
  return <AreaPlaceholder area={areaFor(loaderData.path)} />;
}
