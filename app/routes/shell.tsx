import { Form, isRouteErrorResponse, Link, Outlet, useLocation, useRouteError, useRouteLoaderData } from "react-router";
import type { Route } from "./+types/shell";
import { requirePermission } from "~/auth.server";
import { areasFor, type Area } from "~/components/areas";
import { useRouterClicks } from "~/components/router-clicks";
import { Wordmark } from "~/components/wordmark";
import { can } from "~/lib/permissions";
import { outboxEnabled } from "~/outbox.server";

export function loader(args: Route.LoaderArgs) {
  const user = requirePermission(args, "dashboard:read");
  return {
    user: { name: user.name, role: user.role, shopName: user.shopName },
    outbox: outboxEnabled() && can(user.role, "outbox:read"),
  };
}

/**
 * The areas as plain anchors (a NavLink costs the server render several hooks, and every page draws
 * this list twice, rail and phone menu): one location read marks the current area, one click
 * handler sends plain clicks through the router.
 */
function NavItems({ areas, outbox, onNavigate }: { areas: Area[]; outbox: boolean; onNavigate?: () => void }) {
  const { pathname } = useLocation();
  const routerClicks = useRouterClicks(onNavigate);
  const items = [...areas.map((a) => ({ path: a.path, label: a.label, note: a.forWhom })), ...(outbox ? [{ path: "/dev/outbox", label: "Outbox", note: "Dev" }] : [])];
  return (
    <ul className="space-y-0.5" onClick={routerClicks}>
      {items.map((item) => {
        // An area with another area under it ("/ledger", "/ledger/deposits") is lit only at its own address.
        const end = items.some((other) => other.path.startsWith(`${item.path}/`));
        const active = pathname === item.path || (!end && item.path !== "/" && pathname.startsWith(`${item.path}/`));
        return (
          <li key={item.path}>
            <a
              href={item.path}
              aria-current={active ? "page" : undefined}
              className={`flex items-baseline justify-between rounded-md px-3 py-2.5 text-[0.95rem] ${
                active ? "bg-rail-hover font-semibold text-white shadow-[inset_3px_0_0_var(--color-edge)]" : "text-rail-ink hover:bg-rail-hover"
              }`}
            >
              <span>{item.label}</span>
              <span className="text-xs text-rail-ink/70">{item.note}</span>
            </a>
          </li>
        );
      })}
    </ul>
  );
}

function Person({ user }: { user: { name: string; role: string; shopName: string } }) {
  return (
    <div className="space-y-2 rounded-md border border-rail-ink/20 p-3 text-sm">
      <p className="font-semibold text-white">{user.name}</p>
      <p className="text-rail-ink/80">
        {user.role} · {user.shopName}
      </p>
      <a href="/account" className="block text-rail-ink underline underline-offset-2 hover:text-white">
        Your account and password
      </a>
      <Form method="post" action="/sign-out">
        <button type="submit" className="mt-1 min-h-10 w-full rounded-md border border-rail-ink/30 px-3 text-rail-ink hover:bg-rail-hover">
          Sign out
        </button>
      </Form>
    </div>
  );
}

type ShellData = Awaited<ReturnType<typeof loader>>;

function Frame({ shell, children }: { shell: ShellData | undefined; children: React.ReactNode }) {
  const allAreas = shell ? areasFor(shell.user.role) : [];
  const outbox = shell?.outbox ?? false;
  return (
    <div className="min-h-screen lg:grid lg:grid-cols-[15.5rem_1fr]">
      <aside className="hidden bg-rail text-rail-ink lg:block">
        <div className="sticky top-0 flex h-screen flex-col gap-6 overflow-y-auto p-4">
          <Link to="/" className="px-2 pt-1 text-white">
            <Wordmark />
          </Link>
          <nav aria-label="Areas" className="flex-1">
            <NavItems areas={allAreas} outbox={outbox} />
          </nav>
          {shell && <Person user={shell.user} />}
        </div>
      </aside>

      <header className="sticky top-0 z-10 flex items-center justify-between bg-rail px-4 py-3 text-rail-ink lg:hidden">
        <Link to="/" className="text-white">
          <Wordmark />
        </Link>
        {/* the wordmark stays outside the summary: a link inside the menu's toggle would be a control within a control */}
        <details className="group">
          <summary className="cursor-pointer list-none rounded-md border border-rail-ink/30 px-3 py-1.5 text-sm [&::-webkit-details-marker]:hidden">
            <span className="group-open:hidden">Menu</span>
            <span className="hidden group-open:inline">Close</span>
          </summary>
          <nav aria-label="Areas" className="absolute inset-x-0 top-full max-h-[calc(100dvh-3.5rem)] space-y-3 overflow-y-auto border-t border-rail-ink/20 bg-rail px-2 pb-3 pt-2">
            <NavItems
              areas={allAreas}
              outbox={outbox}
              onNavigate={() => document.querySelector<HTMLDetailsElement>("header details")?.removeAttribute("open")}
            />
            {shell && <Person user={shell.user} />}
          </nav>
        </details>
      </header>

      <main className="mx-auto w-full min-w-0 max-w-6xl px-4 py-6 sm:px-6 lg:px-10 lg:py-10">{children}</main>
    </div>
  );
}

export default function Shell({ loaderData }: Route.ComponentProps) {
  return (
    <Frame shell={loaderData}>
      <Outlet />
    </Frame>
  );
}

// A refused or missing page keeps the navigation around it.
export function ErrorBoundary() {
  const error = useRouteError();
  const shell = useRouteLoaderData<typeof loader>("routes/shell");
  if (!shell) throw error; // the shell itself failed: the root boundary takes it
  const status = isRouteErrorResponse(error) ? error.status : 500;
  const title = status === 403 ? "Not for your role" : status === 404 ? "There is nothing at this address" : "Something went wrong";
  const detail =
    isRouteErrorResponse(error) && typeof error.data === "string" && status !== 404
      ? error.data
      : status === 404
        ? "The link may be old, or the item may belong to another shop or have been removed."
        : "The problem has been logged. Try again in a moment.";
  return (
    <Frame shell={shell}>
      <section className="max-w-xl space-y-3">
        <title>{`${status} · Stopwise`}</title>
        <p className="font-semibold text-edge">Error {status}</p>
        <h1 className="text-display font-semibold">{title}</h1>
        <p className="text-muted">{detail}</p>
        <Link to="/" className="inline-block rounded-md bg-edge px-4 py-2 font-medium text-white hover:bg-edge-dark">
          Back to the home page
        </Link>
      </section>
    </Frame>
  );
}
