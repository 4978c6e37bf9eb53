import * as v from "valibot";
import { data, Link, redirect } from "react-router";
import type { Route } from "./+types/customers.$customerId";
import { requirePermission } from "~/auth.server";
import { CustomerForm } from "~/components/customer-form";
import { FormAlert } from "~/components/forms";
import { PageHeader } from "~/components/page-header";
import { StatusBadge } from "~/components/status-badge";
import { CustomerSchema } from "~/lib/customer-schema";
import { formatDate } from "~/lib/dates";
import { parseForm } from "~/lib/forms";
import { formatMoney } from "~/lib/money";
import { can } from "~/lib/permissions";
import { getCustomer, updateCustomer } from "~/models/customers.server";
import { ordersOfCustomer } from "~/models/orders.server";
import { getShop } from "~/models/shops.server";

const Uuid = v.pipe(v.string(), v.uuid());

export async function loader(args: Route.LoaderArgs) {
  const user = requirePermission(args, "customers:read");
  const customer = v.is(Uuid, args.params.customerId) ? await getCustomer(user.shopId, args.params.customerId) : null;
  if (!customer) throw data("No such customer in this shop.", { status: 404 });
  const [orders, shop] = await Promise.all([ordersOfCustomer(user.shopId, customer.id), getShop(user.shopId)]);
  return { customer, orders: orders.map((o) => ({ ...o, totalMinor: Number(o.totalMinor) })), currency: shop.currency, canWrite: can(user.role, "customers:write"), canOrder: can(user.role, "orders:write") };
}

export async function action(args: Route.ActionArgs) {
  const user = requirePermission(args, "customers:write");
  const form = await args.request.formData();
  const parsed = parseForm(CustomerSchema, form);
  if (!parsed.ok) return data({ errors: parsed.errors, values: Object.fromEntries(form) as Record<string, string>, saved: false }, { status: 400 });
  const found = v.is(Uuid, args.params.customerId) && (await updateCustomer(user.shopId, args.params.customerId, parsed.data));
  if (!found) throw data("No such customer in this shop.", { status: 404 });
  return redirect(`/customers/${args.params.customerId}?saved=1`);
}

export default function CustomerPage({ loaderData, actionData }: Route.ComponentProps) {
  const { customer, orders, currency, canWrite, canOrder } = loaderData;
  return (
    <div className="space-y-8">
      <div className="flex flex-wrap items-end justify-between gap-4">
        <PageHeader eyebrow="Customer" title={customer.name}>
          {[customer.email, customer.phone].filter(Boolean).join(" · ") || "No contact details yet."}
        </PageHeader>
        {canOrder && (
          <Link to={`/orders/new?customer=${customer.id}`} className="rounded-md bg-edge px-4 py-2.5 font-semibold text-white hover:bg-edge-dark">
            New order for {customer.name}
          </Link>
        )}
      </div>
      <section className="space-y-3">
        <h2 className="text-xl font-semibold">Orders</h2>
        {orders.length === 0 ? (
          <p className="text-muted">No orders yet.</p>
        ) : (
          <ul className="divide-y divide-line rounded-lg border border-line bg-card">
            {orders.map((o) => (
              <li key={o.id} className="flex flex-wrap items-center justify-between gap-3 px-4 py-3">
                <Link to={`/orders/${o.id}`} className="font-semibold text-edge hover:underline">
                  #{o.number}
                </Link>
                <span className="text-muted">{formatDate(o.eventDate)}</span>
                <StatusBadge status={o.status} />
                <span className="tabular-nums">{formatMoney(o.totalMinor, currency)}</span>
              </li>
            ))}
          </ul>
        )}
      </section>
      {canWrite && (
        <section className="space-y-3">
          <h2 className="text-xl font-semibold">Details</h2>
          {actionData?.errors && <FormAlert>Some fields need another look.</FormAlert>}
          <CustomerForm values={actionData?.values ?? customer} errors={actionData?.errors ?? {}} submitLabel="Save changes" />
        </section>
      )}
    </div>
  );
}
