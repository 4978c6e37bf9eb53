import { Link } from "react-router";
import type { AgendaEntry } from "~/lib/agenda";

/** The home page's list of what is waiting on the shop; urgent entries (overdue, a sled to check) stand out. */
export function AgendaList({ entries }: { entries: AgendaEntry[] }) {
  if (entries.length === 0) return <p className="rounded-lg border border-line bg-card p-4 text-muted">Nothing is waiting just now.</p>;
  return (
    <ul className="grid gap-3 md:grid-cols-2">
      {entries.map((entry) => (
        <li key={entry.key} className={`rounded-lg border bg-card p-4 ${entry.urgent ? "border-warn border-l-4" : "border-line"}`}>
          <Link to={entry.href} className="font-semibold text-edge hover:underline">
            {entry.title}
          </Link>
          {entry.lines.length > 0 && (
            <ul className="mt-2 space-y-1 text-sm">
              {entry.lines.map((line, i) => (
                <li key={i} className="flex flex-wrap items-baseline gap-x-2">
                  {line.href ? (
                    <Link to={line.href} className="hover:underline">
                      {line.text}
                    </Link>
                  ) : (
                    <span className="text-muted">{line.text}</span>
                  )}
                  {line.flag && <span className="rounded bg-warn-soft px-1.5 text-xs font-semibold text-warn">{line.flag}</span>}
                </li>
              ))}
            </ul>
          )}
        </li>
      ))}
    </ul>
  );
}
