import { describe, expect, it } from "vitest";
import { mergeBatchParts, type BatchSource, type MergedPart } from "~/lib/batch-parts";
import { blankSvg, nestLaserParts, type BlankItem, type LaserBlank, type LaserSettings } from "~/lib/laser-blanks";
import { fakeClock } from "./packing-helpers";

const bed: LaserSettings = { bedLengthUm: 600_000, bedWidthUm: 400_000, spacingUm: 3_000, marginUm: 3_000 };

function laserSource(overrides: Partial<BatchSource>): BatchSource {
  return {
    orderId: "order-a",
    orderNumber: 1001,
    customerName: "Ardent–Vasquez wedding",
    lineId: "line-cards",
    productName: "Place card",
    lineQuantity: 1,
    personalisation: [],
    partName: "Card",
    lengthUm: 90_000,
    widthUm: 55_000,
    quantityPerItem: 1,
    grainLocked: false,
    process: "laser",
    ...overrides,
  };
}

const guests = Array.from({ length: 120 }, (_, i) => `Guest ${String(i + 1).padStart(3, "0")}`);

/** Two items keep the spacing when they are that far apart along at least one axis. */
function gapBetween(a: BlankItem, b: BlankItem): number {
  const gapX = Math.max(b.xUm - (a.xUm + a.lengthUm), a.xUm - (b.xUm + b.lengthUm));
  const gapY = Math.max(b.yUm - (a.yUm + a.widthUm), a.yUm - (b.yUm + b.widthUm));
  return Math.max(gapX, gapY);
}

function expectSoundBlank(blank: LaserBlank, settings: LaserSettings) {
  expect(blank.lengthUm).toBe(settings.bedLengthUm);
  expect(blank.widthUm).toBe(settings.bedWidthUm);
  for (const item of blank.items) {
    expect(item.xUm).toBeGreaterThanOrEqual(settings.marginUm);
    expect(item.yUm).toBeGreaterThanOrEqual(settings.marginUm);
    expect(item.xUm + item.lengthUm).toBeLessThanOrEqual(settings.bedLengthUm - settings.marginUm);
    expect(item.yUm + item.widthUm).toBeLessThanOrEqual(settings.bedWidthUm - settings.marginUm);
  }
  for (let i = 0; i < blank.items.length; i++)
    for (let j = i + 1; j < blank.items.length; j++)
      expect(gapBetween(blank.items[i], blank.items[j])).toBeGreaterThanOrEqual(settings.spacingUm);
}

describe("nestLaserParts", () => {
  it("nests the wedding's 120 place cards onto exactly 3 blanks (hand-worked)", () => {
    // Bed 600 × 400 mm less a 3 mm margin on each edge: usable 594 × 394 mm.
    // Kerf-aware count n = floor((W + k) / (w + k)) (TRADE-FACTS.md §2: derived, common shop practice), with
    // the spacing as k = 3: cards turned, 55 along the 600 side: floor(597 / 58) = 10 across,
    // 90 along the 400 side: floor(397 / 93) = 4 up, so a grid gives 10 × 4 = 40 per blank
    // (the other way round: floor(597 / 93) = 6 × floor(397 / 58) = 6 = 36).
    // Area bound with the spacing: each card needs (90 + 3) × (55 + 3) = 5394 mm², the usable area is
    // 594 · 394 = 234 036 mm², and 234 036 / 5394 = 43.4, so at most 43 cards per blank (grown by one
    // spacing, (594 + 3) · (394 + 3) = 237 009 mm² / 5394 = 43.9 gives 43 as well).
    // 2 blanks hold at most 86 < 120 cards, and 3 grids of 40 hold 120: exactly 3 blanks.
    const parts = mergeBatchParts([laserSource({ lineQuantity: 120, personalisation: guests })]);
    const { blanks, unplaced } = nestLaserParts(parts, bed, { now: fakeClock() });

    expect(unplaced).toEqual([]);
    expect(blanks).toHaveLength(3);
    expect(blanks.map((b) => b.index)).toEqual([0, 1, 2]);
    const items = blanks.flatMap((b) => b.items);
    expect(items).toHaveLength(120);
    for (const blank of blanks) {
      expect(blank.items.length).toBeLessThanOrEqual(43);
      expectSoundBlank(blank, bed);
    }
    for (const item of items) {
      expect(item.text).toBe(item.origin.text);
      expect(item.rotated ? [item.widthUm, item.lengthUm] : [item.lengthUm, item.widthUm]).toEqual([90_000, 55_000]);
    }
    // Every guest gets exactly one card, and blank 1 starts the list in reading order.
    expect(items.map((i) => i.text).sort()).toEqual(guests);
    expect(blanks[0].items[0].text).toBe("Guest 001");
  });

  it("leaves sawn parts alone", () => {
    const parts = mergeBatchParts([
      laserSource({ lineQuantity: 4 }),
      laserSource({ lineId: "line-sign", partName: "Welcome sign", lengthUm: 600_000, widthUm: 400_000, process: "saw" }),
    ]);
    const { blanks, unplaced } = nestLaserParts(parts, bed, { now: fakeClock() });
    expect(unplaced).toEqual([]);
    expect(blanks.flatMap((b) => b.items).map((i) => i.name)).toEqual(["Card", "Card", "Card", "Card"]);
  });

  it("lists an item larger than the bed as unplaced with a reason, and nests the rest", () => {
    const parts = mergeBatchParts([
      laserSource({ lineQuantity: 2 }),
      laserSource({ lineId: "line-plaque", partName: "Big plaque", lengthUm: 700_000, widthUm: 300_000, lineQuantity: 2 }),
    ]);
    const { blanks, unplaced } = nestLaserParts(parts, bed, { now: fakeClock() });
    expect(unplaced).toHaveLength(1);
    expect(unplaced[0]).toMatchObject({ key: "laser:700000x300000:free", name: "Big plaque", quantity: 2 });
    expect(unplaced[0].reason).toMatch(/larger than the laser bed \(600 × 400 mm, 594 × 394 mm inside the margin\)/);
    expect(blanks).toHaveLength(1);
    expect(blanks[0].items).toHaveLength(2);
  });

  it("says when a grain-locked item fits only turned", () => {
    const parts = mergeBatchParts([laserSource({ partName: "Tall sign", lengthUm: 390_000, widthUm: 500_000, grainLocked: true })]);
    const { blanks, unplaced } = nestLaserParts(parts, bed, { now: fakeClock() });
    expect(blanks).toEqual([]);
    expect(unplaced[0].reason).toMatch(/grain locked .* only turned/);
  });

  it("never turns a grain-locked item, while free ones may turn", () => {
    const locked = laserSource({ lineId: "line-locked", partName: "Grain tag", lengthUm: 120_000, widthUm: 30_000, grainLocked: true, lineQuantity: 30 });
    // Free cards nest best turned (see the hand-worked example), so the bed must allow turning them.
    const free = laserSource({ lineQuantity: 40 });
    const { blanks, unplaced } = nestLaserParts(mergeBatchParts([locked, free]), bed, { now: fakeClock() });
    expect(unplaced).toEqual([]);
    const items = blanks.flatMap((b) => b.items);
    const tags = items.filter((i) => i.name === "Grain tag");
    expect(tags).toHaveLength(30);
    for (const tag of tags) {
      expect(tag.rotated).toBe(false);
      expect([tag.lengthUm, tag.widthUm]).toEqual([120_000, 30_000]);
    }
    for (const blank of blanks) expectSoundBlank(blank, bed);
  });

  it("is repeatable for the same seed and clock", () => {
    const parts: MergedPart[] = mergeBatchParts([laserSource({ lineQuantity: 50, personalisation: guests })]);
    const a = nestLaserParts(parts, bed, { seed: 7, now: fakeClock() });
    const b = nestLaserParts(parts, bed, { seed: 7, now: fakeClock() });
    expect(a).toEqual(b);
  });
});

describe("blankSvg", () => {
  const origin = { orderId: "o", orderNumber: 1001, customerName: "Ardent–Vasquez wedding", lineId: "l", productName: "Place card", partName: "Card", itemIndex: 0, text: null };
  const blank: LaserBlank = {
    index: 0,
    lengthUm: 600_000,
    widthUm: 400_000,
    items: [
      { xUm: 3_000, yUm: 3_000, lengthUm: 90_000, widthUm: 55_000, rotated: false, name: "Card", text: "Tom & Jerry <3", origin },
      { xUm: 96_000, yUm: 3_000, lengthUm: 55_000, widthUm: 90_000, rotated: true, name: "Card", text: "Zoë Nguyễn", origin },
      { xUm: 154_000, yUm: 3_000, lengthUm: 90_000, widthUm: 55_000, rotated: false, name: "Card", text: null, origin },
    ],
  };
  const svg = blankSvg(blank, `Blank 1 of 3 — "Ardent" & co`);

  it("is a true-size SVG 1.1 document in millimetres", () => {
    expect(svg.startsWith(`<?xml version="1.0" encoding="UTF-8"`)).toBe(true);
    expect(svg).toMatch(/<svg xmlns="http:\/\/www\.w3\.org\/2000\/svg" version="1\.1" width="600mm" height="400mm" viewBox="0 0 600 400">/);
    expect(svg.trimEnd().endsWith("</svg>")).toBe(true);
    expect(svg).toContain(`<title>Blank 1 of 3 — &quot;Ardent&quot; &amp; co</title>`);
    // No scripts, no external references (the xmlns name is not fetched).
    expect(svg).not.toMatch(/<script|href=|<image|url\(/i);
  });

  it("draws one hairline outline per item and no other rectangle (no border: the blank's edge is sawn)", () => {
    const rects = svg.match(/<rect [^>]*\/>/g) ?? [];
    expect(rects).toHaveLength(3);
    for (const rect of rects) {
      expect(rect).toContain(`fill="none"`);
      expect(rect).toContain(`stroke-width="0.1"`);
    }
    // y runs downward in SVG: an item on the plan's lower edge (y = 3, width 55) is drawn at 400 − 3 − 55 = 342.
    expect(rects[0]).toContain(`x="3" y="342" width="90" height="55"`);
    expect(rects[1]).toContain(`x="96" y="307" width="55" height="90"`);
  });

  it("escapes XML specials in texts, keeps Unicode as UTF-8, and falls back to the part name", () => {
    const texts = [...svg.matchAll(/<text [^>]*>([^<]*)<\/text>/g)].map((m) => m[1]);
    expect(texts).toEqual(["Tom &amp; Jerry &lt;3", "Zoë Nguyễn", "Card"]);
    expect(svg).not.toContain("Tom & Jerry");
  });

  it("sizes each text to fit its item and turns it along a tall item", () => {
    const fonts = [...svg.matchAll(/font-size="([\d.]+)"/g)].map((m) => Number(m[1]));
    expect(fonts).toHaveLength(3);
    // "Tom & Jerry <3" is 14 characters across 90 mm: small enough to fit, large enough to read.
    expect(fonts[0]).toBeGreaterThan(5);
    expect(fonts[0] * 0.6 * 14).toBeLessThanOrEqual(90);
    expect(svg).toMatch(/<text [^>]*transform="rotate\(-90 123\.5 352\)"[^>]*>Zoë Nguyễn</);
  });

  it("wraps a long name of several words over two lines rather than engraving it tiny", () => {
    const long = blankSvg({ ...blank, items: [{ ...blank.items[0], text: "Bartholomew & Fitzwilliam-Smythe" }] }, "Blank");
    // One line: 0.85 · 90 / (32 · 0.6) = 4.0 mm; two lines, the longer "Fitzwilliam-Smythe" of 18 characters:
    // 0.85 · 90 / (18 · 0.6) = 7.08 mm, 1.2 em = 8.5 mm apart.
    expect(long).toMatch(/font-size="7\.08"/);
    expect(long).toMatch(/<tspan [^>]*>Bartholomew &amp;<\/tspan><tspan [^>]*dy="8\.5">Fitzwilliam-Smythe<\/tspan>/);
  });

  it("is well formed: every tag that opens is closed", () => {
    const body = svg.replace(/^<\?xml[^>]*\?>/, "");
    const stack: string[] = [];
    for (const [, closing, name, selfClosing] of body.matchAll(/<(\/?)([a-zA-Z]+)[^>]*?(\/?)>/g)) {
      if (selfClosing) continue;
      if (closing) expect(stack.pop()).toBe(name);
      else stack.push(name);
    }
    expect(stack).toEqual([]);
    // No raw & or < outside markup.
    expect(body.replace(/<[^>]*>/g, "")).not.toMatch(/&(?!amp;|lt;|gt;|quot;|apos;)|</);
  });
});
