import { Link, NavLink, Outlet } from "react-router";
import { AREAS } from "~/components/areas";
import { Wordmark } from "~/components/wordmark";

function NavItems({ onNavigate }: { onNavigate?: () => void }) {
  return (
    <ul className="space-y-0.5">
      {AREAS.map((area) => (
        <li key={area.path}>
          <NavLink
            to={area.path}
            onClick={onNavigate}
            className={({ isActive }) =>
              `flex items-baseline justify-between rounded-md px-3 py-2.5 text-[0.95rem] ${
                isActive ? "bg-rail-hover font-semibold text-white shadow-[inset_3px_0_0_var(--color-edge)]" : "text-rail-ink hover:bg-rail-hover"
              }`
            }
          >
            <span>{area.label}</span>
            <span className="text-xs text-rail-ink/60">{area.forWhom}</span>
          </NavLink>
        </li>
      ))}
    </ul>
  );
}

export default function Shell() {
  return (
    <div className="min-h-screen lg:grid lg:grid-cols-[15.5rem_1fr]">
      <aside className="hidden bg-rail text-rail-ink lg:block">
        <div className="sticky top-0 flex h-screen flex-col gap-6 overflow-y-auto p-4">
          <Link to="/" className="px-2 pt-1 text-white">
            <Wordmark />
          </Link>
          <nav aria-label="Areas">
            <NavItems />
          </nav>
        </div>
      </aside>

      <header className="sticky top-0 z-10 bg-rail text-rail-ink lg:hidden">
        <details className="group">
          <summary className="flex cursor-pointer list-none items-center justify-between px-4 py-3 [&::-webkit-details-marker]:hidden">
            <Link to="/" className="text-white">
              <Wordmark />
            </Link>
            <span className="rounded-md border border-rail-ink/30 px-3 py-1.5 text-sm">
              <span className="group-open:hidden">Menu</span>
              <span className="hidden group-open:inline">Close</span>
            </span>
          </summary>
          <nav aria-label="Areas" className="border-t border-rail-ink/20 px-2 pb-3 pt-2">
            <NavItems
              onNavigate={() => document.querySelector<HTMLDetailsElement>("header details")?.removeAttribute("open")}
            />
          </nav>
        </details>
      </header>

      <main className="mx-auto w-full max-w-6xl px-4 py-6 sm:px-6 lg:px-10 lg:py-10">
        <Outlet />
      </main>
    </div>
  );
}
