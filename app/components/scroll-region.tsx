import type { ReactNode } from "react";

/**
 * The sideways-scrolling box of a wide table: focusable, so a keyboard can scroll it on a phone,
 * and named by its heading (`labelledBy`: the heading's id).
 */
export function ScrollRegion({ labelledBy, children }: { labelledBy: string; children: ReactNode }) {
  return (
    <div className="overflow-x-auto rounded-lg border border-line bg-card focus-visible:outline-2 focus-visible:outline-edge" tabIndex={0} role="region" aria-labelledby={labelledBy}>
      {children}
    </div>
  );
}
