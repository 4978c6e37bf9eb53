import * as v from "valibot";
import { data } from "react-router";
import type { Route } from "./+types/orders.$orderId.files.$fileId";
import { requirePermission } from "~/auth.server";
import { getLineFile } from "~/models/orders.server";
import { readStoredFile } from "~/storage.server";

const Uuid = v.pipe(v.string(), v.uuid());

// Artwork downloads, for the shop's own people only. Always as an attachment with a fixed name and a
// sandboxing policy, so an uploaded SVG can never run as a page of this site (ASVS 4.0.3 V12.5.2).
export async function loader(args: Route.LoaderArgs) {
  const user = requirePermission(args, "orders:read");
  const { orderId, fileId } = args.params;
  const file = v.is(Uuid, orderId) && v.is(Uuid, fileId) ? await getLineFile(user.shopId, orderId, fileId) : null;
  if (!file) throw data("No such file in this shop.", { status: 404 });
  const bytes = await readStoredFile(file.storageKey);
  return new Response(new Uint8Array(bytes), {
    headers: {
      "Content-Type": file.contentType,
      "Content-Length": String(bytes.length),
      "Content-Disposition": `attachment; filename="${file.fileName.replace(/[^\w.\- ]/g, "_")}"; filename*=UTF-8''${encodeURIComponent(file.fileName)}`,
      "Content-Security-Policy": "default-src 'none'; sandbox",
      "X-Content-Type-Options": "nosniff",
      "Cache-Control": "private, no-store",
    },
  });
}
