// The home page's list of what is waiting: its wording, what counts as urgent, and the cut-off of long lists.
import { describe, expect, it } from "vitest";
import { AGENDA_LINES, agendaEntries, type AgendaFacts } from "~/lib/agenda";

const now = new Date("2026-12-02T09:00:00Z");
const daysAgo = (n: number) => new Date(now.getTime() - n * 86_400_000);

describe("what is waiting on the shop", () => {
  it("says nothing when the facts hold nothing, or the role reads none of them", () => {
    expect(agendaEntries({ today: "2026-12-02" }, now)).toEqual([]);
    expect(agendaEntries({ today: "2026-12-02", dueSoon: { total: 0, orders: [] }, drafts: 0, ready: 0, unbatched: { lines: 0, recuts: 0, dueBy: "2026-12-23" }, batches: [], sleds: { list: [], toleranceUmPerM: 150 }, unpaidDeposits: { count: 0, amounts: [] }, sheetsOut: [] }, now)).toEqual([]);
  });

  it("lists orders due soon, soonest first as given, flags the overdue one and counts what it does not list", () => {
    const orders = Array.from({ length: AGENDA_LINES }, (_, i) => ({ id: `o${i}`, number: 1001 + i, customerName: `Customer ${i}`, dueDate: i === 0 ? "2026-11-30" : i === 1 ? "2026-12-02" : "2026-12-10", status: "confirmed" as const }));
    const [entry] = agendaEntries({ today: "2026-12-02", dueSoon: { total: 7, orders } }, now);
    expect(entry.title).toBe("7 orders due to leave the shop within 14 days");
    expect(entry.urgent).toBe(true);
    expect(entry.lines[0]).toEqual({ text: "#1001 Customer 0 · due Mon, 30 Nov 2026 · confirmed", href: "/orders/o0", flag: "overdue" });
    expect(entry.lines[1].flag).toBe("due today");
    expect(entry.lines[2].flag).toBeUndefined();
    expect(entry.lines.at(-1)).toEqual({ text: "and 2 more" });
    expect(entry.lines).toHaveLength(AGENDA_LINES + 1);
  });

  it("is not urgent when nothing is overdue, and says one order in the singular", () => {
    const [entry] = agendaEntries({ today: "2026-12-02", dueSoon: { total: 1, orders: [{ id: "o", number: 1002, customerName: "Marisol Penhaligon", dueDate: "2026-12-16", status: "in_production" }] } }, now);
    expect(entry).toMatchObject({ title: "1 order due to leave the shop within 14 days", urgent: false, href: "/orders" });
    expect(entry.lines).toEqual([{ text: "#1002 Marisol Penhaligon · due Wed, 16 Dec 2026 · in production", href: "/orders/o", flag: undefined }]);
  });

  it("points drafts and ready orders at the order list filtered to them", () => {
    const entries = agendaEntries({ today: "2026-12-02", drafts: 2, ready: 1 }, now);
    expect(entries.map((e) => [e.title, e.href])).toEqual([
      ["2 draft orders not confirmed yet", "/orders?status=draft"],
      ["1 order ready to hand over", "/orders?status=ready"],
    ]);
  });

  it("counts lines in no batch and spoiled parts to cut again; parts to cut again are urgent (they are late already)", () => {
    const [lines] = agendaEntries({ today: "2026-12-02", unbatched: { lines: 5, recuts: 0, dueBy: "2026-12-23" } }, now);
    expect(lines).toMatchObject({ title: "5 order lines in no batch yet", href: "/batches", urgent: false, lines: [{ text: "confirmed lines due by Wed, 23 Dec 2026" }] });
    const [both] = agendaEntries({ today: "2026-12-02", unbatched: { lines: 1, recuts: 2, dueBy: "2026-12-23" } }, now);
    expect(both).toMatchObject({ title: "1 order line and 2 spoiled parts to cut again in no batch yet", urgent: true });
  });

  it("splits batches into those to plan or release and those at the saw, each linked where the work is done", () => {
    const entries = agendaEntries(
      {
        today: "2026-12-02",
        batches: [
          { id: "b3", number: 3, materialName: "Birch plywood 3 mm", status: "open" },
          { id: "b4", number: 4, materialName: "Birch plywood 6 mm", status: "planned" },
          { id: "b5", number: 5, materialName: "MDF 6 mm", status: "released" },
          { id: "b1", number: 1, materialName: "MDF 6 mm", status: "cut" },
        ],
      },
      now,
    );
    expect(entries.map((e) => ({ title: e.title, lines: e.lines }))).toEqual([
      {
        title: "2 batches to plan or release",
        lines: [
          { text: "B-0003 Birch plywood 3 mm · no plan yet", href: "/batches/b3" },
          { text: "B-0004 Birch plywood 6 mm · planned, not released", href: "/batches/b4" },
        ],
      },
      { title: "1 batch at the saw", lines: [{ text: "B-0005 MDF 6 mm · released", href: "/saw/b5" }] },
    ]);
  });

  it("asks for a five-cut test where a sled has none, an old one (over 90 days) or one out of tolerance, and not otherwise", () => {
    const sleds = {
      toleranceUmPerM: 150,
      list: [
        { id: "s1", name: "Big sled", lastCheck: { checkedAt: daysAgo(7), errorUmPerM: 31 } },
        { id: "s2", name: "Small sled", lastCheck: null },
        { id: "s3", name: "Mitre sled", lastCheck: { checkedAt: daysAgo(91), errorUmPerM: 20 } },
        { id: "s4", name: "Panel sled", lastCheck: { checkedAt: daysAgo(2), errorUmPerM: -151 } },
        { id: "s5", name: "Old but square", lastCheck: { checkedAt: daysAgo(90), errorUmPerM: 150 } },
      ],
    };
    const [entry] = agendaEntries({ today: "2026-12-02", sleds }, now);
    expect(entry).toMatchObject({ title: "3 sleds to check for square", href: "/sleds", urgent: true });
    expect(entry.lines.map((l) => l.text)).toEqual([
      "Small sled · no five-cut test on record",
      "Mitre sled · last checked 91 days ago (more than 90)",
      "Panel sled · out of the shop's tolerance at its last check",
    ]);
    expect(agendaEntries({ today: "2026-12-02", sleds: { ...sleds, list: [sleds.list[0], sleds.list[4]] } }, now)).toEqual([]);
  });

  it("names the materials that batches wait for with no full sheet in stock, and points at the stock", () => {
    const [entry] = agendaEntries({ today: "2026-12-02", sheetsOut: [{ materialName: "Birch plywood 3 mm", batches: 1 }, { materialName: "MDF 6 mm", batches: 2 }] }, now);
    expect(entry).toMatchObject({ title: "2 materials with no full sheet in stock", href: "/catalogue/materials" });
    expect(entry.lines.map((l) => l.text)).toEqual(["Birch plywood 3 mm · 1 batch waiting (racked offcuts may do)", "MDF 6 mm · 2 batches waiting (racked offcuts may do)"]);
  });

  it("sums the deposits asked and not paid, per currency", () => {
    const [entry] = agendaEntries({ today: "2026-12-02", unpaidDeposits: { count: 2, amounts: [{ amountMinor: 4440, currency: "GBP" }] } }, now);
    expect(entry).toMatchObject({ title: "2 deposits asked and not paid, £44.40 in all", href: "/ledger/deposits" });
    const [mixed] = agendaEntries({ today: "2026-12-02", unpaidDeposits: { count: 3, amounts: [{ amountMinor: 1500, currency: "EUR" }, { amountMinor: 4440, currency: "GBP" }] } }, now);
    expect(mixed.title).toBe("3 deposits asked and not paid, €15.00 and £44.40 in all");
  });
});
