// Server-side lists: the page, size, sort and filter a URL asks for, checked against what a list allows.

export type ListQuery<TSort extends string> = { page: number; size: number; sort: TSort; dir: "asc" | "desc"; q: string; filters: Record<string, string> };

export const PAGE_SIZES = [25, 50, 100] as const;

export function parseListQuery<TSort extends string>(
  params: URLSearchParams,
  options: { sorts: readonly TSort[]; defaultSort: TSort; defaultDir?: "asc" | "desc"; filters?: Record<string, readonly string[]> },
): ListQuery<TSort> {
  const page = Math.max(1, Math.min(100_000, Number.parseInt(params.get("page") ?? "1", 10) || 1));
  const sizeParam = Number.parseInt(params.get("size") ?? "", 10);
  const size = (PAGE_SIZES as readonly number[]).includes(sizeParam) ? sizeParam : PAGE_SIZES[0];
  const sortParam = params.get("sort") as TSort | null;
  const sort = sortParam && options.sorts.includes(sortParam) ? sortParam : options.defaultSort;
  const dirParam = params.get("dir");
  const dir = dirParam === "asc" || dirParam === "desc" ? dirParam : (options.defaultDir ?? "asc");
  // NUL is dropped: no stored text holds one, and PostgreSQL refuses it in a query parameter.
  const q = (params.get("q") ?? "").replace(/\u0000/g, "").trim().slice(0, 200);
  const filters: Record<string, string> = {};
  for (const [name, allowed] of Object.entries(options.filters ?? {})) {
    const value = params.get(name);
    if (value && allowed.includes(value)) filters[name] = value;
  }
  return { page, size, sort, dir, q, filters };
}

export function pageCount(total: number, size: number): number {
  return Math.max(1, Math.ceil(total / size));
}

/** Escapes LIKE wildcards so a search for "50%" means the text "50%". */
export function likePattern(q: string): string {
  return `%${q.replace(/[\\%_]/g, (c) => `\\${c}`)}%`;
}

/** The same list address with some parameters changed (page resets unless given). */
export function listHref(params: URLSearchParams, changes: Record<string, string | number | null>): string {
  const next = new URLSearchParams(params);
  if (!("page" in changes)) next.delete("page");
  for (const [key, value] of Object.entries(changes)) {
    if (value === null || value === "") next.delete(key);
    else next.set(key, String(value));
  }
  const text = next.toString();
  return text ? `?${text}` : "?";
}
