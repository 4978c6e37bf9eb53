import { Form } from "react-router";
import { SubmitButton } from "./forms";
import { formatDay } from "~/lib/dates";
import { DEPOSIT_FILTER_LABELS, DEPOSIT_STATUS_LABELS, unchargeableDeposit, type DepositStatus } from "~/lib/deposits";
import { formatMoney } from "~/lib/money";

export type DepositView = {
  deposit: { status: DepositStatus; amountMinor: number; requestedAt: string; paidAt: string | null; refundedAt: string | null; link: string | null } | null;
  paidMinor: number;
  refundedMinor: number;
  heldMinor: number;
  balanceMinor: number;
  proposedMinor: number | null;
  canRefund: boolean;
};

const TONE: Record<DepositStatus, string> = {
  requested: "bg-warn-soft text-warn",
  paid: "bg-ok-soft text-ok",
  refund_pending: "bg-warn-soft text-warn",
  refunded: "bg-line/60 text-ink",
};


/** The order's deposit: what was asked, paid and refunded, the balance due, and the owner's actions. */
export function DepositPanel({ view, order, currency, canWrite, timeZone }: { view: DepositView; order: { status: string; totalMinor: number }; currency: string; canWrite: boolean; timeZone: string }) {
  const { deposit } = view;
  const money = (minor: number) => formatMoney(minor, currency);
  const open = order.status !== "draft" && order.status !== "cancelled" && order.status !== "delivered";
  const askable = canWrite && open && view.proposedMinor !== null && (!deposit || deposit.status === "refunded");
  const unchargeable = askable ? unchargeableDeposit(view.proposedMinor!, currency) : null;
  const canAsk = askable && !unchargeable;
  if (!deposit && !askable) return null;
  return (
    <section className="space-y-3 rounded-lg border border-line bg-card p-4" data-testid="deposit">
      <div className="flex flex-wrap items-center justify-between gap-3">
        <h2 className="text-lg font-semibold">Deposit</h2>
        {deposit && (
          <span className={`rounded-full px-3 py-1 text-sm font-semibold ${TONE[deposit.status]}`} data-testid="deposit-status">
            {DEPOSIT_STATUS_LABELS[deposit.status]}
          </span>
        )}
      </div>
      {deposit && (
        <dl className="grid grid-cols-2 gap-x-6 gap-y-2 text-sm sm:grid-cols-4">
          <Figure label={`Asked ${formatDay(deposit.requestedAt, timeZone)}`} value={money(deposit.amountMinor)} />
          <Figure label={deposit.paidAt ? `Paid ${formatDay(deposit.paidAt, timeZone)}` : "Paid"} value={money(view.paidMinor)} />
          <Figure label={deposit.refundedAt ? `Refunded ${formatDay(deposit.refundedAt, timeZone)}` : "Refunded"} value={money(view.refundedMinor)} />
          <Figure label="Balance due" value={money(view.balanceMinor)} strong testId="balance-due" />
        </dl>
      )}
      {deposit?.status === "requested" && deposit.link && (
        <p className="break-all text-sm text-muted">
          Payment link sent to the customer: <a href={deposit.link} className="text-edge underline">{deposit.link}</a>
        </p>
      )}
      {deposit?.status === "requested" && canWrite && open && (
        // The same link again (it outlives any checkout the customer opened and left), for a reminder.
        <Form method="post" encType="multipart/form-data" className="flex flex-wrap items-center gap-3">
          <input type="hidden" name="intent" value="request-deposit" />
          <button type="submit" className="min-h-11 rounded-md border border-line bg-white px-4 font-medium hover:border-edge">
            E-mail the link again
          </button>
          <span className="text-sm text-muted">Not paid yet. The link keeps working, even after a checkout the customer left unfinished.</span>
        </Form>
      )}
      {unchargeable && <p className="text-sm text-muted">{unchargeable} Take this one another way.</p>}
      {canAsk && (
        <Form method="post" encType="multipart/form-data" className="flex flex-wrap items-center gap-3">
          <input type="hidden" name="intent" value="request-deposit" />
          <SubmitButton pendingText="Asking…">Ask a deposit of {money(view.proposedMinor!)}</SubmitButton>
          <span className="text-sm text-muted">The customer gets a payment link by e-mail.</span>
        </Form>
      )}
      {deposit?.status === "paid" && view.canRefund && view.heldMinor > 0 && (
        <details className="text-sm">
          <summary className="cursor-pointer font-medium text-bad">Refund the deposit…</summary>
          <Form method="post" encType="multipart/form-data" className="mt-3 flex flex-wrap items-center gap-3">
            <input type="hidden" name="intent" value="refund-deposit" />
            <p>
              {money(view.heldMinor)} goes back to the customer's card through the payment service. This cannot be undone.
            </p>
            <button type="submit" className="min-h-11 rounded-md border border-bad/40 bg-white px-4 font-semibold text-bad hover:bg-bad-soft">
              Refund {money(view.heldMinor)}
            </button>
          </Form>
        </details>
      )}
    </section>
  );
}

function Figure({ label, value, strong, testId }: { label: string; value: string; strong?: boolean; testId?: string }) {
  return (
    <div>
      <dt className="text-muted">{label}</dt>
      <dd className={`tabular-nums ${strong ? "text-base font-semibold" : "font-medium"}`} data-testid={testId}>
        {value}
      </dd>
    </div>
  );
}

/** A list's short word on an order's latest deposit. */
export function DepositBadge({ status }: { status: DepositStatus | null }) {
  if (!status) return <span className="text-muted">—</span>;
  return <span className={`whitespace-nowrap rounded-full px-2 py-0.5 text-xs font-semibold ${TONE[status]}`}>{DEPOSIT_FILTER_LABELS[status]}</span>;
}
