import { Form } from "react-router";
import { Field, SubmitButton } from "./forms";

export type CustomerValues = { name: string; email: string; phone: string; notes: string };

export function CustomerForm({ values, errors, submitLabel }: { values?: Partial<CustomerValues>; errors: Record<string, string>; submitLabel: string }) {
  return (
    <Form method="post" className="max-w-xl space-y-4" noValidate>
      <Field label="Name" name="name" required defaultValue={values?.name} error={errors.name} />
      <Field label="E-mail" name="email" type="email" defaultValue={values?.email} error={errors.email} hint="Confirmations go here." />
      <Field label="Phone" name="phone" type="tel" defaultValue={values?.phone} error={errors.phone} />
      <div className="space-y-1">
        <label htmlFor="field-notes" className="block text-sm font-medium">
          Notes
        </label>
        <textarea id="field-notes" name="notes" rows={4} defaultValue={values?.notes} className="block w-full rounded-md border border-line bg-white px-3 py-2.5" aria-invalid={errors.notes ? true : undefined} />
        {errors.notes && <p className="text-sm font-medium text-bad">{errors.notes}</p>}
      </div>
      <SubmitButton>{submitLabel}</SubmitButton>
    </Form>
  );
}
