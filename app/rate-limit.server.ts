import { RateLimiterDrizzle, RateLimiterRes } from "rate-limiter-flexible";
import { rateLimits } from "../db/schema";
import { getDb } from "~/db.server";
import { countOf } from "~/lib/plural";

// Failed sign-ins: 10 per account and 30 per address in 15 minutes, far below OWASP ASVS 4.0.3
// V2.2.1's ceiling of 100 failures per account per hour. Unknown e-mails count like known ones, so
// the answer never tells whether an account exists.
let limiters: { account: RateLimiterDrizzle; address: RateLimiterDrizzle } | undefined;
function signInLimiters() {
  limiters ??= {
    account: new RateLimiterDrizzle({ storeClient: getDb(), schema: rateLimits, keyPrefix: "signin-account", points: 10, duration: 15 * 60, clearExpiredByTimeout: false }),
    address: new RateLimiterDrizzle({ storeClient: getDb(), schema: rateLimits, keyPrefix: "signin-address", points: 30, duration: 15 * 60, clearExpiredByTimeout: false }),
  };
  return limiters;
}

/** Milliseconds to wait when either limit is used up, else 0. */
export async function signInBlockedFor(email: string, address: string): Promise<number> {
  const { account, address: byAddress } = signInLimiters();
  const [a, b] = await Promise.all([account.get(email), byAddress.get(address)]);
  const blocked = [a, b].filter((r): r is RateLimiterRes => r !== null && r.remainingPoints <= 0);
  return blocked.length ? Math.max(...blocked.map((r) => r.msBeforeNext)) : 0;
}

/** How long a blocked person waits: "3 minutes" for the message, and the Retry-After header. */
export function blockedWait(waitMs: number): { wait: string; headers: { "Retry-After": string } } {
  return { wait: countOf(Math.max(1, Math.ceil(waitMs / 60_000)), "minute"), headers: { "Retry-After": String(Math.ceil(waitMs / 1000)) } };
}

export async function recordFailedSignIn(email: string, address: string): Promise<void> {
  const { account, address: byAddress } = signInLimiters();
  // consume() rejects with a RateLimiterRes once the points are spent; the count is what matters here.
  await Promise.allSettled([account.consume(email), byAddress.consume(address)]);
}

export async function clearFailedSignIns(email: string): Promise<void> {
  await signInLimiters().account.delete(email);
}

/** The client's address as bin/serve.ts recorded it (it overwrites whatever the client sent). */
export function clientAddress(request: Request): string {
  return request.headers.get("x-stopwise-client-address") ?? "local";
}
