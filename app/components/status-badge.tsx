import { STATUS_LABELS, type OrderStatus } from "~/lib/order-status";

const TONES: Record<OrderStatus, string> = {
  draft: "bg-paper text-muted border-line",
  confirmed: "bg-edge-soft text-edge-dark border-edge/30",
  in_production: "bg-warn-soft text-warn border-warn/30",
  ready: "bg-ok-soft text-ok border-ok/30",
  delivered: "bg-ok text-white border-ok",
  cancelled: "bg-bad-soft text-bad border-bad/30",
};

export function StatusBadge({ status }: { status: OrderStatus }) {
  return <span className={`inline-block rounded-full border px-3 py-1 text-sm font-semibold ${TONES[status]}`}>{STATUS_LABELS[status]}</span>;
}
