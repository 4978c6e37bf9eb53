import { describe, expect, it } from "vitest";
import { monthTitle } from "~/lib/dates";
import { entriesByDay, monthWeeks, parseMonth, shiftMonth } from "~/lib/calendar";
import type { OrderHeading } from "~/lib/order-status";

describe("the calendar's month", () => {
  it("reads the month from the address, or falls back to today's", () => {
    expect(parseMonth("2027-02", "2026-12-02")).toBe("2027-02");
    for (const bad of [null, "", "2027-13", "2027-2", "27-02", "1999-12", "2027-02-01", "2027-02; drop"]) expect(parseMonth(bad, "2026-12-02")).toBe("2026-12");
  });

  it("steps across years", () => {
    expect(shiftMonth("2026-12", 1)).toBe("2027-01");
    expect(shiftMonth("2027-01", -1)).toBe("2026-12");
    expect(monthTitle("2027-01")).toBe("January 2027");
    expect(monthTitle("2026-11", "short")).toBe("Nov 2026");
  });

  // Weekdays as GNU date gives them: 1 Feb 2027 a Monday, 1 Aug 2027 a Sunday, 31 Jan 2028 a Monday.
  it("lays out Monday-first weeks that hold every day of the month", () => {
    const feb27 = monthWeeks("2027-02");
    expect(feb27).toHaveLength(4); // 1 Feb 2027 is a Monday and February has 28 days: four whole weeks
    expect(feb27[0][0]).toBe("2027-02-01");
    expect(feb27[3][6]).toBe("2027-02-28");
    const feb28 = monthWeeks("2028-02");
    expect(feb28[0][0]).toBe("2028-01-31");
    expect(feb28.flat()).toContain("2028-02-29");
    expect(feb28[feb28.length - 1][6]).toBe("2028-03-05");
    const aug27 = monthWeeks("2027-08"); // starts on a Sunday: six rows
    expect(aug27).toHaveLength(6);
    expect(aug27[0][6]).toBe("2027-08-01");
    for (const week of [...feb27, ...feb28, ...aug27]) expect(week).toHaveLength(7);
  });
});

describe("what falls on each day", () => {
  const order = (number: number, over: Partial<OrderHeading> = {}): OrderHeading => ({ id: `o${number}`, number, customer: `C${number}`, eventDate: "2027-01-16", dueDate: "2027-01-02", status: "confirmed", ...over });

  it("puts each order on its due day and its event day, dues first, by number, leaving out cancelled ones", () => {
    const days = entriesByDay([order(1002, { dueDate: "2027-01-16" }), order(1001), order(1003, { status: "cancelled" })], "2026-12-02");
    expect(days["2027-01-02"].map((e) => [e.kind, e.order.number])).toEqual([["due", 1001]]);
    expect(days["2027-01-16"].map((e) => [e.kind, e.order.number])).toEqual([
      ["due", 1002],
      ["event", 1001],
      ["event", 1002],
    ]);
    expect(Object.values(days).flat().some((e) => e.order.number === 1003)).toBe(false);
  });

  it("marks a due day past as late until the order is ready", () => {
    const late = (status: OrderHeading["status"], today: string) => entriesByDay([order(1, { status })], today)["2027-01-02"][0].late;
    expect(late("confirmed", "2027-01-03")).toBe(true);
    expect(late("in_production", "2027-01-03")).toBe(true);
    expect(late("confirmed", "2027-01-02")).toBe(false); // due today is not late yet
    expect(late("ready", "2027-01-03")).toBe(false);
    expect(late("delivered", "2027-01-03")).toBe(false);
  });
});
