import { type RouteConfig, index, layout, route } from "@react-router/dev/routes";

export default [
  route("api/health", "routes/api.health.ts"),
  layout("routes/shell.tsx", [
    index("routes/home.tsx"),
    route("orders", "routes/orders.tsx"),
    route("customers", "routes/customers.tsx"),
    route("catalogue", "routes/catalogue.tsx"),
    route("batches", "routes/batches.tsx"),
    route("rack", "routes/rack.tsx"),
    route("saw", "routes/saw.tsx"),
    route("sleds", "routes/sleds.tsx"),
    route("ledger", "routes/ledger.tsx"),
    route("team", "routes/team.tsx"),
    route("settings", "routes/settings.tsx"),
    route("*", "routes/not-found.tsx"),
  ]),
] satisfies RouteConfig;
