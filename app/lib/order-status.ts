// An order's life: draft → confirmed → in production → ready → delivered, or cancelled on the way.
export const ORDER_STATUSES = ["draft", "confirmed", "in_production", "ready", "delivered", "cancelled"] as const;
export type OrderStatus = (typeof ORDER_STATUSES)[number];

/** What the order list and the calendar show of each order. */
export type OrderHeading = { id: string; number: number; customer: string; eventDate: string; dueDate: string; status: OrderStatus };

export const STATUS_LABELS: Record<OrderStatus, string> = {
  draft: "Draft",
  confirmed: "Confirmed",
  in_production: "In production",
  ready: "Ready",
  delivered: "Delivered",
  cancelled: "Cancelled",
};

const NEXT: Record<OrderStatus, OrderStatus[]> = {
  draft: ["confirmed", "cancelled"],
  confirmed: ["in_production", "cancelled"],
  in_production: ["ready", "cancelled"],
  ready: ["delivered", "cancelled"],
  delivered: [],
  cancelled: [],
};

export function nextStatuses(status: OrderStatus): OrderStatus[] {
  return NEXT[status];
}

export function canMoveTo(from: OrderStatus, to: OrderStatus): boolean {
  return NEXT[from].includes(to);
}

/** Lines can change until the order goes into production. */
export function linesEditable(status: OrderStatus): boolean {
  return status === "draft" || status === "confirmed";
}

export function isOrderStatus(value: unknown): value is OrderStatus {
  return typeof value === "string" && (ORDER_STATUSES as readonly string[]).includes(value);
}
