import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { itemsOf, mergeBatchParts, spoiledOrigins, type BatchSource, type PartOrigin } from "~/lib/batch-parts";

function source(overrides: Partial<BatchSource>): BatchSource {
  return {
    orderId: "order-a",
    orderNumber: 1001,
    customerName: "Ardent–Vasquez wedding",
    lineId: "line-a1",
    productName: "Table number",
    lineQuantity: 1,
    personalisation: [],
    partName: "Number card",
    lengthUm: 210_000,
    widthUm: 150_000,
    quantityPerItem: 1,
    grainLocked: true,
    process: "saw",
    ...overrides,
  };
}

describe("mergeBatchParts", () => {
  it("merges identical parts from two orders into one row and keeps every origin", () => {
    const rows = mergeBatchParts([
      source({ orderId: "order-b", orderNumber: 1002, customerName: "Café Lumen", lineId: "line-b1", partName: "Card", lineQuantity: 2, personalisation: ["Table 1", "Table 2"] }),
      source({ lineQuantity: 3, personalisation: ["Table 7", "Table 8", "Table 9"] }),
    ]);
    expect(rows).toHaveLength(1);
    const [row] = rows;
    expect(row.key).toBe("saw:210000x150000:locked");
    expect(row.name).toBe("Card / Number card");
    expect(row.quantity).toBe(5);
    expect(row.origins.map((o) => [o.orderNumber, o.lineId, o.itemIndex, o.text])).toEqual([
      [1001, "line-a1", 0, "Table 7"],
      [1001, "line-a1", 1, "Table 8"],
      [1001, "line-a1", 2, "Table 9"],
      [1002, "line-b1", 0, "Table 1"],
      [1002, "line-b1", 1, "Table 2"],
    ]);
    expect(row.origins[3]).toMatchObject({ orderId: "order-b", customerName: "Café Lumen", productName: "Table number", partName: "Card" });
  });

  it("merges grain-free parts given turned, but not grain-locked ones", () => {
    const free = mergeBatchParts([
      source({ lengthUm: 150_000, widthUm: 210_000, grainLocked: false }),
      source({ lineId: "line-a2", lengthUm: 210_000, widthUm: 150_000, grainLocked: false }),
    ]);
    expect(free).toHaveLength(1);
    expect(free[0]).toMatchObject({ lengthUm: 210_000, widthUm: 150_000, quantity: 2, key: "saw:210000x150000:free" });

    const locked = mergeBatchParts([
      source({ lengthUm: 150_000, widthUm: 210_000, grainLocked: true }),
      source({ lineId: "line-a2", lengthUm: 210_000, widthUm: 150_000, grainLocked: true }),
    ]);
    expect(locked.map((r) => [r.lengthUm, r.widthUm, r.quantity])).toEqual([
      [150_000, 210_000, 1],
      [210_000, 150_000, 1],
    ]);
  });

  it("does not merge a locked part with a free one, nor a sawn part with a laser one", () => {
    const rows = mergeBatchParts([
      source({ grainLocked: true }),
      source({ lineId: "line-a2", grainLocked: false }),
      source({ lineId: "line-a3", grainLocked: false, process: "laser" }),
    ]);
    expect(rows.map((r) => r.key)).toEqual(["saw:210000x150000:free", "saw:210000x150000:locked", "laser:210000x150000:free"]);
  });

  it("gives every copy of an item that item's text", () => {
    const [row] = mergeBatchParts([source({ lineQuantity: 2, quantityPerItem: 3, personalisation: ["Zoë", "Nguyễn"] })]);
    expect(row.quantity).toBe(6);
    expect(row.origins.map((o) => [o.itemIndex, o.text])).toEqual([
      [0, "Zoë"],
      [0, "Zoë"],
      [0, "Zoë"],
      [1, "Nguyễn"],
      [1, "Nguyễn"],
      [1, "Nguyễn"],
    ]);
  });

  it("gives null texts to items past the end of the personalisation list", () => {
    const [row] = mergeBatchParts([source({ lineQuantity: 4, personalisation: ["Ana", "Ben"] })]);
    expect(row.origins.map((o) => o.text)).toEqual(["Ana", "Ben", null, null]);
    const [plain] = mergeBatchParts([source({ lineQuantity: 2, personalisation: [] })]);
    expect(plain.origins.map((o) => o.text)).toEqual([null, null]);
  });

  it("sorts sawn rows first, then by area, largest first", () => {
    const rows = mergeBatchParts([
      source({ lineId: "l1", partName: "Place card", lengthUm: 90_000, widthUm: 55_000, grainLocked: false, process: "laser" }),
      source({ lineId: "l2", partName: "Number card" }),
      source({ lineId: "l3", partName: "Welcome sign", lengthUm: 600_000, widthUm: 400_000 }),
      source({ lineId: "l4", partName: "Big laser", lengthUm: 300_000, widthUm: 300_000, process: "laser" }),
    ]);
    expect(rows.map((r) => r.name)).toEqual(["Welcome sign", "Number card", "Big laser", "Place card"]);
  });

  it("drops lines with no items", () => {
    expect(mergeBatchParts([source({ lineQuantity: 0 }), source({ lineId: "x", quantityPerItem: 0 })])).toEqual([]);
  });

  it("keeps the total count and the multiset of origins (property)", () => {
    const sourceArb = fc.record({
      orderNumber: fc.integer({ min: 1000, max: 1005 }),
      lineNo: fc.integer({ min: 1, max: 3 }),
      lineQuantity: fc.integer({ min: 0, max: 6 }),
      personalisation: fc.array(fc.string({ maxLength: 6 }), { maxLength: 8 }),
      partName: fc.constantFrom("Card", "Number card", "Sign"),
      lengthUm: fc.constantFrom(55_000, 90_000, 150_000, 210_000),
      widthUm: fc.constantFrom(55_000, 90_000, 150_000, 210_000),
      quantityPerItem: fc.integer({ min: 0, max: 3 }),
      grainLocked: fc.boolean(),
      process: fc.constantFrom("saw" as const, "laser" as const),
    });
    fc.assert(
      fc.property(fc.array(sourceArb, { maxLength: 12 }), (drafts) => {
        const sources = drafts.map(({ lineNo, ...d }) =>
          source({ ...d, orderId: `o${d.orderNumber}`, lineId: `o${d.orderNumber}-l${lineNo}` }),
        );
        const rows = mergeBatchParts(sources);

        const expectedTotal = sources.reduce((sum, s) => sum + s.lineQuantity * s.quantityPerItem, 0);
        expect(rows.reduce((sum, r) => sum + r.quantity, 0)).toBe(expectedTotal);
        for (const row of rows) expect(row.quantity).toBe(row.origins.length);

        const fingerprint = (o: PartOrigin, lengthUm: number, widthUm: number, locked: boolean, process: string) =>
          JSON.stringify([o.orderId, o.lineId, o.partName, o.itemIndex, o.text, Math.max(lengthUm, widthUm) === lengthUm || locked ? [lengthUm, widthUm] : [widthUm, lengthUm], locked, process]);
        const expected: string[] = [];
        for (const s of sources)
          for (let i = 0; i < s.lineQuantity; i++)
            for (let c = 0; c < s.quantityPerItem; c++)
              expected.push(
                fingerprint({ ...s, itemIndex: i, text: s.personalisation[i] ?? null }, s.lengthUm, s.widthUm, s.grainLocked, s.process),
              );
        const actual = rows.flatMap((r) => r.origins.map((o) => fingerprint(o, r.lengthUm, r.widthUm, r.grainLocked, r.process)));
        expect(actual.sort()).toEqual(expected.sort());

        // Merged rows are distinct and free rows are longer side first.
        expect(new Set(rows.map((r) => r.key)).size).toBe(rows.length);
        for (const row of rows) if (!row.grainLocked) expect(row.lengthUm).toBeGreaterThanOrEqual(row.widthUm);
      }),
    );
  });
});

describe("spoiled pieces and their items", () => {
  // Two table cards of one line, two stand legs per card of the same size: one merged row of 4 pieces.
  const [legs] = mergeBatchParts([
    source({ lineQuantity: 2, personalisation: ["Table 1", "Table 2"], partName: "Leg", lengthUm: 150_000, widthUm: 80_000, quantityPerItem: 2 }),
  ]);

  it("lists each item once with its pieces", () => {
    expect(itemsOf(legs.origins).map((i) => [i.first, i.pieces, i.origin.text])).toEqual([
      [0, 2, "Table 1"],
      [2, 2, "Table 2"],
    ]);
  });

  it("gives the chosen item's own pieces, and refuses more than it has or an item that is not there", () => {
    const pick = spoiledOrigins(legs.origins, 2, 2);
    expect(pick.ok && pick.origins.map((o) => [o?.text, o?.itemIndex])).toEqual([
      ["Table 2", 1],
      ["Table 2", 1],
    ]);
    expect(spoiledOrigins(legs.origins, 2, 3)).toEqual({ ok: false, field: "quantity", error: "How many: that item has 2 pieces of this part." });
    expect(spoiledOrigins(legs.origins, 1, 1)).toMatchObject({ ok: false, field: "item" }); // the middle of an item is no item
    expect(spoiledOrigins(legs.origins, 9, 1)).toMatchObject({ ok: false, field: "item" });
  });

  it("without a chosen item takes the row's first pieces; a row of no order gives pieces of no order", () => {
    const pick = spoiledOrigins(legs.origins, null, 3);
    expect(pick.ok && pick.origins.map((o) => o?.text)).toEqual(["Table 1", "Table 1", "Table 2"]);
    expect(spoiledOrigins(legs.origins, null, 5)).toEqual({ ok: false, field: "quantity", error: "How many: this batch has 4 of this part." });
    expect(spoiledOrigins([], null, 2)).toEqual({ ok: true, origins: [null, null] });
  });

  it("a recut keeps the item number it had on its line", () => {
    const [recut] = mergeBatchParts([source({ lineQuantity: 1, personalisation: ["Table 7"], firstItemIndex: 6 })]);
    expect(recut.origins.map((o) => [o.itemIndex, o.text])).toEqual([[6, "Table 7"]]);
  });
});
