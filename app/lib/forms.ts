import * as v from "valibot";

export type FieldErrors = Record<string, string>;

/**
 * Validates a form's fields with a valibot schema; the first message per field, keyed by field name.
 * The intent and the `hiddenFields` (ids in hidden inputs, a button's value) are nowhere a person
 * sees a message or can fix the value, so a problem with one of them is also told in `form`, the
 * alert at the top of the page.
 */
export function parseForm<TSchema extends v.GenericSchema>(
  schema: TSchema,
  form: FormData | Record<string, unknown>,
  hiddenFields: string[] = [],
): { ok: true; data: v.InferOutput<TSchema> } | { ok: false; errors: FieldErrors } {
  const input = form instanceof FormData ? Object.fromEntries([...form.keys()].map((k) => [k, form.get(k)])) : form;
  const result = v.safeParse(schema, input);
  if (result.success) return { ok: true, data: result.output };
  const errors: FieldErrors = {};
  for (const issue of result.issues) {
    const key = issue.path?.map((p) => String(p.key)).join(".") || "form";
    errors[key] ??= issue.message;
    if (key === "intent" || hiddenFields.includes(key)) errors.form ??= `This form could not be read (${key}: ${issue.message}). Reload the page and try again.`;
  }
  return { ok: false, errors };
}
