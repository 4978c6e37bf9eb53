// Deposits on orders: the shop's rule, the amount it asks, and what an order still owes. Money is
// integer minor units throughout; nothing here rounds through floating point.
import * as v from "valibot";
import { formatMoney, isCurrency, moneyInputValue, parseMoney, type Currency } from "./money";

export const DEPOSIT_RULES = ["none", "percent", "fixed"] as const;
export type DepositRuleKind = (typeof DEPOSIT_RULES)[number];
export type DepositRule = { depositRule: DepositRuleKind; depositPercent: number | null; depositFixedMinor: number | null };

export const DEPOSIT_RULE_LABELS: Record<DepositRuleKind, string> = {
  none: "No deposit",
  percent: "A percentage of the order total",
  fixed: "A fixed amount",
};

export type DepositStatus = "requested" | "paid" | "refund_pending" | "refunded";
/** The order list's deposit filter: the latest deposit's status, or "none" when none was ever asked. */
export const DEPOSIT_FILTERS = ["none", "requested", "paid", "refund_pending", "refunded"] as const;
export const DEPOSIT_FILTER_LABELS: Record<(typeof DEPOSIT_FILTERS)[number], string> = {
  none: "None asked",
  requested: "Asked, not paid",
  paid: "Paid",
  refund_pending: "Refund on its way",
  refunded: "Refunded",
};

export const DEPOSIT_STATUS_LABELS: Record<DepositStatus, string> = {
  requested: "Deposit requested",
  paid: "Deposit paid",
  refund_pending: "Refund on its way",
  refunded: "Deposit refunded",
};

/**
 * The deposit a rule asks of an order total: a percentage rounded half up to the minor unit, or the
 * fixed amount but never more than the total. Null when the rule asks nothing.
 * @example depositFor({ depositRule: "percent", depositPercent: 30, depositFixedMinor: null }, 41800) // 12540
 */
export function depositFor(rule: DepositRule, totalMinor: number): number | null {
  if (totalMinor <= 0) return null;
  if (rule.depositRule === "percent" && rule.depositPercent) {
    const amount = Number((BigInt(totalMinor) * BigInt(rule.depositPercent) * 2n + 100n) / 200n);
    return amount > 0 ? amount : null;
  }
  if (rule.depositRule === "fixed" && rule.depositFixedMinor) return Math.min(rule.depositFixedMinor, totalMinor);
  return null;
}

/** "30 % of the order total", "£50.00 fixed", "none": the rule in words. */
export function describeRule(rule: DepositRule, currency: string): string {
  if (rule.depositRule === "percent" && rule.depositPercent) return `${rule.depositPercent} % of the order total`;
  if (rule.depositRule === "fixed" && rule.depositFixedMinor) return `${formatMoney(rule.depositFixedMinor, currency)} per order (never more than the total)`;
  return "No deposit is asked";
}

export type DepositMove = { kind: "payment" | "refund"; amountMinor: number };

/** What the customer has paid, net of refunds, and what the order still owes. */
export function balanceOf(totalMinor: number, moves: DepositMove[]): { paidMinor: number; refundedMinor: number; heldMinor: number; balanceMinor: number } {
  const paidMinor = moves.filter((m) => m.kind === "payment").reduce((a, m) => a + m.amountMinor, 0);
  const refundedMinor = moves.filter((m) => m.kind === "refund").reduce((a, m) => a + m.amountMinor, 0);
  const heldMinor = paidMinor - refundedMinor;
  return { paidMinor, refundedMinor, heldMinor, balanceMinor: totalMinor - heldMinor };
}

export const DEPOSIT_PERCENT_LIMITS = { min: 1, max: 100 };

/**
 * The smallest single payment the payment service takes, per currency, in minor units. Source: the
 * service's "Minimum and maximum charge amounts" table (docs.stripe.com/currencies); USD 0.50 is also
 * stated in its SDKs' API docs and GBP 0.30 in payment help pages that cite the table; the other
 * values are from memory of that table. A currency missing here is checked by the service alone.
 */
export const PAYMENT_MINIMUM_MINOR: Record<Currency, number> = {
  USD: 50,
  EUR: 50,
  GBP: 30,
  CAD: 50,
  AUD: 50,
  NZD: 50,
  CHF: 50,
  SEK: 300,
  NOK: 300,
  DKK: 250,
  PLN: 200,
  JPY: 50,
};
/** The largest: eight digits of minor units (same sources). */
export const PAYMENT_MAXIMUM_MINOR = 99_999_999;

/** Why the payment service would refuse to take this deposit in one payment, or null when it would take it. */
export function unchargeableDeposit(amountMinor: number, currency: string): string | null {
  const minimum = isCurrency(currency) ? PAYMENT_MINIMUM_MINOR[currency] : 0;
  if (amountMinor < minimum) return `A deposit of ${formatMoney(amountMinor, currency)} is below the smallest payment the payment service takes (${formatMoney(minimum, currency)}).`;
  if (amountMinor > PAYMENT_MAXIMUM_MINOR) return `A deposit of ${formatMoney(amountMinor, currency)} is above the largest payment the payment service takes (${formatMoney(PAYMENT_MAXIMUM_MINOR, currency)}).`;
  return null;
}

/**
 * The deposit part of the settings form. Only the chosen rule's field is required; the other, when
 * filled in, must still make sense (it is kept for the next switch).
 */
export function depositRuleSchema(currency: string) {
  const percent = v.pipe(
    v.string(),
    v.rawTransform(({ dataset, addIssue, NEVER }) => {
      const text = dataset.value.trim().replace(/\s*%$/, "");
      if (text === "") return null;
      if (!/^\d+$/.test(text)) {
        addIssue({ message: "Enter a whole percentage, such as 30." });
        return NEVER;
      }
      const n = Number(text);
      if (n < DEPOSIT_PERCENT_LIMITS.min || n > DEPOSIT_PERCENT_LIMITS.max) {
        addIssue({ message: "Must be between 1 % and 100 %." });
        return NEVER;
      }
      return n;
    }),
  );
  const fixed = v.pipe(
    v.string(),
    v.rawTransform(({ dataset, addIssue, NEVER }) => {
      if (dataset.value.trim() === "") return null;
      const minor = parseMoney(dataset.value, currency);
      if (minor === null || minor <= 0 || minor > 100_000_000) {
        addIssue({ message: `Enter an amount in ${currency} above zero, such as ${moneyInputValue(5000, currency)}.` });
        return NEVER;
      }
      const unchargeable = unchargeableDeposit(minor, currency);
      if (unchargeable) {
        addIssue({ message: `${unchargeable} Enter a larger amount.`.replace(/^A deposit of/, "A fixed deposit of") });
        return NEVER;
      }
      return minor;
    }),
  );
  return v.pipe(
    v.object({
      depositRule: v.picklist(DEPOSIT_RULES, "Choose how the deposit is worked out."),
      depositPercent: v.optional(percent, ""),
      depositFixedMinor: v.optional(fixed, ""),
    }),
    v.forward(
      v.partialCheck([["depositRule"], ["depositPercent"]], (s) => s.depositRule !== "percent" || s.depositPercent !== null, "Enter the percentage of the order total to ask."),
      ["depositPercent"],
    ),
    v.forward(
      v.partialCheck([["depositRule"], ["depositFixedMinor"]], (s) => s.depositRule !== "fixed" || s.depositFixedMinor !== null, "Enter the amount to ask."),
      ["depositFixedMinor"],
    ),
  );
}

/** The deposit fields as the settings form shows them. */
export function depositFormValues(rule: DepositRule, currency: string): Record<string, string> {
  return {
    depositRule: rule.depositRule,
    depositPercent: rule.depositPercent ? String(rule.depositPercent) : "",
    depositFixedMinor: rule.depositFixedMinor ? moneyInputValue(rule.depositFixedMinor, currency) : "",
  };
}
