import { getDb, type Database } from "~/db.server";

/**
 * A read that pages run on every view, built once per pool and prepared: drizzle spends a few
 * milliseconds building a query's SQL, and PostgreSQL then skips parsing and planning it again.
 * Values go in as `sql.placeholder(...)`s at `execute`.
 */
export function preparedOnce<T>(build: (db: Database) => T): () => T {
  let built: { db: Database; query: T } | undefined;
  return () => {
    const db = getDb();
    if (built?.db !== db) built = { db, query: build(db) };
    return built.query;
  };
}
