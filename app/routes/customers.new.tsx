import { data, redirect } from "react-router";
import type { Route } from "./+types/customers.new";
import { requirePermission } from "~/auth.server";
import { CustomerForm } from "~/components/customer-form";
import { PageHeader } from "~/components/page-header";
import { CustomerSchema } from "~/lib/customer-schema";
import { parseForm } from "~/lib/forms";
import { createCustomer } from "~/models/customers.server";

export function loader(args: Route.LoaderArgs) {
  requirePermission(args, "customers:write");
  return null;
}

export async function action(args: Route.ActionArgs) {
  const user = requirePermission(args, "customers:write");
  const form = await args.request.formData();
  const parsed = parseForm(CustomerSchema, form);
  if (!parsed.ok) return data({ errors: parsed.errors, values: Object.fromEntries(form) as Record<string, string> }, { status: 400 });
  const id = await createCustomer(user.shopId, parsed.data);
  return redirect(`/customers/${id}`);
}

export default function NewCustomer({ actionData }: Route.ComponentProps) {
  return (
    <div className="space-y-6">
      <PageHeader eyebrow="Owner" title="New customer" />
      <CustomerForm values={actionData?.values} errors={actionData?.errors ?? {}} submitLabel="Save customer" />
    </div>
  );
}
