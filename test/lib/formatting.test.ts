// Money and dates as lists show them; the formatters are made once and reused, so mixed calls must not leak into each other.
import { describe, expect, it } from "vitest";
import { formatDate } from "~/lib/dates";
import { formatMoney } from "~/lib/money";

describe("formatMoney", () => {
  it("formats each currency with its own minor units, however calls interleave", () => {
    expect(formatMoney(123456, "GBP")).toBe("£1,234.56");
    expect(formatMoney(1500, "JPY")).toBe("JP¥1,500");
    expect(formatMoney(5, "GBP")).toBe("£0.05");
    expect(formatMoney(-250, "EUR")).toBe("-€2.50");
    expect(formatMoney(1500, "JPY")).toBe("JP¥1,500");
  });

  it("refuses a currency code Intl does not know, every time", () => {
    expect(() => formatMoney(100, "12")).toThrow(RangeError);
    expect(() => formatMoney(100, "12")).toThrow(RangeError);
  });
});

describe("formatDate", () => {
  it("gives the weekday and date of a calendar day, the same on a repeat", () => {
    expect(formatDate("2027-01-16")).toBe("Sat, 16 Jan 2027");
    expect(formatDate("2027-01-17")).toBe("Sun, 17 Jan 2027");
    expect(formatDate("2027-01-16")).toBe("Sat, 16 Jan 2027");
  });
});
