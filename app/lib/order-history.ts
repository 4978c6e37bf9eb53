// An order's history: what was done to it, in words a shop reads back when a customer asks
// "did you change the date?" or "when did the e-mail go?". Pure: the rows come from order_events.
import { formatDate } from "./dates";
import { formatMoney } from "./money";
import { countOf } from "./plural";
import { STATUS_LABELS, type OrderStatus } from "./order-status";

export type HeaderField = "customer" | "eventDate" | "dueDate" | "notes";
export interface HeaderChange {
  field: HeaderField;
  from: string;
  to: string;
}

/** One thing done to an order, as stored, with the particulars as they were then (names, e-mail addresses). */
export type StoredOrderEvent =
  | { kind: "created"; lines: number; repeatOf?: number; leftOut?: string[] }
  | { kind: "header"; changes: HeaderChange[] }
  | { kind: "line_added"; product: string; quantity: number }
  | { kind: "line_removed"; product: string; quantity: number }
  | { kind: "texts"; product: string; count: number }
  | { kind: "status"; from: OrderStatus; to: OrderStatus }
  | { kind: "confirmation_sent"; to: string }
  | { kind: "confirmation_failed"; error: string }
  | { kind: "ready_notice"; to: string };

/** Told from the deposit's own records, not stored as history (see orderHistory). */
export type DepositEvent = { kind: "deposit_asked" | "deposit_paid" | "deposit_refunded"; amountMinor: number; currency: string };

export type OrderEvent = StoredOrderEvent | DepositEvent;
export type StoredKind = StoredOrderEvent["kind"];

/** The header as the history compares it: the customer by name, dates as ISO days. */
export interface HeaderValues {
  customer: string;
  eventDate: string;
  dueDate: string;
  notes: string;
}

/** What an edit of the header changed, field by field; empty when it changed nothing. */
export function headerChanges(before: HeaderValues, after: HeaderValues): HeaderChange[] {
  const fields: HeaderField[] = ["customer", "eventDate", "dueDate", "notes"];
  return fields.filter((f) => before[f] !== after[f]).map((field) => ({ field, from: before[field], to: after[field] }));
}

/** The kind and particulars of a stored event; the particulars are stored without the kind. */
export function splitEvent(event: StoredOrderEvent): { kind: StoredKind; detail: Record<string, unknown> } {
  const { kind, ...detail } = event;
  return { kind, detail };
}

const MOVED: Record<OrderStatus, string> = {
  draft: "Back to draft",
  confirmed: "Confirmed the order",
  in_production: "Started production",
  ready: "Marked it ready",
  delivered: "Marked it delivered",
  cancelled: "Cancelled the order",
};

const FIELD_NAMES: Record<HeaderField, string> = { customer: "the customer", eventDate: "the event date", dueDate: "the due date", notes: "the notes" };

function shown(field: HeaderField, value: string): string {
  if (field === "eventDate" || field === "dueDate") return formatDate(value);
  if (field === "notes") return value === "" ? "none" : `“${value.length > 60 ? `${value.slice(0, 59)}…` : value}”`;
  return value;
}

/** One line of the history, for people. */
export function describeOrderEvent(event: OrderEvent): string {
  switch (event.kind) {
    case "created": {
      const taken = event.lines === 0 ? "Took the order, with no lines yet" : `Took the order, with ${countOf(event.lines, "line")}`;
      if (event.repeatOf === undefined) return taken;
      const leftOut = event.leftOut?.length ? `; left out ${event.leftOut.join(", ")}, no longer offered` : "";
      return `${taken}, repeating #${event.repeatOf}${leftOut}`;
    }
    case "header":
      if (event.changes.length === 0) return "Saved the order's details unchanged";
      return `Changed ${event.changes.map((c) => `${FIELD_NAMES[c.field]} from ${shown(c.field, c.from)} to ${shown(c.field, c.to)}`).join("; ")}`;
    case "line_added":
      return `Added ${event.quantity} × ${event.product}`;
    case "line_removed":
      return `Removed ${event.quantity} × ${event.product}`;
    case "texts":
      return `Corrected the texts of ${event.product} (${countOf(event.count, "text")})`;
    case "status":
      return event.to === "cancelled" ? `Cancelled the order, which was ${STATUS_LABELS[event.from].toLowerCase()}` : MOVED[event.to];
    case "confirmation_sent":
      return `The confirmation was e-mailed to ${event.to}`;
    case "confirmation_failed":
      return `The confirmation e-mail did not go: ${event.error}`;
    case "ready_notice":
      return `The customer was e-mailed that it is ready, at ${event.to}`;
    case "deposit_asked":
      return `Asked a deposit of ${formatMoney(event.amountMinor, event.currency)}`;
    case "deposit_paid":
      return `The customer paid ${formatMoney(event.amountMinor, event.currency)} of the deposit`;
    case "deposit_refunded":
      return `Refunded ${formatMoney(event.amountMinor, event.currency)} of the deposit`;
  }
}

/** A stored row back as an event; a kind this version does not know (or bad particulars) reads as null. */
export function readOrderEvent(kind: string, detail: unknown): StoredOrderEvent | null {
  if (typeof detail !== "object" || detail === null) return null;
  const d = detail as Record<string, unknown>;
  const str = (k: string) => typeof d[k] === "string";
  const num = (k: string) => typeof d[k] === "number";
  const ok: Record<StoredKind, () => boolean> = {
    created: () => num("lines") && (d.repeatOf === undefined || num("repeatOf")) && (d.leftOut === undefined || (Array.isArray(d.leftOut) && d.leftOut.every((x) => typeof x === "string"))),
    header: () => Array.isArray(d.changes) && d.changes.every((c) => typeof c === "object" && c !== null && c.field in FIELD_NAMES && typeof c.from === "string" && typeof c.to === "string"),
    line_added: () => str("product") && num("quantity"),
    line_removed: () => str("product") && num("quantity"),
    texts: () => str("product") && num("count"),
    status: () => str("from") && str("to") && (d.from as string) in STATUS_LABELS && (d.to as string) in STATUS_LABELS,
    confirmation_sent: () => str("to"),
    confirmation_failed: () => str("error"),
    ready_notice: () => str("to"),
  };
  if (!(kind in ok) || !ok[kind as StoredKind]()) return null;
  return { kind, ...d } as StoredOrderEvent;
}
