import { data } from "react-router";
import type { Route } from "./+types/dev.outbox";
import { requirePermission } from "~/auth.server";
import { PageHeader } from "~/components/page-header";
import { outboxEnabled, readOutbox } from "~/outbox.server";

// Development only: exists when the scripts run the fake SMTP server (STOPWISE_OUTBOX_DIR is set).
export async function loader(args: Route.LoaderArgs) {
  if (!outboxEnabled()) throw data("Not found", { status: 404 });
  requirePermission(args, "outbox:read");
  return { messages: await readOutbox() };
}

const linkify = (text: string) =>
  text.split(/(https?:\/\/\S+)/g).map((part, i) =>
    /^https?:\/\//.test(part) ? (
      <a key={i} href={part} className="break-all text-edge underline">
        {part}
      </a>
    ) : (
      part
    ),
  );

export default function Outbox({ loaderData }: Route.ComponentProps) {
  return (
    <div className="space-y-6">
      <PageHeader eyebrow="Development" title="Outbox">
        Mail caught by the local fake SMTP server, newest first. Nothing here left this machine.
      </PageHeader>
      {loaderData.messages.length === 0 && <p className="text-muted">No mail yet.</p>}
      <ul className="space-y-4">
        {loaderData.messages.map((m) => (
          <li key={m.id} className="rounded-lg border border-line bg-card p-4">
            <p className="font-semibold">{m.subject}</p>
            <p className="text-sm text-muted">
              To {m.to.join(", ")} · {new Date(m.receivedAt).toUTCString()}
            </p>
            <pre className="mt-3 whitespace-pre-wrap font-sans text-sm">{linkify(m.text)}</pre>
          </li>
        ))}
      </ul>
    </div>
  );
}
