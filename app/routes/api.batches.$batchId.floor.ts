import * as v from "valibot";
import type { Route } from "./+types/api.batches.$batchId.floor";
import { requirePermission } from "~/auth.server";
import { chosenPlan, floorState, FloorStateError, tickSetup, untickSetup } from "~/models/floor.server";

const Uuid = v.pipe(v.string(), v.uuid());
const notFound = () => Response.json({ error: "No such batch at this shop's saw." }, { status: 404 });

// The floor's ticks for a released batch: read by the planner's page (swr), written by the sawyer's.
export async function loader(args: Route.LoaderArgs) {
  const user = requirePermission(args, "floor:read");
  const plan = v.is(Uuid, args.params.batchId) ? await chosenPlan(user.shopId, args.params.batchId) : null;
  if (!plan) return notFound();
  const state = await floorState(args.params.batchId);
  return Response.json({ setups: plan.result.plan.setups.length, ...state }, { headers: { "Cache-Control": "no-store" } });
}

const TickSchema = v.object({
  setupIndex: v.pipe(v.union([v.string(), v.number()], "setupIndex: give the set-up's number."), v.transform(Number), v.integer("setupIndex: give the set-up's number."), v.minValue(0, "setupIndex: give the set-up's number.")),
  countCut: v.optional(v.pipe(v.union([v.string(), v.number()], "countCut: a whole number of pieces."), v.transform(Number), v.integer("countCut: a whole number of pieces."), v.minValue(0, "countCut: 0 or more."), v.maxValue(100_000, "countCut: at most 100,000."))),
  untick: v.optional(v.union([v.literal("1"), v.literal(true)], 'untick: "1" or true, or leave it out.')),
}, "setupIndex: give the set-up's number."); // also the message for a missing setupIndex or a body that is no object

export async function action(args: Route.ActionArgs) {
  const user = requirePermission(args, "floor:write");
  const plan = v.is(Uuid, args.params.batchId) ? await chosenPlan(user.shopId, args.params.batchId) : null;
  if (!plan) return notFound();
  const isJson = args.request.headers.get("Content-Type")?.includes("application/json");
  let body: unknown;
  try {
    body = isJson ? await args.request.json() : Object.fromEntries(await args.request.formData());
  } catch {
    return Response.json({ error: "The body is not valid JSON." }, { status: 400 });
  }
  const parsed = v.safeParse(TickSchema, body);
  if (!parsed.success) return Response.json({ error: parsed.issues[0].message, field: parsed.issues[0].path?.[0]?.key ?? null }, { status: 400 });
  const { setupIndex, countCut, untick } = parsed.output;
  const setups = plan.result.plan.setups;
  try {
    if (untick) await untickSetup(user.shopId, args.params.batchId, setupIndex);
    else await tickSetup(user.shopId, user.id, args.params.batchId, setupIndex, countCut ?? setups[setupIndex]?.count ?? 0, setups);
  } catch (error) {
    if (error instanceof FloorStateError) return Response.json({ error: error.message }, { status: 409 });
    throw error;
  }
  return Response.json({ setups: setups.length, ...(await floorState(args.params.batchId)) });
}
