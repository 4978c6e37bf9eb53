import * as v from "valibot";
import { data } from "react-router";
import type { Route } from "./+types/batches.$batchId.blanks.$blank";
import { requirePermission } from "~/auth.server";
import { blankSvg } from "~/lib/laser-blanks";
import { getBatch } from "~/models/batches.server";
import { batchCutList } from "~/models/plan-job.server";
import { getShop } from "~/models/shops.server";

// One laser blank as SVG at true size, for the laser's own software.
export async function loader(args: Route.LoaderArgs) {
  const user = requirePermission(args, "batches:read");
  const batch = v.is(v.pipe(v.string(), v.uuid()), args.params.batchId) ? await getBatch(user.shopId, args.params.batchId) : null;
  if (!batch) throw data("No such batch in this shop.", { status: 404 });
  const index = Number(args.params.blank);
  const { blanks } = await batchCutList(batch.id, await getShop(user.shopId));
  const blank = Number.isInteger(index) ? blanks[index - 1] : undefined;
  if (!blank) throw data("No such blank in this batch.", { status: 404 });
  const svg = blankSvg(blank, `${batch.code} · ${batch.materialName} · blank ${index} of ${blanks.length}`);
  return new Response(svg, {
    headers: {
      "Content-Type": "image/svg+xml; charset=utf-8",
      "Content-Disposition": `attachment; filename="${batch.code}-blank-${index}.svg"`,
      "Content-Security-Policy": "default-src 'none'; style-src 'unsafe-inline'; sandbox",
      "X-Content-Type-Options": "nosniff",
    },
  });
}
