// The shop's month at a glance: the day each order must leave the shop and the day of its event.
// Weeks run Monday to Sunday; dates are ISO days (see dates.ts). Pure.
import { addDays } from "./dates";
import type { OrderHeading, OrderStatus } from "./order-status";

const MONTH = /^(\d{4})-(0[1-9]|1[0-2])$/;

/** The month asked for ("2027-01"), or today's month when the address has none or a wrong one. */
export function parseMonth(value: string | null, todayIso: string): string {
  const match = value ? MONTH.exec(value) : null;
  if (match && +match[1] >= 2000 && +match[1] <= 2100) return value!;
  return todayIso.slice(0, 7);
}

export function shiftMonth(month: string, by: number): string {
  const [y, m] = month.split("-").map(Number);
  const d = new Date(Date.UTC(y, m - 1 + by, 1));
  return d.toISOString().slice(0, 7);
}

/** The weeks that hold the month, Monday first, each of seven ISO days (the first and last spill into the months beside it). */
export function monthWeeks(month: string): string[][] {
  const first = `${month}-01`;
  const weekday = (new Date(`${first}T00:00:00Z`).getUTCDay() + 6) % 7; // Monday 0 … Sunday 6
  const last = addDays(`${shiftMonth(month, 1)}-01`, -1);
  const weeks: string[][] = [];
  for (let start = addDays(first, -weekday); start <= last; start = addDays(start, 7)) {
    weeks.push(Array.from({ length: 7 }, (_, i) => addDays(start, i)));
  }
  return weeks;
}

export interface DayEntry {
  /** due: the day it must leave the shop; event: the customer's day */
  kind: "due" | "event";
  order: OrderHeading;
  /** due, not yet ready or handed over, and the day is past */
  late: boolean;
}

const DONE: OrderStatus[] = ["ready", "delivered"];

/** What falls on each day, by ISO day: dues first, then events, each by order number. Cancelled orders are left out. */
export function entriesByDay(orders: OrderHeading[], todayIso: string): Record<string, DayEntry[]> {
  const days: Record<string, DayEntry[]> = {};
  const add = (day: string, entry: DayEntry) => (days[day] ??= []).push(entry);
  const shown = orders.filter((o) => o.status !== "cancelled").sort((a, b) => a.number - b.number);
  for (const order of shown) add(order.dueDate, { kind: "due", order, late: order.dueDate < todayIso && !DONE.includes(order.status) });
  for (const order of shown) add(order.eventDate, { kind: "event", order, late: false });
  return days;
}
