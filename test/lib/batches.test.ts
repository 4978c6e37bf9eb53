import { describe, expect, it } from "vitest";
import { batchesToList, proposalPreview } from "~/lib/batches";

describe("the batches page at a busy shop's scale", () => {
  it("shows a proposal's counts and only its first lines, then its recuts in what room is left", () => {
    const lines = Array.from({ length: 30 }, (_, i) => ({ lineId: `l${i}`, quantity: i + 1 }));
    const recuts = [{ id: "r1" }, { id: "r2" }];
    const big = proposalPreview({ materialId: "m", materialName: "Birch 6 mm", lines, recuts }, 12);
    expect(big.lines.map((l) => l.lineId)).toEqual(lines.slice(0, 12).map((l) => l.lineId));
    expect(big).toMatchObject({ recuts: [], lineCount: 30, itemCount: 465, recutCount: 2, notListed: 20 });
    const small = proposalPreview({ materialId: "m", materialName: "Birch 6 mm", lines: lines.slice(0, 3), recuts }, 12);
    expect(small).toMatchObject({ recuts, lineCount: 3, itemCount: 6, notListed: 0 });
  });

  it("lists every batch still on its way and the latest finished ones, counting the rest", () => {
    const batches = [
      { id: "open", status: "open" },
      { id: "released", status: "released" },
      ...Array.from({ length: 25 }, (_, i) => ({ id: `cut${i}`, status: i % 2 ? "cut" : "closed" })),
    ];
    const { shown, olderFinished } = batchesToList(batches, 20);
    expect(shown.map((b) => b.id)).toEqual(["open", "released", ...Array.from({ length: 20 }, (_, i) => `cut${i}`)]);
    expect(olderFinished).toBe(5);
  });
});
