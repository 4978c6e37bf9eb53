import { describe, expect, it } from "vitest";
import { handoverBoxes, handoverSections } from "~/lib/handover";

describe("the handover checklist", () => {
  it("gives each named item a box by its text, and counts items without texts together", () => {
    const sections = handoverSections([
      { productName: "Place card", quantity: 3, personalisation: ["Zoë Ardent", "Anh Ardent", "Mateo Ardent"] },
      { productName: "Table number", quantity: 18, personalisation: [] },
    ]);
    expect(sections).toEqual([
      { heading: "3 × Place card", named: [{ n: 1, text: "Zoë Ardent" }, { n: 2, text: "Anh Ardent" }, { n: 3, text: "Mateo Ardent" }], unnamed: 0 },
      { heading: "18 × Table number", named: [], unnamed: 18 },
    ]);
    expect(handoverBoxes(sections)).toBe(4);
  });

  it("never lists more items than the line has", () => {
    const [s] = handoverSections([{ productName: "Sign", quantity: 1, personalisation: ["A", "B"] }]);
    expect(s).toEqual({ heading: "1 × Sign", named: [{ n: 1, text: "A" }], unnamed: 0 });
  });
});
