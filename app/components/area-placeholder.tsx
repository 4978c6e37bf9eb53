import type { Area } from "./areas";
import { PageHeader } from "./page-header";

/** A page whose area is not built yet: it says plainly what will be here. */
export function AreaPlaceholder({ area }: { area: Area }) {
  return (
    <section className="space-y-6">
      <PageHeader eyebrow={area.forWhom} title={area.label}>
        {area.summary}
      </PageHeader>
      <div className="max-w-2xl rounded-lg border border-dashed border-line bg-card p-5">
        <h2 className="font-semibold">Not built yet. This page will hold:</h2>
        <ul className="mt-3 list-disc space-y-1 pl-5 text-muted">
          {area.comingSoon.map((item) => (
            <li key={item}>{item}</li>
          ))}
        </ul>
      </div>
    </section>
  );
}
