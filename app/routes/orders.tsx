import { useEffect } from "react";
import { Link, useSearchParams } from "react-router";
import useSWR from "swr";
import type { Route } from "./+types/orders";
import { requirePermission } from "~/auth.server";
import { ListFilter, ListSearch, ListTable, type Column } from "~/components/list-table";
import { PageHeader } from "~/components/page-header";
import { DepositBadge } from "~/components/deposit-panel";
import { StatusBadge } from "~/components/status-badge";
import { formatDate } from "~/lib/dates";
import { DEPOSIT_FILTER_LABELS, DEPOSIT_FILTERS } from "~/lib/deposits";
import type { ListQuery } from "~/lib/listing";
import { formatMoney } from "~/lib/money";
import { ORDER_STATUSES, STATUS_LABELS } from "~/lib/order-status";
import { can } from "~/lib/permissions";
import { listOrders, orderListQuery, type OrderListRow, type OrderSort } from "~/models/orders.server";
import { timed } from "~/timing.server";

// The first page comes from the loader (usable before scripts run); swr then keeps it fresh from /api/orders.
export async function loader(args: Route.LoaderArgs) {
  const user = requirePermission(args, "orders:read");
  const query = orderListQuery(args.request);
  const seesDeposits = can(user.role, "deposits:read");
  const { rows, total, currency } = await timed("queries", () => listOrders(user.shopId, query, { deposits: seesDeposits }));
  return { page: { rows, total, query }, currency, canWrite: can(user.role, "orders:write"), seesDeposits };
}

type Page = { rows: OrderListRow[]; total: number; query: ListQuery<OrderSort> };
const fetchJson = async (url: string): Promise<Page> => {
  const res = await fetch(url, { headers: { Accept: "application/json" } });
  if (!res.ok) throw new Error(`The order list could not be loaded (${res.status}).`);
  return res.json();
};

export default function Orders({ loaderData }: Route.ComponentProps) {
  const [params] = useSearchParams();
  // The loader has just read this very list: no second read on mount; swr refreshes it every 30 s and when the tab regains focus.
  const { data: page, error, mutate } = useSWR(`/api/orders?${params}`, fetchJson, { fallbackData: loaderData.page, refreshInterval: 30_000, revalidateOnMount: false });
  // Each navigation's loader data is the newest list for its address: it replaces whatever swr kept for it.
  useEffect(() => {
    void mutate(loaderData.page, { revalidate: false });
  }, [loaderData.page, mutate]);
  const { currency, canWrite, seesDeposits } = loaderData;
  const columns: Column<OrderListRow>[] = [
    { key: "number", label: "Order", sortable: true, cell: (o) => <a href={`/orders/${o.id}`} className="font-semibold text-edge hover:underline">{`#${o.number}`}</a> },
    {
      key: "customer",
      label: "Customer",
      sortable: true,
      cell: (o) => (
        <>
          {o.customer}
          {o.matched && <span className="block text-sm text-muted">Text: “{o.matched}”</span>}
        </>
      ),
    },
    { key: "event", label: "Event", sortable: true, cell: (o) => formatDate(o.eventDate) },
    { key: "due", label: "Due", sortable: true, cell: (o) => formatDate(o.dueDate) },
    { key: "status", label: "Status", sortable: true, cell: (o) => <StatusBadge status={o.status} /> },
    { key: "items", label: "Items", align: "right", cell: (o) => o.items },
    { key: "total", label: "Total", sortable: true, align: "right", cell: (o) => formatMoney(o.totalMinor, currency) },
  ];
  if (seesDeposits) columns.splice(5, 0, { key: "deposit", label: "Deposit", cell: (o) => <DepositBadge status={o.deposit} /> });
  const current = page ?? loaderData.page;
  return (
    <div className="space-y-6">
      <div className="flex flex-wrap items-end justify-between gap-4">
        <PageHeader eyebrow="Owner" title="Orders">
          Who ordered what, for which event, and when it must leave the shop.
        </PageHeader>
        {canWrite && (
          <Link to="/orders/new" className="rounded-md bg-edge px-4 py-2.5 font-semibold text-white hover:bg-edge-dark">
            New order
          </Link>
        )}
      </div>
      <ListSearch label="Search by customer, order number or personalisation text" placeholder="e.g. Ardent, 1001 or a guest's name">
        <ListFilter label="Status" name="status" value={params.get("status") ?? undefined} anyLabel="Any" options={ORDER_STATUSES.map((s) => ({ value: s, label: STATUS_LABELS[s] }))} />
        {seesDeposits && (
          <ListFilter label="Deposit" name="deposit" value={params.get("deposit") ?? undefined} anyLabel="Any" options={DEPOSIT_FILTERS.map((d) => ({ value: d, label: DEPOSIT_FILTER_LABELS[d] }))} />
        )}
      </ListSearch>
      {error && <p className="text-sm text-bad">{error.message} Showing the last list loaded.</p>}
      <ListTable rows={current.rows} columns={columns} total={current.total} page={current.query.page} size={current.query.size} sort={current.query.sort} dir={current.query.dir} empty="No orders match." />
    </div>
  );
}
