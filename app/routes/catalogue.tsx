import { Link, useSearchParams } from "react-router";
import type { Route } from "./+types/catalogue";
import { hasPermission, requirePermission } from "~/auth.server";
import { FormAlert } from "~/components/forms";
import { ListFilter, ListSearch, ListTable, type Column } from "~/components/list-table";
import { PageHeader } from "~/components/page-header";
import { parseListQuery } from "~/lib/listing";
import { formatMoney } from "~/lib/money";
import { listProducts, materialOptions, PRODUCT_SORTS } from "~/models/catalogue.server";
import { getShop } from "~/models/shops.server";

export async function loader(args: Route.LoaderArgs) {
  const user = requirePermission(args, "catalogue:read");
  const [shop, materials] = await Promise.all([getShop(user.shopId), materialOptions(user.shopId)]);
  const query = parseListQuery(new URL(args.request.url).searchParams, {
    sorts: PRODUCT_SORTS,
    defaultSort: "name",
    filters: { material: materials.map((m) => m.id), show: ["retired", "all"] },
  });
  const { rows, total } = await listProducts(user.shopId, query);
  return { rows, total, query, materials, currency: shop.currency, canWrite: hasPermission(user.role, "catalogue:write") };
}

type Row = Awaited<ReturnType<typeof loader>>["rows"][number];

export default function Catalogue({ loaderData }: Route.ComponentProps) {
  const { rows, total, query, materials, currency, canWrite } = loaderData;
  const [params] = useSearchParams();
  const deleted = params.get("deleted");
  const columns: Column<Row>[] = [
    {
      key: "name",
      label: "Product",
      sortable: true,
      cell: (r) => (
        <span className="flex flex-wrap items-center gap-2">
          <Link to={`/catalogue/products/${r.id}`} className="font-medium text-ink underline-offset-2 hover:text-edge hover:underline">
            {r.name}
          </Link>
          {r.retiredAt && <span className="rounded-full bg-line/60 px-2 py-0.5 text-xs font-semibold">Retired</span>}
        </span>
      ),
    },
    { key: "materials", label: "Materials", cell: (r) => r.materials ?? <span className="text-muted">none</span> },
    { key: "parts", label: "Parts", sortable: true, align: "right", cell: (r) => r.parts },
    { key: "leadTime", label: "Lead time", sortable: true, align: "right", cell: (r) => (r.leadTimeDays === null ? <span className="text-muted">—</span> : `${r.leadTimeDays} days`) },
    { key: "price", label: "Price", sortable: true, align: "right", cell: (r) => formatMoney(r.priceMinor, currency) },
  ];
  return (
    <div className="space-y-6">
      <PageHeader eyebrow="Owner" title="Catalogue">
        What the shop sells, each product a bill of parts cut from the shop's materials.
      </PageHeader>
      {deleted && <FormAlert tone="ok">{deleted.slice(0, 200)} was deleted.</FormAlert>}
      <div className="flex flex-wrap gap-3">
        {canWrite && (
          <Link to="/catalogue/products/new" className="inline-flex min-h-11 items-center rounded-md bg-edge px-5 font-semibold text-white hover:bg-edge-dark">
            New product
          </Link>
        )}
        <Link to="/catalogue/materials" className="inline-flex min-h-11 items-center rounded-md border border-line bg-white px-5 font-medium hover:border-edge">
          Materials and stock panels
        </Link>
      </div>
      <ListSearch label="Search products" placeholder="Name, e.g. table number">
        <ListFilter label="Material" name="material" value={query.filters.material} anyLabel="Any material" options={materials.map((m) => ({ value: m.id, label: m.name }))} />
        <ListFilter label="Show" name="show" value={query.filters.show} anyLabel="Offered products" options={[{ value: "retired", label: "Retired products" }, { value: "all", label: "All products" }]} />
      </ListSearch>
      <ListTable
        rows={rows}
        columns={columns}
        total={total}
        page={query.page}
        size={query.size}
        sort={query.sort}
        dir={query.dir}
        empty={query.q || query.filters.material || query.filters.show ? "No product matches." : "No products yet."}
      />
    </div>
  );
}
