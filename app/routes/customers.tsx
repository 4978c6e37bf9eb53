import { Link } from "react-router";
import type { Route } from "./+types/customers";
import { requirePermission } from "~/auth.server";
import { ListSearch, ListTable, type Column } from "~/components/list-table";
import { PageHeader } from "~/components/page-header";
import { parseListQuery } from "~/lib/listing";
import { can } from "~/lib/permissions";
import { CUSTOMER_SORTS, listCustomers } from "~/models/customers.server";
import { timed } from "~/timing.server";

export async function loader(args: Route.LoaderArgs) {
  const user = requirePermission(args, "customers:read");
  const query = parseListQuery(new URL(args.request.url).searchParams, { sorts: CUSTOMER_SORTS, defaultSort: "name" });
  const { rows, total } = await timed("queries", () => listCustomers(user.shopId, query));
  return { rows, total, query, canWrite: can(user.role, "customers:write") };
}

type Row = Awaited<ReturnType<typeof listCustomers>>["rows"][number];
const COLUMNS: Column<Row>[] = [
  { key: "name", label: "Name", sortable: true, cell: (c) => <Link to={`/customers/${c.id}`} className="font-medium text-edge hover:underline">{c.name}</Link> },
  { key: "email", label: "E-mail", sortable: true, cell: (c) => c.email || <span className="text-muted">—</span> },
  { key: "phone", label: "Phone", cell: (c) => c.phone || <span className="text-muted">—</span> },
  { key: "orders", label: "Orders", sortable: true, align: "right", cell: (c) => c.orders },
];

export default function Customers({ loaderData }: Route.ComponentProps) {
  const { rows, total, query, canWrite } = loaderData;
  return (
    <div className="space-y-6">
      <div className="flex flex-wrap items-end justify-between gap-4">
        <PageHeader eyebrow="Owner" title="Customers">
          The people and businesses the shop makes for.
        </PageHeader>
        {canWrite && (
          <Link to="/customers/new" className="rounded-md bg-edge px-4 py-2.5 font-semibold text-white hover:bg-edge-dark">
            New customer
          </Link>
        )}
      </div>
      <ListSearch label="Search by name, e-mail or phone" placeholder="e.g. Ardent" />
      <ListTable rows={rows} columns={COLUMNS} total={total} page={query.page} size={query.size} sort={query.sort} dir={query.dir} empty={query.q ? `No customer matches "${query.q}".` : "No customers yet."} />
    </div>
  );
}
