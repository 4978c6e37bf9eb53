import { describe, expect, it } from "vitest";
import { depositMonths, depositOrderRows, depositLedgerCsv } from "~/lib/deposit-ledger";
import * as v from "valibot";
import { balanceOf, depositFor, depositRuleSchema, PAYMENT_MAXIMUM_MINOR, unchargeableDeposit } from "~/lib/deposits";
import { parsePeriod } from "~/lib/ledger-report";

const percent = (p: number) => ({ depositRule: "percent" as const, depositPercent: p, depositFixedMinor: null });
const fixed = (minor: number) => ({ depositRule: "fixed" as const, depositPercent: null, depositFixedMinor: minor });

describe("what the payment service takes in one payment", () => {
  // Its published minimums: USD 0.50 (docs.stripe.com/currencies, also in its SDKs' API docs), GBP 0.30
  // (help pages citing that table), JPY 50 (same table, from memory); at most eight digits of minor units.
  it("refuses a deposit below the currency's minimum or above eight digits, naming both amounts", () => {
    expect(unchargeableDeposit(49, "USD")).toBe("A deposit of US$0.49 is below the smallest payment the payment service takes (US$0.50).");
    expect(unchargeableDeposit(50, "USD")).toBeNull();
    expect(unchargeableDeposit(29, "GBP")).toMatch(/below the smallest payment .*£0\.30/);
    expect(unchargeableDeposit(30, "GBP")).toBeNull();
    expect(unchargeableDeposit(49, "JPY")).toMatch(/¥50/);
    expect(unchargeableDeposit(PAYMENT_MAXIMUM_MINOR, "EUR")).toBeNull();
    expect(unchargeableDeposit(PAYMENT_MAXIMUM_MINOR + 1, "EUR")).toMatch(/above the largest payment the payment service takes \(€999,999\.99\)/);
  });

  it("the settings refuse a fixed deposit the service would not take, on its field", () => {
    const read = (depositFixedMinor: string, currency = "EUR") => v.safeParse(depositRuleSchema(currency), { depositRule: "fixed", depositPercent: "", depositFixedMinor });
    const low = read("0.20");
    expect(low.success).toBe(false);
    expect(low.issues?.[0].message).toBe("A fixed deposit of €0.20 is below the smallest payment the payment service takes (€0.50). Enter a larger amount.");
    expect(low.issues?.[0].path?.[0].key).toBe("depositFixedMinor");
    expect(read("0.50").success).toBe(true);
    expect(read("0.30", "GBP").success).toBe(true);
  });
});

describe("the deposit a rule asks", () => {
  it("a percentage of the total, rounded half up to the minor unit, in integers", () => {
    expect(depositFor(percent(30), 41_800)).toBe(12_540);
    expect(depositFor(percent(30), 7_400)).toBe(2_220);
    expect(depositFor(percent(25), 1_002)).toBe(251); // 250.5 rounds up
    expect(depositFor(percent(25), 1_001)).toBe(250); // 250.25 rounds down
    expect(depositFor(percent(33), 2_147_483_647)).toBe(708_669_604); // exact far beyond float-safe products
    expect(depositFor(percent(100), 999)).toBe(999);
  });

  it("a fixed amount, never more than the total; nothing for no rule, an empty order or a sub-unit result", () => {
    expect(depositFor(fixed(5_000), 20_200)).toBe(5_000);
    expect(depositFor(fixed(5_000), 3_000)).toBe(3_000);
    expect(depositFor({ depositRule: "none", depositPercent: 30, depositFixedMinor: 5_000 }, 20_200)).toBeNull();
    expect(depositFor(percent(30), 0)).toBeNull();
    expect(depositFor(percent(1), 1)).toBeNull();
  });

  it("the balance due is the total less what was paid and not refunded", () => {
    expect(balanceOf(20_200, [])).toEqual({ paidMinor: 0, refundedMinor: 0, heldMinor: 0, balanceMinor: 20_200 });
    expect(balanceOf(20_200, [{ kind: "payment", amountMinor: 6_060 }])).toMatchObject({ heldMinor: 6_060, balanceMinor: 14_140 });
    expect(balanceOf(20_200, [{ kind: "payment", amountMinor: 6_060 }, { kind: "refund", amountMinor: 6_060 }])).toMatchObject({ refundedMinor: 6_060, balanceMinor: 20_200 });
  });
});

describe("the deposits ledger", () => {
  const period = parsePeriod(new URLSearchParams({ month: "2026-11" }), "2026-12-02");
  const deposit = (orderNumber: number, requestedAt: string, extra = {}) => ({
    depositId: `d${orderNumber}`,
    orderId: `o${orderNumber}`,
    orderNumber,
    customerName: `Customer ${orderNumber}`,
    orderTotalMinor: 10_000,
    amountMinor: 3_000,
    status: "paid" as const,
    requestedAt,
    ...extra,
  });

  it("lists an order when its deposit was asked or money moved in the period, with paid and refunded to date", () => {
    const rows = depositOrderRows(
      [deposit(1, "2026-10-20T10:00:00Z"), deposit(2, "2026-11-03T10:00:00Z", { status: "requested" }), deposit(3, "2026-09-01T10:00:00Z")],
      [
        { depositId: "d1", kind: "payment", amountMinor: 3_000, occurredAt: "2026-10-22T10:00:00Z" },
        { depositId: "d1", kind: "refund", amountMinor: 3_000, occurredAt: "2026-11-05T10:00:00Z" },
        { depositId: "d3", kind: "payment", amountMinor: 3_000, occurredAt: "2026-09-02T10:00:00Z" },
      ],
      period,
    );
    expect(rows.map((r) => [r.orderNumber, r.paidMinor, r.refundedMinor, r.receivedInPeriodMinor, r.refundedInPeriodMinor, r.balanceMinor])).toEqual([
      [1, 3_000, 3_000, 0, 3_000, 10_000],
      [2, 0, 0, 0, 0, 10_000],
    ]);
  });

  it("twelve months up to this one, the missing ones at zero", () => {
    const months = depositMonths([{ month: "2026-11", kind: "payment", amountMinor: 4_500 }, { month: "2026-11", kind: "refund", amountMinor: 500 }], "2026-12");
    expect(months).toHaveLength(12);
    expect(months[0].month).toBe("2026-01");
    expect(months.at(-2)).toEqual({ month: "2026-11", receivedMinor: 4_500, refundedMinor: 500, netMinor: 4_000 });
    expect(months.at(-1)).toEqual({ month: "2026-12", receivedMinor: 0, refundedMinor: 0, netMinor: 0 });
  });

  it("the CSV quotes names, defuses formula triggers and writes exact decimals", () => {
    const rows = depositOrderRows([deposit(7, "2026-11-03T10:00:00Z", { customerName: '=HYPERLINK("x"), "Ltd"' })], [], period);
    const csv = depositLedgerCsv(rows, period, "GBP");
    expect(csv.split("\r\n")[0]).toBe("# Stopwise deposits 2026-11; money in GBP");
    expect(csv).toContain(`7,"'=HYPERLINK(""x""), ""Ltd""",Deposit paid,100.00,30.00,0.00,0.00,0.00,0.00,100.00`);
  });
});
