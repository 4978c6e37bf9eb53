import * as v from "valibot";
import type { Route } from "./+types/api.customers";
import { requirePermission } from "~/auth.server";
import { CustomerSearchSchema } from "~/lib/customer-schema";
import { searchCustomers } from "~/models/customers.server";
import { timed } from "~/timing.server";

// The order form's customer picker: at most 20 of this shop's customers matching ?q=.
export async function loader(args: Route.LoaderArgs) {
  const user = requirePermission(args, "customers:read");
  const query = v.safeParse(CustomerSearchSchema, Object.fromEntries(new URL(args.request.url).searchParams));
  if (!query.success) return Response.json({ error: query.issues[0].message, field: "q" }, { status: 400 });
  const customers = await timed("queries", () => searchCustomers(user.shopId, query.output.q));
  return Response.json({ customers }, { headers: { "Cache-Control": "no-store" } });
}
