import * as v from "valibot";

const optionalText = (max: number, label: string) => v.pipe(v.optional(v.string(), ""), v.trim(), v.maxLength(max, `${label}: at most ${max} characters.`));

export const CustomerSchema = v.object({
  name: v.pipe(v.string("Enter the customer's name."), v.trim(), v.nonEmpty("Enter the customer's name."), v.maxLength(160, "Use at most 160 characters.")),
  email: v.pipe(
    v.optional(v.string(), ""),
    v.trim(),
    v.maxLength(254, "This e-mail address is too long."),
    v.check((e) => e === "" || /^[^\s@]+@[^\s@]+\.[^\s@]+$/.test(e), "Enter a valid e-mail address, like name@example.com, or leave it empty."),
  ),
  phone: v.pipe(optionalText(40, "Phone"), v.check((p) => p === "" || /^[+()\d\s./-]{3,}$/.test(p), "Use digits, spaces and + ( ) - only.")),
  notes: optionalText(4000, "Notes"),
});

/** How a customer reads in the order form's picker, and what the picker's text field posts back. */
export function customerLabel(customer: { name: string; email: string }): string {
  return customer.email ? `${customer.name} (${customer.email})` : customer.name;
}

export const CUSTOMER_SUGGESTIONS = 20;

/** The picker's search: ?q= part of a name or e-mail address (may be empty: the first customers by name). */
export const CustomerSearchSchema = v.object({
  q: v.pipe(v.optional(v.string(), ""), v.trim(), v.maxLength(160, "Search with at most 160 characters."), v.check((q) => !q.includes("\u0000"), "Search without control characters.")),
});
