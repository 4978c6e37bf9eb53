// Calendar dates (event and due dates) are ISO "YYYY-MM-DD" strings: no time of day, no time zone.

const ISO_DATE = /^(\d{4})-(\d{2})-(\d{2})$/;

export function isIsoDate(value: string): boolean {
  const match = ISO_DATE.exec(value);
  if (!match) return false;
  const date = new Date(Date.UTC(+match[1], +match[2] - 1, +match[3]));
  return date.toISOString().slice(0, 10) === value;
}

export function addDays(isoDate: string, days: number): string {
  const date = new Date(`${isoDate}T00:00:00Z`);
  date.setUTCDate(date.getUTCDate() + days);
  return date.toISOString().slice(0, 10);
}

export function todayIso(now = new Date()): string {
  return now.toISOString().slice(0, 10);
}

const LONG = new Intl.DateTimeFormat("en-GB", { weekday: "short", day: "numeric", month: "short", year: "numeric", timeZone: "UTC" });

// Lists show the same few dates over and over; a small memo spares the formatter (bounded: cleared when full).
const formatted = new Map<string, string>();

/** "Sat 16 Jan 2027" */
export function formatDate(isoDate: string): string {
  let text = formatted.get(isoDate);
  if (text === undefined) {
    text = LONG.format(new Date(`${isoDate}T00:00:00Z`));
    if (formatted.size >= 2000) formatted.clear();
    formatted.set(isoDate, text);
  }
  return text;
}

const DAY = new Intl.DateTimeFormat("en-GB", { day: "numeric", month: "short", year: "numeric", timeZone: "UTC" });

/** "2 Dec 2026": the (UTC) day of an instant given as an ISO timestamp, such as when a deposit was paid. */
export function formatDay(isoTimestamp: string): string {
  return DAY.format(new Date(isoTimestamp));
}

const MOMENT = new Intl.DateTimeFormat("en-GB", { day: "numeric", month: "short", year: "numeric", hour: "2-digit", minute: "2-digit", hourCycle: "h23", timeZone: "UTC" });

/** "2 Dec 2026, 14:05 UTC": an instant to the minute, for histories. */
export function formatMoment(isoTimestamp: string): string {
  return `${MOMENT.format(new Date(isoTimestamp))} UTC`;
}

/** Default due date: the longest lead time of the ordered products before the event (14 days when none says). */
export function defaultDueDate(eventDate: string, leadTimesDays: (number | null)[]): string {
  const known = leadTimesDays.filter((d): d is number => d !== null);
  return addDays(eventDate, -(known.length ? Math.max(...known) : 14));
}
