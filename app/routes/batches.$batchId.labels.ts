import * as v from "valibot";
import { data } from "react-router";
import type { Route } from "./+types/batches.$batchId.labels";
import { requirePermission } from "~/auth.server";
import { publicOrigin } from "~/mail.server";
import { partLabels } from "~/lib/part-labels";
import { labelsPdf } from "~/pdf/labels.server";
import { paperFrom, pdfResponse } from "~/pdf/fonts.server";
import { releasedBatch } from "~/models/setup-sheet.server";

// GET ?paper=a4|letter: one label per part of a released batch, with a QR code to its order.
export async function loader(args: Route.LoaderArgs) {
  const user = requirePermission(args, "floor:read");
  const found = v.is(v.pipe(v.string(), v.uuid()), args.params.batchId) ? await releasedBatch(user.shopId, args.params.batchId) : null;
  if (!found) throw data("No released batch with that id in this shop: labels exist once a plan is released to the saw.", { status: 404 });
  const paper = paperFrom(new URL(args.request.url), found.shop.displayUnit);
  if (!paper) throw data('Paper must be "a4" or "letter".', { status: 400 });
  const { sawn, laser } = found.cutList;
  const labels = partLabels(found.batch.code, [...sawn, ...laser], found.shop.displayUnit);
  const origin = publicOrigin(args.request);
  const pdf = await labelsPdf(labels, (l) => `${origin}/orders/${l.orderId}`, paper, `${found.batch.code} · part labels`);
  return pdfResponse(pdf, `${found.batch.code}-labels.pdf`);
}
