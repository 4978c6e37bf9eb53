import * as v from "valibot";
import type { Route } from "./+types/api.batches.$batchId.plans";
import { requirePermission } from "~/auth.server";
import { getBatch } from "~/models/batches.server";
import { listPlans } from "~/models/plans.server";

// A batch's plans with their status and progress, polled by the batch page while a plan runs.
export async function loader(args: Route.LoaderArgs) {
  const user = requirePermission(args, "batches:read");
  const batch = v.is(v.pipe(v.string(), v.uuid()), args.params.batchId) ? await getBatch(user.shopId, args.params.batchId) : null;
  if (!batch) return Response.json({ error: "No such batch in this shop." }, { status: 404 });
  return Response.json({ plans: await listPlans(user.shopId, batch.id) }, { headers: { "Cache-Control": "no-store" } });
}
