import * as v from "valibot";
import type { Route } from "./+types/api.batches.$batchId.origins";
import { requirePermission } from "~/auth.server";
import { describeOrigin, mergeBatchParts } from "~/lib/batch-parts";
import { batchSources, getBatch } from "~/models/batches.server";

/** A row lists at most this many copies; the labels and the plan view carry every one. */
export const ORIGINS_LISTED = 500;

// Which orders one merged row of a batch's cut list is for, read when the planner opens the row:
// the batch page itself ships only counts, so it stays small however many parts a batch has.
export async function loader(args: Route.LoaderArgs) {
  const user = requirePermission(args, "batches:read");
  const batch = v.is(v.pipe(v.string(), v.uuid()), args.params.batchId) ? await getBatch(user.shopId, args.params.batchId) : null;
  if (!batch) return Response.json({ error: "No such batch in this shop." }, { status: 404 });
  const key = new URL(args.request.url).searchParams.get("part") ?? "";
  const part = mergeBatchParts(await batchSources(batch.id)).find((p) => p.key === key);
  if (!part) return Response.json({ error: `part: no row "${key.slice(0, 80)}" in this batch's cut list.` }, { status: 404 });
  return Response.json(
    { part: part.key, quantity: part.quantity, origins: part.origins.slice(0, ORIGINS_LISTED).map(describeOrigin) },
    { headers: { "Cache-Control": "no-store" } },
  );
}
