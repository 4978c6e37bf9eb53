import { describe, expect, it } from "vitest";
import { describeOrderEvent, headerChanges, readOrderEvent, splitEvent, type StoredOrderEvent } from "~/lib/order-history";

const header = { customer: "Ardent–Vasquez wedding", eventDate: "2027-01-16", dueDate: "2027-01-02", notes: "" };

describe("what a header edit changed", () => {
  it("names each changed field with before and after, and nothing when nothing changed", () => {
    expect(headerChanges(header, { ...header })).toEqual([]);
    expect(headerChanges(header, { ...header, eventDate: "2027-01-23", notes: "Barn venue" })).toEqual([
      { field: "eventDate", from: "2027-01-16", to: "2027-01-23" },
      { field: "notes", from: "", to: "Barn venue" },
    ]);
  });
});

describe("the history's words", () => {
  const cases: [StoredOrderEvent, string][] = [
    [{ kind: "created", lines: 0 }, "Took the order, with no lines yet"],
    [{ kind: "created", lines: 1 }, "Took the order, with 1 line"],
    [{ kind: "created", lines: 3 }, "Took the order, with 3 lines"],
    [{ kind: "created", lines: 2, repeatOf: 991, leftOut: [] }, "Took the order, with 2 lines, repeating #991"],
    [{ kind: "created", lines: 1, repeatOf: 991, leftOut: ["Place card", "Coaster"] }, "Took the order, with 1 line, repeating #991; left out Place card, Coaster, no longer offered"],
    [{ kind: "header", changes: [{ field: "dueDate", from: "2027-01-02", to: "2026-12-30" }, { field: "customer", from: "A", to: "B" }] }, "Changed the due date from Sat, 2 Jan 2027 to Wed, 30 Dec 2026; the customer from A to B"],
    [{ kind: "header", changes: [{ field: "notes", from: "Rustic", to: "" }] }, "Changed the notes from “Rustic” to none"],
    [{ kind: "line_added", product: "Table number 150 × 210", quantity: 18 }, "Added 18 × Table number 150 × 210"],
    [{ kind: "line_removed", product: "Welcome sign", quantity: 1 }, "Removed 1 × Welcome sign"],
    [{ kind: "texts", product: "Place card", count: 1 }, "Corrected the texts of Place card (1 text)"],
    [{ kind: "status", from: "draft", to: "confirmed" }, "Confirmed the order"],
    [{ kind: "status", from: "ready", to: "delivered" }, "Marked it delivered"],
    [{ kind: "status", from: "in_production", to: "cancelled" }, "Cancelled the order, which was in production"],
    [{ kind: "confirmation_sent", to: "celia@example.com" }, "The confirmation was e-mailed to celia@example.com"],
    [{ kind: "confirmation_failed", error: "The customer has no e-mail address." }, "The confirmation e-mail did not go: The customer has no e-mail address."],
    [{ kind: "ready_notice", to: "celia@example.com" }, "The customer was e-mailed that it is ready, at celia@example.com"],
  ];
  it.each(cases)("%j reads as %s", (event, text) => {
    expect(describeOrderEvent(event)).toBe(text);
    const { kind, detail } = splitEvent(event);
    expect(readOrderEvent(kind, JSON.parse(JSON.stringify(detail)))).toEqual(event); // as stored in jsonb and read back
  });

  it("tells a deposit's money in its currency", () => {
    expect(describeOrderEvent({ kind: "deposit_asked", amountMinor: 12_540, currency: "GBP" })).toBe("Asked a deposit of £125.40");
    expect(describeOrderEvent({ kind: "deposit_paid", amountMinor: 6_000, currency: "EUR" })).toBe("The customer paid €60.00 of the deposit");
    expect(describeOrderEvent({ kind: "deposit_refunded", amountMinor: 6_000, currency: "EUR" })).toBe("Refunded €60.00 of the deposit");
  });

  it("shortens long notes to 60 characters", () => {
    const text = describeOrderEvent({ kind: "header", changes: [{ field: "notes", from: "", to: "x".repeat(200) }] });
    expect(text).toBe(`Changed the notes from none to “${"x".repeat(59)}…”`);
  });

  it("reads an unknown kind or broken particulars as nothing, never a wrong sentence", () => {
    expect(readOrderEvent("shipped", { to: "x" })).toBeNull();
    expect(readOrderEvent("line_added", { product: "Sign" })).toBeNull();
    expect(readOrderEvent("status", { from: "draft", to: "lost" })).toBeNull();
    expect(readOrderEvent("header", { changes: [{ field: "price", from: "1", to: "2" }] })).toBeNull();
    expect(readOrderEvent("created", null)).toBeNull();
    expect(readOrderEvent("created", { lines: 1, repeatOf: "991" })).toBeNull();
    expect(readOrderEvent("created", { lines: 1, repeatOf: 991, leftOut: [3] })).toBeNull();
  });
});
