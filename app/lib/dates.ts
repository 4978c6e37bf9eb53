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

// Formatters per time zone and style, made once: Intl formatters are slow to build.
const formatters = new Map<string, Intl.DateTimeFormat>();
function formatter(timeZone: string, style: "iso" | "stamp" | "day" | "moment"): Intl.DateTimeFormat {
  const key = `${style} ${timeZone}`;
  let f = formatters.get(key);
  if (!f) {
    const options: Record<typeof style, Intl.DateTimeFormatOptions> = {
      iso: { year: "numeric", month: "2-digit", day: "2-digit" },
      stamp: { year: "numeric", month: "2-digit", day: "2-digit", hour: "2-digit", minute: "2-digit", second: "2-digit", hourCycle: "h23" },
      day: { day: "numeric", month: "short", year: "numeric" },
      moment: { day: "numeric", month: "short", year: "numeric", hour: "2-digit", minute: "2-digit", hourCycle: "h23", timeZoneName: "short" },
    };
    f = new Intl.DateTimeFormat(style === "iso" || style === "stamp" ? "en-CA" : "en-GB", { ...options[style], timeZone });
    formatters.set(key, f);
  }
  return f;
}

/** Today's date where the shop is (its time zone; UTC unless set): a US shop's evening is still today. */
export function todayIso(now = new Date(), timeZone = "UTC"): string {
  return timeZone === "UTC" ? now.toISOString().slice(0, 10) : formatter(timeZone, "iso").format(now);
}

/** An instant as the shop's wall clock reads it, "2026-12-02T17:20:05" (sorts as text; no zone): for counting days and months where the shop is. */
export function localStamp(date: Date, timeZone = "UTC"): string {
  return timeZone === "UTC" ? date.toISOString().slice(0, 19) : formatter(timeZone, "stamp").format(date).replace(", ", "T");
}

/** Whether a time zone name is one this server knows (IANA names, such as "Europe/London"). */
export function isTimeZone(value: string): boolean {
  if (value === "UTC") return true;
  try {
    new Intl.DateTimeFormat("en-GB", { timeZone: value });
    return /^[A-Za-z_]+(\/[A-Za-z0-9_+-]+)+$/.test(value);
  } catch {
    return false;
  }
}

/** The time zones a shop can choose from, UTC first, then by name. */
export function timeZoneChoices(): string[] {
  return ["UTC", ...Intl.supportedValuesOf("timeZone").filter((z) => z !== "UTC" && isTimeZone(z))];
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

const MONTH_LONG = new Intl.DateTimeFormat("en-GB", { month: "long", year: "numeric", timeZone: "UTC" });
const MONTH_SHORT = new Intl.DateTimeFormat("en-GB", { month: "short", year: "numeric", timeZone: "UTC" });

/** "January 2027" (or "Jan 2027" for tables) from "2027-01". */
export function monthTitle(month: string, length: "long" | "short" = "long"): string {
  return (length === "long" ? MONTH_LONG : MONTH_SHORT).format(new Date(`${month}-01T00:00:00Z`));
}

/** "2 Dec 2026": the day of an instant given as an ISO timestamp, such as when a deposit was paid, where the shop is. */
export function formatDay(isoTimestamp: string, timeZone = "UTC"): string {
  return formatter(timeZone, "day").format(new Date(isoTimestamp));
}

/** "2 Dec 2026, 14:05 GMT": an instant to the minute where the shop is, with its zone's short name. */
export function formatMoment(isoTimestamp: string, timeZone = "UTC"): string {
  return formatter(timeZone, "moment").format(new Date(isoTimestamp));
}

/** Default due date: the longest lead time of the ordered products before the event (14 days when none says). */
export function defaultDueDate(eventDate: string, leadTimesDays: (number | null)[]): string {
  const known = leadTimesDays.filter((d): d is number => d !== null);
  return addDays(eventDate, -(known.length ? Math.max(...known) : 14));
}
