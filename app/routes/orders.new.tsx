import { useState } from "react";
import { data, Form, Link, redirect } from "react-router";
import type { Route } from "./+types/orders.new";
import { requirePermission } from "~/auth.server";
import { CustomerPicker } from "~/components/customer-picker";
import { Field, FormAlert, SubmitButton } from "~/components/forms";
import { OrderLineFields } from "~/components/order-line-fields";
import { PageHeader } from "~/components/page-header";
import { defaultDueDate } from "~/lib/dates";
import { parseForm } from "~/lib/forms";
import { checkLines, rawLinesFrom } from "~/lib/order-lines";
import { OrderHeaderSchema } from "~/lib/order-schema";
import { chooseCustomer, getCustomer, hasCustomers, searchCustomers } from "~/models/customers.server";
import { readOrderForm, withStoredArtwork } from "~/models/order-input.server";
import { createOrder, OrderStateError, productChoices } from "~/models/orders.server";
import { getShop } from "~/models/shops.server";

export async function loader(args: Route.LoaderArgs) {
  const user = requirePermission(args, "orders:write");
  const named = new URL(args.request.url).searchParams.get("customer") ?? "";
  const [anyCustomer, suggestions, chosen, products, shop] = await Promise.all([
    hasCustomers(user.shopId),
    searchCustomers(user.shopId, ""),
    /^[0-9a-f-]{36}$/i.test(named) ? getCustomer(user.shopId, named) : null,
    productChoices(user.shopId),
    getShop(user.shopId),
  ]);
  return { anyCustomer, suggestions, chosen: chosen && { id: chosen.id, name: chosen.name, email: chosen.email }, products, currency: shop.currency };
}

export async function action(args: Route.ActionArgs) {
  const user = requirePermission(args, "orders:write");
  const { fields, entries } = await readOrderForm(args.request);
  const products = await productChoices(user.shopId);
  const customer = await chooseCustomer(user.shopId, fields.customerId, fields.customer);
  const header = parseForm(OrderHeaderSchema, { ...fields, customerId: customer.ok ? customer.id : "" });
  const lines = checkLines(rawLinesFrom(entries), new Set(products.map((p) => p.id)));
  const errors: Record<string, string> = { ...(header.ok ? {} : header.errors), ...(customer.ok ? {} : { customerId: customer.message }), ...(lines.ok ? {} : lines.errors) };
  if (lines.ok && lines.lines.length === 0) errors.lines = "Add at least one line: a product and its quantity.";
  const suggestions = customer.ok ? [] : customer.suggestions;
  if (!header.ok || !lines.ok || Object.keys(errors).length) return data({ errors, values: fields, suggestions }, { status: 400 });

  const leadTimes = lines.lines.map((l) => products.find((p) => p.id === l.productId)?.leadTimeDays ?? null);
  const dueDate = header.data.dueDate || defaultDueDate(header.data.eventDate, leadTimes);
  try {
    const order = await withStoredArtwork(lines.lines, (newLines) => createOrder(user.shopId, { ...header.data, dueDate }, newLines, { by: user.id }));
    return redirect(`/orders/${order.id}`);
  } catch (error) {
    if (error instanceof OrderStateError) return data({ errors: { form: error.message } as Record<string, string>, values: fields, suggestions }, { status: 400 });
    throw error;
  }
}

export default function NewOrder({ loaderData, actionData }: Route.ComponentProps) {
  const { anyCustomer, suggestions, chosen, products, currency } = loaderData;
  const errors: Record<string, string> = actionData?.errors ?? {};
  const values = actionData?.values;
  const submittedLines = values ? Math.max(1, ...Object.keys(values).map((k) => /^line-(\d+)-/.exec(k)).filter(Boolean).map((m) => Number(m![1]) + 1)) : 1;
  const [lines, setLines] = useState(() => Array.from({ length: submittedLines }, (_, i) => i));

  return (
    <div className="space-y-6">
      <PageHeader eyebrow="Owner" title="New order">
        Who it is for, when their event is, and what they ordered.
      </PageHeader>
      {Object.keys(errors).length > 0 && (
        <FormAlert>
          {errors.form ?? errors.lines ?? "Some fields need another look; they are marked below."} Files you chose must be chosen again.
        </FormAlert>
      )}
      {!anyCustomer ? (
        <FormAlert tone="warn">
          Add a customer first: <Link to="/customers/new" className="underline">new customer</Link>.
        </FormAlert>
      ) : (
        <Form method="post" encType="multipart/form-data" className="space-y-6" noValidate>
          <div className="grid gap-4 rounded-lg border border-line bg-card p-4 md:grid-cols-3">
            <CustomerPicker
              key={actionData ? JSON.stringify(values?.customer) : "loaded"}
              chosen={chosen}
              text={values?.customer}
              suggestions={actionData?.suggestions.length ? actionData.suggestions : suggestions}
              error={errors.customerId}
              className="md:col-span-3"
            />
            <Field label="Event date" name="eventDate" type="date" required defaultValue={values?.eventDate} error={errors.eventDate} />
            <Field label="Due date" name="dueDate" type="date" defaultValue={values?.dueDate} error={errors.dueDate} hint="Empty: the longest lead time of the products before the event." />
            <Field label="Notes" name="notes" defaultValue={values?.notes} error={errors.notes} />
          </div>
          {lines.map((i) => (
            <OrderLineFields key={i} index={i} products={products} currency={currency} errors={errors} values={values} onRemove={lines.length > 1 ? () => setLines(lines.filter((l) => l !== i)) : undefined} />
          ))}
          <div className="flex flex-wrap gap-3">
            <button type="button" onClick={() => setLines([...lines, Math.max(...lines) + 1])} className="min-h-11 rounded-md border border-line bg-white px-4 font-medium hover:border-edge">
              Add another line
            </button>
            <SubmitButton pendingText="Saving…">Save order</SubmitButton>
          </div>
        </Form>
      )}
    </div>
  );
}
