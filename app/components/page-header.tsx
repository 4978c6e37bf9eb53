import type { ReactNode } from "react";

/** The head of every page in the shell: who it is for, its name (also the tab title), what it is for. */
export function PageHeader({ eyebrow, title, children }: { eyebrow: string; title: string; children?: ReactNode }) {
  return (
    <header className="space-y-1">
      <title>{`${title} · Stopwise`}</title>
      <p className="text-sm font-medium uppercase tracking-wider text-edge">{eyebrow}</p>
      <h1 className="text-display font-semibold">{title}</h1>
      {children && <p className="max-w-2xl text-muted">{children}</p>}
    </header>
  );
}
