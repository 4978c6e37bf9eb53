import { Link } from "react-router";
import type { Route } from "./+types/saw";
import { requirePermission } from "~/auth.server";
import { BatchBadge } from "~/components/batch-badge";
import { PageHeader } from "~/components/page-header";
import { batchCode } from "~/lib/batches";
import { formatDate } from "~/lib/dates";
import { floorBatches } from "~/models/floor.server";
import { timed } from "~/timing.server";

export async function loader(args: Route.LoaderArgs) {
  const user = requirePermission(args, "floor:read");
  return { batches: await timed("queries", () => floorBatches(user.shopId)) };
}

export default function Saw({ loaderData }: Route.ComponentProps) {
  const { batches } = loaderData;
  return (
    <div className="space-y-6">
      <PageHeader eyebrow="Sawyer" title="Saw station">
        Released batches, set-up by set-up. Open one on the tablet beside the saw.
      </PageHeader>
      {batches.length === 0 ? (
        <p className="text-muted">Nothing is released to the saw yet.</p>
      ) : (
        <ul className="grid gap-3 md:grid-cols-2">
          {batches.map((b) => (
            <li key={b.id}>
              <Link to={`/saw/${b.id}`} className="flex min-h-20 items-center justify-between gap-3 rounded-lg border border-line bg-card p-4 hover:border-edge">
                <span>
                  <span className="block text-xl font-semibold">{batchCode(b.number)}</span>
                  <span className="text-muted">
                    {b.materialName} · due by {formatDate(b.dueBy)}
                  </span>
                </span>
                <BatchBadge status={b.status} />
              </Link>
            </li>
          ))}
        </ul>
      )}
    </div>
  );
}
