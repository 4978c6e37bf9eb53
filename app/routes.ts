import { type RouteConfig, index, layout, route } from "@react-router/dev/routes";

// Areas not built yet share one placeholder module; each gets its own route id.
const placeholder = (path: string) => route(path, "routes/area-placeholder.tsx", { id: `placeholder-${path}` });

export default [
  route("api/health", "routes/api.health.ts"),
  route("api/me", "routes/api.me.ts"),
  route("sign-in", "routes/sign-in.tsx"),
  route("sign-up", "routes/sign-up.tsx"),
  route("sign-out", "routes/sign-out.tsx"),
  route("forgot-password", "routes/forgot-password.tsx"),
  route("reset-password/:token", "routes/reset-password.tsx"),
  route("invitation/:token", "routes/invitation.tsx"),
  layout("routes/shell.tsx", [
    index("routes/home.tsx"),
    placeholder("orders"),
    placeholder("customers"),
    placeholder("catalogue"),
    placeholder("batches"),
    placeholder("rack"),
    placeholder("saw"),
    placeholder("sleds"),
    placeholder("ledger"),
    placeholder("settings"),
    route("team", "routes/team.tsx"),
    route("dev/outbox", "routes/dev.outbox.tsx"),
    route("*", "routes/not-found.tsx"),
  ]),
] satisfies RouteConfig;
