/** Stopwise's mark: a fence with a stop block set against it. */
export function Wordmark({ className = "" }: { className?: string }) {
  return (
    <span className={`inline-flex items-center gap-2 font-semibold tracking-tight ${className}`}>
      <svg viewBox="0 0 32 32" className="h-7 w-7" aria-hidden="true">
        <rect width="32" height="32" rx="6" fill="#1f2d3a" />
        <rect x="6" y="7" width="20" height="4" rx="1" fill="#d9e2ea" />
        <rect x="18" y="11" width="6" height="14" rx="1" fill="#b8561d" />
        <rect x="6" y="21" width="10" height="4" rx="1" fill="#d9e2ea" />
      </svg>
      <span className="text-lg">Stopwise</span>
    </span>
  );
}
