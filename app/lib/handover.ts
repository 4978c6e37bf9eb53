// The handover checklist: every item of an order, each personalised one by its text, to tick off as
// it goes into the box, so no guest's place card is missing when the customer collects. Pure.

export interface HandoverLine {
  productName: string;
  quantity: number;
  personalisation: string[];
}

export interface HandoverSection {
  heading: string;
  /** one per named item, numbered as on the order */
  named: { n: number; text: string }[];
  /** items with no text of their own, counted together */
  unnamed: number;
}

export function handoverSections(lines: HandoverLine[]): HandoverSection[] {
  return lines.map((line) => {
    const named = line.personalisation.slice(0, line.quantity).map((text, i) => ({ n: i + 1, text }));
    return { heading: `${line.quantity} × ${line.productName}`, named, unnamed: line.quantity - named.length };
  });
}

/** How many boxes the checklist has: one per named item and one per line of unnamed ones. */
export function handoverBoxes(sections: HandoverSection[]): number {
  return sections.reduce((n, s) => n + s.named.length + (s.unnamed > 0 ? 1 : 0), 0);
}
