import { isRouteErrorResponse, Link, Links, Meta, Outlet, Scripts, ScrollRestoration } from "react-router";
import type { Route } from "./+types/root";
import { sessionMiddleware } from "./auth.server";
import { timingMiddleware } from "./timing.server";
import "./app.css";

// Every request: phase timings when asked for (app/timing.server.ts), cross-site check, then who is signed in (app/auth.server.ts).
export const middleware: Route.MiddlewareFunction[] = [timingMiddleware, sessionMiddleware];

export function Layout({ children }: { children: React.ReactNode }) {
  return (
    <html lang="en">
      <head>
        <meta charSet="utf-8" />
        <meta name="viewport" content="width=device-width, initial-scale=1" />
        <link rel="icon" href="/favicon.svg" type="image/svg+xml" />
        <Meta />
        {/* Stylesheets need no nonce (only scripts are restricted), and the browser hides a nonce from
            the page, so the client could never match the server's: none is rendered here. */}
        <Links nonce="" />
      </head>
      <body className="min-h-screen bg-paper text-ink antialiased">
        {children}
        <ScrollRestoration />
        <Scripts />
      </body>
    </html>
  );
}

export default function App() {
  return <Outlet />;
}

export function ErrorBoundary({ error }: Route.ErrorBoundaryProps) {
  let status = 500;
  let title = "Something went wrong on our side";
  let advice = "The problem has been logged. Try again in a moment; if it keeps happening, tell whoever runs Stopwise for your shop.";
  if (isRouteErrorResponse(error)) {
    status = error.status;
    if (error.status === 404) {
      title = "There is nothing at this address";
      advice = "The link may be old, or the item may have been removed. Start again from the home page.";
    } else if (error.status === 403) {
      title = "Your role does not allow this page";
      advice = typeof error.data === "string" ? error.data : "Ask your shop's owner if you need it.";
    } else if (error.status === 503) {
      title = "Stopwise cannot reach its database";
      advice = "Nothing you entered was saved by the failed request. Wait a moment and try again.";
    } else if (error.status < 500) {
      title = error.statusText || "That request could not be handled";
      advice = typeof error.data === "string" ? error.data : advice;
    }
  }
  const stack = import.meta.env.DEV && error instanceof Error ? error.stack : undefined;

  return (
    <main className="mx-auto flex min-h-screen max-w-xl flex-col justify-center gap-4 px-6 py-16">
      <title>{`${status} · Stopwise`}</title>
      <p className="font-semibold tracking-wide text-edge">Error {status}</p>
      <h1 className="text-display font-semibold">{title}</h1>
      <p className="text-muted">{advice}</p>
      <p>
        <Link to="/" className="inline-block rounded-md bg-edge px-4 py-2 font-medium text-white hover:bg-edge-dark">
          Back to the home page
        </Link>
      </p>
      {stack && <pre className="overflow-x-auto rounded-md bg-card p-4 text-xs">{stack}</pre>}
    </main>
  );
}
