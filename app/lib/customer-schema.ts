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
