import { describe, expect, it } from "vitest";
import { depositMonths, depositOrderRows, depositLedgerCsv } from "~/lib/deposit-ledger";
import { balanceOf, depositFor } from "~/lib/deposits";
import { parsePeriod } from "~/lib/ledger-report";

const percent = (p: number) => ({ depositRule: "percent" as const, depositPercent: p, depositFixedMinor: null });
const fixed = (minor: number) => ({ depositRule: "fixed" as const, depositPercent: null, depositFixedMinor: minor });

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
