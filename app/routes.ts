import { type RouteConfig, index, layout, route } from "@react-router/dev/routes";

// Areas not built yet share one placeholder module; each gets its own route id.
const placeholder = (path: string) => route(path, "routes/area-placeholder.tsx", { id: `placeholder-${path}` });

export default [
  route("api/health", "routes/api.health.ts"),
  route("api/me", "routes/api.me.ts"),
  route("api/orders", "routes/api.orders.ts"),
  route("api/batches/:batchId/plans", "routes/api.batches.$batchId.plans.ts"),
  route("orders/:orderId/files/:fileId", "routes/orders.$orderId.files.$fileId.ts"),
  route("sign-in", "routes/sign-in.tsx"),
  route("sign-up", "routes/sign-up.tsx"),
  route("sign-out", "routes/sign-out.tsx"),
  route("forgot-password", "routes/forgot-password.tsx"),
  route("reset-password/:token", "routes/reset-password.tsx"),
  route("invitation/:token", "routes/invitation.tsx"),
  layout("routes/shell.tsx", [
    index("routes/home.tsx"),
    route("orders", "routes/orders.tsx"),
    route("orders/new", "routes/orders.new.tsx"),
    route("orders/:orderId", "routes/orders.$orderId.tsx"),
    route("customers", "routes/customers.tsx"),
    route("customers/new", "routes/customers.new.tsx"),
    route("customers/:customerId", "routes/customers.$customerId.tsx"),
    route("catalogue", "routes/catalogue.tsx"),
    route("catalogue/materials", "routes/catalogue.materials.tsx"),
    route("catalogue/products/new", "routes/catalogue.products.new.tsx"),
    route("catalogue/products/:productId", "routes/catalogue.products.$productId.tsx"),
    route("batches", "routes/batches.tsx"),
    route("batches/:batchId", "routes/batches.$batchId.tsx"),
    route("batches/:batchId/plans/:planId", "routes/batches.$batchId.plans.$planId.tsx"),
    route("batches/:batchId/blanks/:blank", "routes/batches.$batchId.blanks.$blank.ts"),
    route("rack", "routes/rack.tsx"),
    placeholder("saw"),
    placeholder("sleds"),
    placeholder("ledger"),
    route("settings", "routes/settings.tsx"),
    route("team", "routes/team.tsx"),
    route("dev/outbox", "routes/dev.outbox.tsx"),
    route("*", "routes/not-found.tsx"),
  ]),
] satisfies RouteConfig;
