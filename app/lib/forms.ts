import * as v from "valibot";

export type FieldErrors = Record<string, string>;

/** Validates a form's fields with a valibot schema; the first message per field, keyed by field name. */
export function parseForm<TSchema extends v.GenericSchema>(
  schema: TSchema,
  form: FormData | Record<string, unknown>,
): { ok: true; data: v.InferOutput<TSchema> } | { ok: false; errors: FieldErrors } {
  const input = form instanceof FormData ? Object.fromEntries([...form.keys()].map((k) => [k, form.get(k)])) : form;
  const result = v.safeParse(schema, input);
  if (result.success) return { ok: true, data: result.output };
  const errors: FieldErrors = {};
  for (const issue of result.issues) {
    const key = issue.path?.map((p) => String(p.key)).join(".") || "form";
    errors[key] ??= issue.message;
  }
  return { ok: false, errors };
}
