import { drizzle } from "drizzle-orm/postgres-js";
import postgres from "postgres";
import * as schema from "../db/schema";

export type Database = ReturnType<typeof createDatabase>["db"];
export type Transaction = Parameters<Parameters<Database["transaction"]>[0]>[0];
/** The pool or a caller's transaction: model functions that take one run inside it (their own transactions become savepoints). */
export type Queryable = Database | Transaction;
/** Where and when a model function writes: by default the pool and the clock of the moment; the demo seed passes its own transaction and last month's dates. */
export type WriteContext = { db?: Queryable; now?: Date };

export function createDatabase(url: string, options: { max?: number } = {}) {
  const client = postgres(url, {
    max: options.max ?? 10,
    // Fail fast when the database is away, so requests can answer 503 instead of hanging.
    connect_timeout: 3,
    idle_timeout: 30,
    // No array columns here, so the driver need not read pg_type on each new connection. When that read
    // fails (the database stopping or cancelling it), postgres 3.4.9 leaves its rejection unhandled,
    // which ends a Node process; see porsager/postgres#1192.
    fetch_types: false,
    onnotice: () => {},
  });
  return { client, db: drizzle(client, { schema }) };
}

// One pool per process, kept across dev-server reloads.
const globalForDb = globalThis as unknown as { stopwiseDb?: ReturnType<typeof createDatabase> };

function connection() {
  if (!globalForDb.stopwiseDb) {
    const url = process.env.DATABASE_URL;
    if (!url) throw new Error("DATABASE_URL is not set; bin/start and bin/test set it.");
    globalForDb.stopwiseDb = createDatabase(url);
  }
  return globalForDb.stopwiseDb;
}

export function getDb(): Database {
  return connection().db;
}

const UNREACHABLE = new Set(["ECONNREFUSED", "ECONNRESET", "CONNECT_TIMEOUT", "CONNECTION_CLOSED", "CONNECTION_ENDED", "CONNECTION_DESTROYED", "57P01", "57P02", "57P03"]);

/** Whether an error means the database is away (stopped, restarting, unreachable), not a bad query. */
export function isDatabaseUnavailable(error: unknown): boolean {
  for (let e: unknown = error; e && typeof e === "object"; e = (e as { cause?: unknown }).cause) {
    const code = (e as { code?: string }).code;
    if (code && UNREACHABLE.has(code)) return true;
  }
  return false;
}

/** Answers whether the database takes a query within `timeoutMs`, and why not when it does not. */
export async function checkDatabase(timeoutMs = 2000): Promise<{ ok: true } | { ok: false; reason: string }> {
  let timer: NodeJS.Timeout | undefined;
  const timeout = new Promise<never>((_, reject) => {
    timer = setTimeout(() => reject(new Error(`no answer within ${timeoutMs} ms`)), timeoutMs);
  });
  try {
    await Promise.race([connection().client`select 1`, timeout]);
    return { ok: true };
  } catch (error) {
    return { ok: false, reason: error instanceof Error ? error.message : String(error) };
  } finally {
    clearTimeout(timer);
  }
}
