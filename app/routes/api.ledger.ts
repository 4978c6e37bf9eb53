import type { Route } from "./+types/api.ledger";
import { requirePermission } from "~/auth.server";
import { ledgerReport } from "~/models/ledger-report.server";

// The ledger of a period as JSON (?month=YYYY-MM or ?from=&to=), for the bookkeeper's page.
export async function loader(args: Route.LoaderArgs) {
  const user = requirePermission(args, "ledger:read");
  return Response.json(await ledgerReport(user.shopId, new URL(args.request.url).searchParams), { headers: { "Cache-Control": "no-store" } });
}
