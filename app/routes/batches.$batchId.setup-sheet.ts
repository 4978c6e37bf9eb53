import * as v from "valibot";
import { data } from "react-router";
import type { Route } from "./+types/batches.$batchId.setup-sheet";
import { requirePermission } from "~/auth.server";
import { buildSetupSheet } from "~/lib/setup-sheet";
import { paperFrom, pdfResponse } from "~/pdf/fonts.server";
import { setupSheetPdf } from "~/pdf/setup-sheet.server";
import { releasedBatch, setupSheetInput } from "~/models/setup-sheet.server";

// GET ?paper=a4|letter: the saw set-up sheet of a released batch, as a PDF.
export async function loader(args: Route.LoaderArgs) {
  const user = requirePermission(args, "floor:read");
  const found = v.is(v.pipe(v.string(), v.uuid()), args.params.batchId) ? await releasedBatch(user.shopId, args.params.batchId) : null;
  if (!found) throw data("No released batch with that id in this shop: a set-up sheet exists once a plan is released to the saw.", { status: 404 });
  const paper = paperFrom(new URL(args.request.url), found.shop.displayUnit);
  if (!paper) throw data('Paper must be "a4" or "letter".', { status: 400 });
  const sheet = buildSetupSheet(await setupSheetInput(found, new Date()));
  return pdfResponse(await setupSheetPdf(sheet, found.plan.settings.kerfMm, paper), `${found.batch.code}-setup-sheet.pdf`);
}
