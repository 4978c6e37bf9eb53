const LABELS = { open: "Open", planned: "Planned", released: "At the saw", cut: "Cut", closed: "Closed" } as const;
const TONES = {
  open: "bg-paper text-muted border-line",
  planned: "bg-edge-soft text-edge-dark border-edge/30",
  released: "bg-warn-soft text-warn border-warn/30",
  cut: "bg-ok-soft text-ok border-ok/30",
  closed: "bg-ok text-white border-ok",
} as const;

export function BatchBadge({ status }: { status: keyof typeof LABELS }) {
  return <span className={`inline-block rounded-full border px-3 py-1 text-sm font-semibold ${TONES[status]}`}>{LABELS[status]}</span>;
}
