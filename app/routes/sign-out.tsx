import { redirect } from "react-router";
import type { Route } from "./+types/sign-out";
import { blankSessionCookie, invalidateSession, sessionIdFrom } from "~/auth.server";

// Signing out is a POST (no state change on GET); the session row goes, so the cookie is worthless.
export async function action({ request }: Route.ActionArgs) {
  const sessionId = sessionIdFrom(request);
  if (sessionId) await invalidateSession(sessionId);
  return redirect("/sign-in", { headers: { "Set-Cookie": blankSessionCookie(request) } });
}

export function loader() {
  return redirect("/");
}
