import { Link } from "react-router";
import type { Route } from "./+types/home";
import { requirePermission } from "~/auth.server";
import { AgendaList } from "~/components/agenda-list";
import { areasFor } from "~/components/areas";
import { agendaEntries } from "~/lib/agenda";
import { shopAgenda } from "~/models/agenda.server";
import { timed } from "~/timing.server";

export async function loader(args: Route.LoaderArgs) {
  const user = requirePermission(args, "dashboard:read");
  const now = new Date();
  const facts = await timed("queries", () => shopAgenda(user.shopId, user.role, now));
  return { name: user.name, role: user.role, agenda: agendaEntries(facts, now) };
}

const FLOW = [
  { step: "Take the order", detail: "names, event date, due date, personalisation", path: "/orders" },
  { step: "Batch what is due", detail: "per material and thickness", path: "/batches" },
  { step: "Lay out the panels", detail: "kerf, trim, grain and offcuts allowed for", path: "/batches" },
  { step: "Cut at the saw", detail: "one fence and one stop setting per identical part", path: "/saw" },
  { step: "Count the cost", detail: "material, offcuts and scrap per batch", path: "/ledger" },
];

export default function Home({ loaderData }: Route.ComponentProps) {
  const areas = areasFor(loaderData.role);
  return (
    <div className="space-y-10">
      <title>Stopwise</title>
      <header className="max-w-3xl space-y-3">
        <p className="text-sm font-medium uppercase tracking-wider text-edge">Hello, {loaderData.name}</p>
        <h1 className="text-display font-semibold">From the order to the offcut</h1>
      </header>

      {/* The day's work first; what Stopwise does comes after, for a newcomer. */}
      <section aria-labelledby="waiting" className="space-y-3">
        <h2 id="waiting" className="text-xl font-semibold">
          Waiting on the shop
        </h2>
        <AgendaList entries={loaderData.agenda} />
      </section>

      <section className="space-y-4" aria-label="How Stopwise works">
        <p className="max-w-3xl text-lg text-muted">
          Stopwise carries a personalised order through the shop: it batches what is due by material, lays the parts
          onto sheets and racked offcuts with the saw's kerf allowed for, gives the saw a set-up for every identical
          part, and shows what each batch cost.
        </p>

        <ol className="grid gap-3 sm:grid-cols-2 lg:grid-cols-5">
          {FLOW.map((item, i) => (
            <li key={item.step}>
              {/* A step outside this role's areas is shown, not linked: the whole flow stays in view. */}
              {areas.some((a) => a.path === item.path) ? (
                <Link to={item.path} className="block h-full rounded-lg border border-line bg-card p-4 hover:border-edge">
                  <FlowStep index={i} step={item.step} detail={item.detail} />
                </Link>
              ) : (
                <div className="block h-full rounded-lg border border-dashed border-line p-4 opacity-80">
                  <FlowStep index={i} step={item.step} detail={item.detail} />
                </div>
              )}
            </li>
          ))}
        </ol>
      </section>

      <section className="space-y-3">
        <h2 className="text-xl font-semibold">Areas</h2>
        <ul className="grid gap-3 sm:grid-cols-2 lg:grid-cols-3">
          {areas.map((area) => (
            <li key={area.path}>
              <Link to={area.path} className="block h-full rounded-lg border border-line bg-card p-4 hover:border-edge">
                <span className="flex items-baseline justify-between gap-2">
                  <span className="font-semibold">{area.label}</span>
                  <span className="text-xs uppercase tracking-wider text-muted">{area.forWhom}</span>
                </span>
                <span className="mt-1 block text-sm text-muted">{area.summary}</span>
              </Link>
            </li>
          ))}
        </ul>
      </section>
    </div>
  );
}

function FlowStep({ index, step, detail }: { index: number; step: string; detail: string }) {
  return (
    <>
      <span className="text-sm font-semibold text-edge">Step {index + 1}</span>
      <span className="mt-1 block font-semibold">{step}</span>
      <span className="mt-1 block text-sm text-muted">{detail}</span>
    </>
  );
}
