import type { ReactNode } from "react";
import { Form, useSearchParams } from "react-router";
import { useRouterClicks } from "./router-clicks";
import { listHref, pageCount } from "~/lib/listing";

export type Column<T> = { key: string; label: string; sortable?: boolean; align?: "right"; cell: (row: T) => ReactNode };

/**
 * A server-sorted, server-paged table: every control is a plain link or GET form, so it works before
 * scripts load; with scripts, the links go through the router (useRouterClicks). Cell styles sit on
 * the table, not on every cell.
 */
export function ListTable<T extends { id: string }>({ rows, columns, total, page, size, sort, dir, empty }: {
  rows: T[];
  columns: Column<T>[];
  total: number;
  page: number;
  size: number;
  sort: string;
  dir: "asc" | "desc";
  empty: ReactNode;
}) {
  const [params] = useSearchParams();
  const pages = pageCount(total, size);
  const routerClicks = useRouterClicks();
  return (
    <div className="space-y-3" onClick={routerClicks}>
      <div className="overflow-x-auto rounded-lg border border-line bg-card">
        <table className="w-full min-w-[40rem] text-left text-sm [&_td]:px-4 [&_td]:py-3">
          <thead className="border-b border-line bg-paper/60 text-xs uppercase tracking-wider text-muted">
            <tr>
              {columns.map((c) => (
                <th key={c.key} scope="col" className={`px-4 py-3 font-semibold ${c.align === "right" ? "text-right" : ""}`} aria-sort={sort === c.key ? (dir === "asc" ? "ascending" : "descending") : undefined}>
                  {c.sortable ? (
                    <a href={listHref(params, { sort: c.key, dir: sort === c.key && dir === "asc" ? "desc" : "asc" })} className="inline-flex items-center gap-1 hover:text-ink">
                      {c.label}
                      <span aria-hidden="true">{sort === c.key ? (dir === "asc" ? "▲" : "▼") : "↕"}</span>
                    </a>
                  ) : (
                    c.label
                  )}
                </th>
              ))}
            </tr>
          </thead>
          <tbody className="divide-y divide-line">
            {rows.length === 0 ? (
              <tr>
                <td colSpan={columns.length} className="py-8! text-center text-muted">
                  {empty}
                </td>
              </tr>
            ) : (
              rows.map((row) => (
                <tr key={row.id} className="hover:bg-paper/60">
                  {columns.map((c) => (
                    <td key={c.key} className={c.align === "right" ? "text-right tabular-nums" : undefined}>
                      {c.cell(row)}
                    </td>
                  ))}
                </tr>
              ))
            )}
          </tbody>
        </table>
      </div>
      <nav aria-label="Pages" className="flex flex-wrap items-center justify-between gap-3 text-sm text-muted">
        <span>
          {total === 0 ? "No rows" : `${(page - 1) * size + 1}–${Math.min(total, page * size)} of ${total.toLocaleString("en-GB")}`}
        </span>
        <span className="flex items-center gap-2">
          <PageLink to={listHref(params, { page: page - 1 })} disabled={page <= 1}>
            ← Previous
          </PageLink>
          <span>
            Page {page} of {pages}
          </span>
          <PageLink to={listHref(params, { page: page + 1 })} disabled={page >= pages}>
            Next →
          </PageLink>
        </span>
      </nav>
    </div>
  );
}

function PageLink({ to, disabled, children }: { to: string; disabled: boolean; children: ReactNode }) {
  if (disabled) return <span aria-disabled="true" className="rounded-md border border-line px-3 py-2 opacity-40">{children}</span>;
  return (
    <a href={to} className="rounded-md border border-line bg-white px-3 py-2 text-ink hover:border-edge">
      {children}
    </a>
  );
}

/** The search box above a list: a GET form that keeps the sort. */
export function ListSearch({ label, placeholder, children }: { label: string; placeholder: string; children?: ReactNode }) {
  const [params] = useSearchParams();
  return (
    <Form method="get" role="search" className="flex flex-wrap items-end gap-2">
      {["sort", "dir", "size"].map((k) => params.get(k) && <input key={k} type="hidden" name={k} value={params.get(k)!} />)}
      <label className="grow space-y-1 text-sm font-medium sm:max-w-sm">
        <span>{label}</span>
        <input type="search" name="q" defaultValue={params.get("q") ?? ""} placeholder={placeholder} className="block w-full rounded-md border border-line bg-white px-3 py-2.5 text-base" />
      </label>
      {children}
      <button type="submit" className="min-h-11 rounded-md border border-line bg-white px-4 font-medium hover:border-edge">
        Search
      </button>
    </Form>
  );
}

/** One of a list's filters, sent with its search form; the empty choice means any. */
export function ListFilter({ label, name, value, anyLabel, options }: { label: string; name: string; value: string | undefined; anyLabel: string; options: { value: string; label: string }[] }) {
  return (
    <label className="space-y-1 text-sm font-medium">
      <span className="block">{label}</span>
      <select name={name} defaultValue={value ?? ""} className="block min-h-11 w-full rounded-md border border-line bg-white px-3 py-2.5 text-base">
        <option value="">{anyLabel}</option>
        {options.map((o) => (
          <option key={o.value} value={o.value}>
            {o.label}
          </option>
        ))}
      </select>
    </label>
  );
}
