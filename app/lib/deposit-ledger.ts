// The bookkeeper's view of deposits: per order (asked, paid, refunded, balance due) and per month
// (received, refunded, net), and the CSV of the per-order rows. Integer minor units throughout.
import Papa from "papaparse";
import { DEPOSIT_STATUS_LABELS, type DepositStatus } from "./deposits";
import type { Period } from "./ledger-report";
import { spreadsheetSafe } from "./ledger-report";
import { moneyInputValue } from "./money";

export type LedgerDeposit = {
  depositId: string;
  orderId: string;
  orderNumber: number;
  customerName: string;
  orderTotalMinor: number;
  amountMinor: number;
  status: DepositStatus;
  requestedAt: string;
};
export type LedgerMove = { depositId: string; kind: "payment" | "refund"; amountMinor: number; occurredAt: string };

export type DepositOrderRow = {
  orderId: string;
  orderNumber: number;
  customerName: string;
  orderTotalMinor: number;
  askedMinor: number;
  status: DepositStatus;
  paidMinor: number;
  refundedMinor: number;
  balanceMinor: number;
  receivedInPeriodMinor: number;
  refundedInPeriodMinor: number;
};

const inPeriod = (iso: string, period: Period) => iso.slice(0, 10) >= period.from && iso.slice(0, 10) < period.to;

/**
 * One row per order with a deposit asked in the period or money moved in it. Asked and status are
 * the order's latest deposit; paid and refunded sum all of its deposits to date.
 */
export function depositOrderRows(deposits: LedgerDeposit[], moves: LedgerMove[], period: Period): DepositOrderRow[] {
  const byOrder = new Map<string, DepositOrderRow & { latest: string }>();
  const orderOf = new Map(deposits.map((d) => [d.depositId, d.orderId]));
  for (const d of deposits) {
    const row = byOrder.get(d.orderId) ?? {
      orderId: d.orderId,
      orderNumber: d.orderNumber,
      customerName: d.customerName,
      orderTotalMinor: d.orderTotalMinor,
      askedMinor: d.amountMinor,
      status: d.status,
      paidMinor: 0,
      refundedMinor: 0,
      balanceMinor: 0,
      receivedInPeriodMinor: 0,
      refundedInPeriodMinor: 0,
      latest: d.requestedAt,
    };
    if (d.requestedAt >= row.latest) Object.assign(row, { askedMinor: d.amountMinor, status: d.status, latest: d.requestedAt });
    byOrder.set(d.orderId, row);
  }
  const active = new Set(deposits.filter((d) => inPeriod(d.requestedAt, period)).map((d) => d.orderId));
  for (const m of moves) {
    const row = byOrder.get(orderOf.get(m.depositId) ?? "");
    if (!row) continue;
    const here = inPeriod(m.occurredAt, period);
    if (here) active.add(row.orderId);
    if (m.kind === "payment") {
      row.paidMinor += m.amountMinor;
      if (here) row.receivedInPeriodMinor += m.amountMinor;
    } else {
      row.refundedMinor += m.amountMinor;
      if (here) row.refundedInPeriodMinor += m.amountMinor;
    }
  }
  return [...byOrder.values()]
    .filter((r) => active.has(r.orderId))
    .map(({ latest: _latest, ...r }) => ({ ...r, balanceMinor: r.orderTotalMinor - r.paidMinor + r.refundedMinor }))
    .sort((a, b) => a.orderNumber - b.orderNumber);
}

export type DepositMonth = { month: string; receivedMinor: number; refundedMinor: number; netMinor: number };

/** The twelve months up to `thisMonth` ("2026-12"), oldest first, each with the money moved in it. */
export function depositMonths(sums: { month: string; kind: "payment" | "refund"; amountMinor: number }[], thisMonth: string): DepositMonth[] {
  const [y, m] = thisMonth.split("-").map(Number);
  const months = Array.from({ length: 12 }, (_, i) => {
    const d = new Date(Date.UTC(y, m - 1 - (11 - i), 1));
    return d.toISOString().slice(0, 7);
  });
  return months.map((month) => {
    const receivedMinor = sums.filter((s) => s.month === month && s.kind === "payment").reduce((a, s) => a + s.amountMinor, 0);
    const refundedMinor = sums.filter((s) => s.month === month && s.kind === "refund").reduce((a, s) => a + s.amountMinor, 0);
    return { month, receivedMinor, refundedMinor, netMinor: receivedMinor - refundedMinor };
  });
}

export function totalsOf(rows: DepositOrderRow[]) {
  return rows.reduce(
    (t, r) => ({
      receivedInPeriodMinor: t.receivedInPeriodMinor + r.receivedInPeriodMinor,
      refundedInPeriodMinor: t.refundedInPeriodMinor + r.refundedInPeriodMinor,
      balanceMinor: t.balanceMinor + r.balanceMinor,
    }),
    { receivedInPeriodMinor: 0, refundedInPeriodMinor: 0, balanceMinor: 0 },
  );
}

export const DEPOSIT_CSV_FIELDS = (currency: string) => [
  "order",
  "customer",
  "deposit_status",
  `order_total_${currency}`,
  `deposit_asked_${currency}`,
  `paid_${currency}`,
  `refunded_${currency}`,
  `received_in_period_${currency}`,
  `refunded_in_period_${currency}`,
  `balance_after_deposit_${currency}`,
];

/** The per-order rows as CSV (RFC 4180 by papaparse); the first line states the period and currency. */
export function depositLedgerCsv(rows: DepositOrderRow[], period: Period, currency: string): string {
  const money = (minor: number) => moneyInputValue(minor, currency);
  const body = Papa.unparse({
    fields: DEPOSIT_CSV_FIELDS(currency),
    data: rows.map((r) => [
      r.orderNumber,
      spreadsheetSafe(r.customerName),
      DEPOSIT_STATUS_LABELS[r.status],
      money(r.orderTotalMinor),
      money(r.askedMinor),
      money(r.paidMinor),
      money(r.refundedMinor),
      money(r.receivedInPeriodMinor),
      money(r.refundedInPeriodMinor),
      money(r.balanceMinor),
    ]),
  });
  return `# Stopwise deposits ${period.label}; money in ${currency}\r\n${body}\r\n`;
}
