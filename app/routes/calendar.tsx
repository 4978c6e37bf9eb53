import { Link } from "react-router";
import type { Route } from "./+types/calendar";
import { requirePermission } from "~/auth.server";
import { PageHeader } from "~/components/page-header";
import { entriesByDay, monthWeeks, parseMonth, shiftMonth, type DayEntry } from "~/lib/calendar";
import { formatDate, monthTitle, todayIso } from "~/lib/dates";
import { calendarOrders } from "~/models/calendar.server";
import { getShop } from "~/models/shops.server";
import { timed } from "~/timing.server";

export async function loader(args: Route.LoaderArgs) {
  const user = requirePermission(args, "orders:read");
  const today = todayIso(new Date(), (await getShop(user.shopId)).timeZone);
  const month = parseMonth(new URL(args.request.url).searchParams.get("month"), today);
  const weeks = monthWeeks(month);
  const orders = await timed("queries", () => calendarOrders(user.shopId, weeks[0][0], weeks[weeks.length - 1][6]));
  return { month, today, weeks, days: entriesByDay(orders, today) };
}

const WEEKDAYS = ["Mon", "Tue", "Wed", "Thu", "Fri", "Sat", "Sun"];

export default function Calendar({ loaderData }: Route.ComponentProps) {
  const { month, today, weeks, days } = loaderData;
  const inMonth = (day: string) => day.startsWith(month);
  const listed = weeks.flat().filter((day) => inMonth(day) && days[day]?.length);
  return (
    <div className="space-y-6">
      <PageHeader eyebrow="Owner" title="Calendar">
        When each order must leave the shop, and the day of its event.
      </PageHeader>
      <nav className="flex flex-wrap items-center gap-3" aria-label="Months">
        <Link to={`?month=${shiftMonth(month, -1)}`} className="min-h-11 rounded-md border border-line bg-white px-4 py-2.5 font-medium hover:border-edge">
          ← {monthTitle(shiftMonth(month, -1))}
        </Link>
        <h2 className="order-first w-full text-xl font-semibold md:order-none md:w-auto md:min-w-44 md:text-center">{monthTitle(month)}</h2>
        <Link to={`?month=${shiftMonth(month, 1)}`} className="min-h-11 rounded-md border border-line bg-white px-4 py-2.5 font-medium hover:border-edge">
          {monthTitle(shiftMonth(month, 1))} →
        </Link>
        {!today.startsWith(month) && (
          <Link to="?" className="text-edge underline">
            This month
          </Link>
        )}
      </nav>

      {/* Tablet and desktop: the month as a grid. */}
      <table className="hidden w-full table-fixed border-collapse md:table">
        <thead>
          <tr>
            {WEEKDAYS.map((d) => (
              <th key={d} scope="col" className="pb-2 text-left text-sm font-semibold uppercase tracking-wider text-muted">
                {d}
              </th>
            ))}
          </tr>
        </thead>
        <tbody>
          {weeks.map((week) => (
            <tr key={week[0]}>
              {week.map((day) => (
                <td key={day} className={`h-28 border border-line p-1.5 align-top ${inMonth(day) ? "bg-card" : "bg-paper text-muted"} ${day === today ? "ring-2 ring-inset ring-edge" : ""}`}>
                  <p className={`text-sm ${day === today ? "font-bold text-edge" : "font-medium"}`}>
                    {Number(day.slice(8))}
                    {day === today && <span className="sr-only"> (today)</span>}
                  </p>
                  <ul className="mt-1 space-y-1">
                    {(days[day] ?? []).map((entry) => (
                      <li key={`${entry.kind}-${entry.order.id}`}>
                        <EntryLink entry={entry} compact />
                      </li>
                    ))}
                  </ul>
                </td>
              ))}
            </tr>
          ))}
        </tbody>
      </table>

      {/* Phone: only the days with something on them, as a list. */}
      <div className="md:hidden">
        {listed.length === 0 ? (
          <p className="text-muted">Nothing is due and no event falls in {monthTitle(month)}.</p>
        ) : (
          <ol className="space-y-3">
            {listed.map((day) => (
              <li key={day} className={`rounded-lg border bg-card p-3 ${day === today ? "border-edge" : "border-line"}`}>
                <h3 className="font-semibold">
                  {formatDate(day)}
                  {day === today && <span className="text-edge"> · today</span>}
                </h3>
                <ul className="mt-2 space-y-1.5">
                  {days[day].map((entry) => (
                    <li key={`${entry.kind}-${entry.order.id}`}>
                      <EntryLink entry={entry} />
                    </li>
                  ))}
                </ul>
              </li>
            ))}
          </ol>
        )}
      </div>
      <p className="text-sm text-muted">
        <span className="mr-1 inline-block size-2.5 rounded-full bg-warn" aria-hidden /> due to leave the shop ·{" "}
        <span className="mx-1 inline-block size-2.5 rounded-full bg-ok" aria-hidden /> the customer's event · cancelled orders are not shown.
      </p>
    </div>
  );
}

function EntryLink({ entry, compact = false }: { entry: DayEntry; compact?: boolean }) {
  const { order } = entry;
  const what = entry.kind === "due" ? (entry.late ? "Late" : "Due") : "Event";
  const tone = entry.kind === "due" ? (entry.late ? "border-bad/40 bg-bad-soft text-bad" : "border-warn/30 bg-warn-soft text-ink") : "border-ok/30 bg-ok-soft text-ink";
  return (
    <Link to={`/orders/${order.id}`} className={`block rounded border px-1.5 py-0.5 text-sm leading-snug hover:border-edge ${tone}`} title={`${what}: order #${order.number}, ${order.customer}`}>
      {compact ? (
        // a narrow day cell: what and which order on one line, the customer cut short beneath
        <>
          <span className="block whitespace-nowrap font-semibold">
            {what} #{order.number}
          </span>
          <span className="block truncate">{order.customer}</span>
        </>
      ) : (
        <>
          <span className="font-semibold">{what}</span> #{order.number} {order.customer}
        </>
      )}
    </Link>
  );
}
