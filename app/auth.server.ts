import { DrizzlePostgreSQLAdapter } from "@lucia-auth/adapter-drizzle";
import { Cookie, Lucia, TimeSpan, type DatabaseSession, type DatabaseUser } from "lucia";
import { data, redirect, type MiddlewareFunction, type RouterContextProvider } from "react-router";
import { eq, sql } from "drizzle-orm";
import { sessions, shops, users } from "../db/schema";
import { databaseFaultContext, userContext, type SignedInUser } from "~/context";
import { getDb, isDatabaseUnavailable } from "~/db.server";
import { can, deniedMessage, type Permission, type Role } from "~/lib/permissions";
import { preparedOnce } from "~/models/prepared.server";
import { timed } from "~/timing.server";

// Sessions expire 12 hours after the last renewal; lucia renews (a new expiry, same id) once half of
// that has passed, so a day at the saw keeps one session while an idle one ends. However active, a
// session ends 12 hours after sign-in, and the person signs in again (OWASP ASVS 4.0.3 V3.3.2, level 2).
const SESSION_LIFETIME = new TimeSpan(12, "h");
export const SESSION_ABSOLUTE_MS = 12 * 60 * 60 * 1000;

/**
 * lucia's Drizzle adapter, except that the session is read with its user and the shop's name in one
 * query: every request asks this, and a second round trip for the user's row cost as much again.
 */
const sessionWithUser = preparedOnce((db) =>
  db
    .select({ id: sessions.id, userId: sessions.userId, expiresAt: sessions.expiresAt, createdAt: sessions.createdAt, shopId: users.shopId, shopName: shops.name, email: users.email, name: users.name, role: users.role })
    .from(sessions)
    .innerJoin(users, eq(users.id, sessions.userId))
    .innerJoin(shops, eq(shops.id, users.shopId))
    .where(eq(sessions.id, sql.placeholder("sessionId")))
    .prepare("session_with_user"),
);

class SessionAdapter extends DrizzlePostgreSQLAdapter {
  override async getSessionAndUser(sessionId: string): Promise<[DatabaseSession | null, DatabaseUser | null]> {
    const [row] = await sessionWithUser().execute({ sessionId });
    if (!row) return [null, null];
    const { id, userId, expiresAt, createdAt, ...attributes } = row;
    if (Date.now() - createdAt.getTime() > SESSION_ABSOLUTE_MS) {
      await this.deleteSession(id);
      return [null, null];
    }
    return [{ id, userId, expiresAt, attributes: {} }, { id: userId, attributes }];
  }
}

function createLucia() {
  return new Lucia(new SessionAdapter(getDb(), sessions, users), {
    sessionExpiresIn: SESSION_LIFETIME,
    sessionCookie: { name: "stopwise_session", expires: true, attributes: { sameSite: "lax", path: "/" } },
    getUserAttributes: ({ shopId, shopName, email, name, role }) => ({ shopId, shopName, email, name, role }),
  });
}

declare module "lucia" {
  interface Register {
    Lucia: ReturnType<typeof createLucia>;
    DatabaseUserAttributes: Omit<SignedInUser, "id">;
  }
}

let lucia: ReturnType<typeof createLucia> | undefined;
function auth() {
  lucia ??= createLucia();
  return lucia;
}

/** HttpOnly, SameSite=Lax, Path=/ always; Secure when the request came over https (ASVS V3.4.1–3.4.3, V3.4.5). */
function serialize(cookie: Cookie, request: Request): string {
  const secure = new URL(request.url).protocol === "https:";
  return new Cookie(cookie.name, cookie.value, { ...cookie.attributes, secure, httpOnly: true, sameSite: "lax", path: "/" }).serialize();
}

export async function createSessionCookie(userId: string, request: Request): Promise<string> {
  const session = await auth().createSession(userId, {});
  return serialize(auth().createSessionCookie(session.id), request);
}

export function blankSessionCookie(request: Request): string {
  return serialize(auth().createBlankSessionCookie(), request);
}

export function sessionIdFrom(request: Request): string | null {
  return auth().readSessionCookie(request.headers.get("Cookie") ?? "");
}

export async function invalidateSession(sessionId: string): Promise<void> {
  await auth().invalidateSession(sessionId);
}

export async function invalidateUserSessions(userId: string): Promise<void> {
  await auth().invalidateUserSessions(userId);
}

const SAFE_METHODS = new Set(["GET", "HEAD", "OPTIONS"]);

/**
 * Paths a server, not a browser, posts to: the payment service's webhook. Its Stripe-Signature over
 * the raw body authenticates it (app/routes/webhooks.payments.ts), it reads no session, and it is
 * exempt from the cross-site check whatever headers the sender adds. Only exact paths go here.
 */
export const CROSS_SITE_EXEMPT_PATHS: ReadonlySet<string> = new Set(["/webhooks/payments"]);

/**
 * Refuses a state-changing request that a browser says came from another site (OWASP ASVS 4.0.3
 * V4.2.2, V13.2.3): a foreign Origin, or Sec-Fetch-Site other than same-origin / none. Clients that
 * send neither (scripts, webhooks) carry no browser cookies to abuse and pass.
 */
export function isCrossSite(request: Request): boolean {
  if (SAFE_METHODS.has(request.method)) return false;
  if (CROSS_SITE_EXEMPT_PATHS.has(new URL(request.url).pathname)) return false;
  const fetchSite = request.headers.get("Sec-Fetch-Site");
  if (fetchSite && fetchSite !== "same-origin" && fetchSite !== "none") return true;
  const origin = request.headers.get("Origin");
  if (origin && origin !== "null" && origin !== new URL(request.url).origin) return true;
  if (origin === "null") return true;
  return false;
}

export function isApiRequest(request: Request): boolean {
  return new URL(request.url).pathname.startsWith("/api/");
}

/** Root middleware: cross-site check, then the session (renewed on the way out when lucia extends it). */
export const sessionMiddleware: MiddlewareFunction<Response> = async ({ request, context }, next) => {
  if (isCrossSite(request)) {
    const message = "This request came from another site and was refused.";
    if (isApiRequest(request)) return Response.json({ error: message }, { status: 403 });
    throw data(message, { status: 403 });
  }

  const sessionId = sessionIdFrom(request);
  let setCookie: string | null = null;
  let user: SignedInUser | null = null;
  if (sessionId) {
    try {
      const validated = await timed("session", () => auth().validateSession(sessionId));
      if (!validated.session) setCookie = blankSessionCookie(request);
      else {
        user = validated.user;
        if (validated.session.fresh) setCookie = serialize(auth().createSessionCookie(validated.session.id), request);
      }
    } catch (error) {
      // While PostgreSQL restarts, say so plainly (503) instead of failing with a 500.
      if (!isDatabaseUnavailable(error)) throw error;
      return databaseUnavailable(request);
    }
  }
  context.set(userContext, user);
  const response = await next();
  // A loader or action lost the database after the session was found: React Router has made a 500 of
  // it (and told handleError, which marked the context); answer the same 503 as above instead.
  if (context.get(databaseFaultContext)) return databaseUnavailable(request);
  if (setCookie && !response.headers.has("Set-Cookie")) response.headers.append("Set-Cookie", setCookie);
  return response;
};

export const DATABASE_UNAVAILABLE_MESSAGE = "Stopwise cannot reach its database just now. Nothing was saved by this request; try again in a moment.";

/**
 * 503 while the database is away. API routes answer JSON; everything else throws, so pages (and their
 * client-side data requests) render the root error boundary's 503 page, and other resource routes answer
 * the message as JSON text. Retry-After tells scripts when to ask again.
 */
function databaseUnavailable(request: Request): Response {
  const headers = { "Retry-After": "5" };
  if (isApiRequest(request)) return Response.json({ error: DATABASE_UNAVAILABLE_MESSAGE }, { status: 503, headers });
  throw data(DATABASE_UNAVAILABLE_MESSAGE, { status: 503, headers });
}

type Args = { request: Request; context: Readonly<RouterContextProvider> };

export function currentUser({ context }: Pick<Args, "context">): SignedInUser | null {
  return context.get(userContext);
}

/**
 * The signed-in person holding `permission`, or: signed out → pages redirect to sign-in with the
 * return address, API routes answer 401; wrong role → 403 ("you need the … role").
 */
export function requirePermission({ request, context }: Args, permission: Permission): SignedInUser {
  const user = context.get(userContext);
  const api = isApiRequest(request);
  if (!user) {
    if (api) throw Response.json({ error: "Sign in first." }, { status: 401 });
    const url = new URL(request.url);
    throw redirect(`/sign-in?redirectTo=${encodeURIComponent(url.pathname + url.search)}`);
  }
  if (!can(user.role, permission)) {
    if (api) throw Response.json({ error: deniedMessage(permission) }, { status: 403 });
    throw data(deniedMessage(permission), { status: 403 });
  }
  return user;
}

export function hasPermission(role: Role, permission: Permission) {
  return can(role, permission);
}

/** Only same-site paths: an open redirect would let a link send people off-site after signing in. */
export function safeRedirect(to: FormDataEntryValue | string | null | undefined, fallback = "/"): string {
  if (typeof to !== "string" || !to.startsWith("/") || to.startsWith("//") || to.startsWith("/\\")) return fallback;
  return to;
}
