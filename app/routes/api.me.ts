import type { Route } from "./+types/api.me";
import { requirePermission } from "~/auth.server";
import { PERMISSIONS, can, type Permission } from "~/lib/permissions";

// Who is signed in and what their role allows, for client code that hides controls (the server still checks).
export function loader(args: Route.LoaderArgs) {
  const user = requirePermission(args, "dashboard:read");
  const permissions = (Object.keys(PERMISSIONS) as Permission[]).filter((p) => can(user.role, p));
  return Response.json({ name: user.name, email: user.email, role: user.role, shop: user.shopName, permissions }, { headers: { "Cache-Control": "no-store" } });
}
