import { describe, expect, it } from "vitest";
import { lineProgress, type LineBatch, type LineProgressInput } from "~/lib/line-progress";

const base: LineProgressInput = { orderStatus: "confirmed", materials: ["Birch plywood 6 mm"], batches: [], held: [], recuts: [] };
const batch = (status: LineBatch["status"], more: Partial<LineBatch> = {}): LineBatch => ({ material: "Birch plywood 6 mm", batchId: "b1", number: 7, status, releasedAt: null, cutAt: null, ...more });

describe("where a line is in the shop", () => {
  it("says nothing for a draft or a cancelled order, which no batch takes", () => {
    expect(lineProgress({ ...base, orderStatus: "draft" })).toEqual([]);
    expect(lineProgress({ ...base, orderStatus: "cancelled", batches: [batch("open")] })).toEqual([]);
  });

  it("follows the batch of each material from gathered to cut", () => {
    expect(lineProgress(base)).toEqual([{ text: "Birch plywood 6 mm: in no batch yet", tone: "wait" }]);
    expect(lineProgress({ ...base, held: ["Birch plywood 6 mm"] })).toEqual([{ text: "Birch plywood 6 mm: held back from batches by the planner", tone: "wait" }]);
    const link = { id: "b1", code: "B-0007" };
    expect(lineProgress({ ...base, batches: [batch("open")] })).toEqual([{ text: "Birch plywood 6 mm: in B-0007, not planned yet", tone: "wait", batch: link }]);
    expect(lineProgress({ ...base, batches: [batch("planned")] })[0].text).toBe("Birch plywood 6 mm: in B-0007, planned, not at the saw yet");
    expect(lineProgress({ ...base, batches: [batch("released", { releasedAt: "2026-12-01T09:30:00.000Z" })] })).toEqual([{ text: "Birch plywood 6 mm: at the saw in B-0007 since 1 Dec 2026", tone: "work", batch: link }]);
    for (const status of ["cut", "closed"] as const) {
      expect(lineProgress({ ...base, batches: [batch(status, { cutAt: "2026-11-14T15:00:00.000Z" })] })).toEqual([{ text: "Birch plywood 6 mm: cut in B-0007 on 14 Nov 2026", tone: "done", batch: link }]);
    }
  });

  it("keeps the materials apart: a product of two materials is in two batches", () => {
    const items = lineProgress({ ...base, materials: ["MDF 6 mm", "Birch plywood 6 mm"], batches: [batch("cut", { cutAt: "2026-11-14T15:00:00.000Z" })] });
    expect(items.map((i) => i.text)).toEqual(["MDF 6 mm: in no batch yet", "Birch plywood 6 mm: cut in B-0007 on 14 Nov 2026"]);
  });

  it("tells of a spoiled part until it is cut again", () => {
    const spoiled = { partName: "Number card", spoiledIn: 7 };
    const cut = batch("cut", { cutAt: "2026-11-14T15:00:00.000Z" });
    expect(lineProgress({ ...base, batches: [cut], recuts: [{ ...spoiled, again: null }] })[1]).toEqual({ text: "Number card spoiled in B-0007: waiting to be cut again", tone: "wait" });
    expect(lineProgress({ ...base, batches: [cut], recuts: [{ ...spoiled, again: { batchId: "b9", number: 9, status: "released" } }] })[1]).toEqual({
      text: "Number card spoiled in B-0007: to be cut again in B-0009",
      tone: "work",
      batch: { id: "b9", code: "B-0009" },
    });
    expect(lineProgress({ ...base, batches: [cut], recuts: [{ ...spoiled, again: { batchId: "b9", number: 9, status: "closed" } }] })[1].text).toBe("Number card spoiled in B-0007: cut again in B-0009");
  });
});
