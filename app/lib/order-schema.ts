import * as v from "valibot";
import { isIsoDate } from "./dates";

export const IsoDate = (label: string) => v.pipe(v.string(`Enter the ${label}.`), v.trim(), v.nonEmpty(`Enter the ${label}.`), v.check(isIsoDate, `Enter the ${label} as a date, like 2027-01-16.`));

export const OrderHeaderSchema = v.pipe(
  v.object({
    customerId: v.pipe(v.string("Choose a customer."), v.nonEmpty("Choose a customer."), v.uuid("Choose a customer from the list.")),
    eventDate: IsoDate("event date"),
    dueDate: v.pipe(v.optional(v.string(), ""), v.trim(), v.check((d) => d === "" || isIsoDate(d), "Enter the due date as a date, like 2027-01-02, or leave it empty.")),
    notes: v.pipe(v.optional(v.string(), ""), v.trim(), v.maxLength(4000, "Notes: at most 4,000 characters.")),
  }),
  v.forward(
    v.check((o) => o.dueDate === "" || o.dueDate <= o.eventDate, "The due date is after the event; it must be on or before it."),
    ["dueDate"],
  ),
);
