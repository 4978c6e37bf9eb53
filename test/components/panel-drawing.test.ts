// Static render of the panel drawing and set-up list (react-dom/server): structure, not pixels.
import { createElement } from "react";
import { renderToStaticMarkup } from "react-dom/server";
import { describe, expect, it } from "vitest";
import { PanelDrawing, SetupList, type PartLabel } from "~/components/panel-drawing";
import { pack } from "~/lib/packing";
import type { Job } from "~/lib/packing/types";
import { fakeClock } from "../lib/packing-helpers";

const job: Job = {
  kerf: 3,
  trim: 10,
  stages: 3,
  objective: "sheets",
  timeLimitMs: 200,
  seed: 1,
  stock: [{ id: "birch-6", length: 1220, width: 610, quantity: null, cost: 0, grain: "length", trimmed: true }],
  parts: [
    { id: "number", length: 210, width: 150, quantity: 8, rotate: false },
    { id: "sign", length: 400, width: 150, quantity: 1, rotate: true },
  ],
};

const labels: Record<string, PartLabel> = {
  number: { name: "Number card", size: "210 × 150 mm", origins: ["#1001 Ardent–Vasquez wedding · Table 7", "#1001 Ardent–Vasquez wedding · Table 8"] },
  sign: { name: "Menu & board", size: "400 × 150 mm", origins: ["#1002 Café Lumen"] },
};

describe("PanelDrawing", () => {
  const plan = pack(job, { now: fakeClock() });
  const sheet = plan.sheets[0];
  const html = renderToStaticMarkup(createElement(PanelDrawing, { sheet, labels, kerfMm: job.kerf, title: "Panel 1 of 1 — 6 mm birch" }));

  it("draws the panel from a real plan: one focusable part per placement", () => {
    expect(plan.sheets).toHaveLength(1);
    expect(sheet.placements).toHaveLength(9);
    const parts = html.match(/<g tabindex="0" role="button"[^>]*>/g) ?? [];
    expect(parts).toHaveLength(sheet.placements.length);
    expect(parts.filter((g) => g.includes(`data-part="number"`))).toHaveLength(8);
    expect(parts.some((g) => g.includes(`aria-label="Menu &amp; board, 400 × 150 mm, for #1002 Café Lumen"`))).toBe(true);
    expect(html).toContain(`viewBox="`);
    expect(html).toContain(`width="100%"`);
    expect(html).toContain("<title");
  });

  it("labels offcuts with their size and hatches scrap", () => {
    expect(sheet.offcuts.length).toBeGreaterThan(0);
    expect(html.match(/data-kind="offcut"/g)).toHaveLength(sheet.offcuts.length);
    expect(html).toMatch(/<tspan[^>]*>offcut<\/tspan>/);
    const [big] = [...sheet.offcuts].sort((a, b) => b.length * b.width - a.length * a.width);
    expect(html).toContain(`${big.length} × ${big.width} mm`);
    if (sheet.scrap.length) expect(html).toMatch(/fill="url\(#scrap-hatch-[\w-]+\)"/);
  });

  it("numbers the cuts 1..n in their given order", () => {
    const numbers = [...html.matchAll(/data-cut="(\d+)"/g)].map((m) => Number(m[1]));
    expect(sheet.cuts.length).toBeGreaterThan(2);
    expect(numbers).toEqual(sheet.cuts.map((_, i) => i + 1));
    expect(html.match(/<line [^>]*class="stroke-rail"/g)).toHaveLength(sheet.cuts.length);
  });

  it("flips y so the plan's lower edge is at the bottom of the drawing", () => {
    const first = sheet.placements[0];
    const svgY = sheet.width - first.y - first.width;
    expect(html).toContain(`<rect x="${first.x}" y="${svgY}" width="${first.length}" height="${first.width}"`);
  });

  it("prompts for a tap before any part is chosen", () => {
    expect(html).toContain("Tap or hover over a part");
  });
});

describe("SetupList", () => {
  it("lists set-ups in order with their settings in the shop's unit and flags stops out of range", () => {
    const html = renderToStaticMarkup(
      createElement(SetupList, {
        setups: [
          { kind: "rip", setting: 150, count: 2 },
          { kind: "crosscut", setting: 210, count: 7 },
          { kind: "crosscut", setting: 20, count: 1, outsideStopRange: true },
        ],
        unit: "in",
      }),
    );
    const items = [...html.matchAll(/<li[^>]*>(.*?)<\/li>/g)].map((m) => m[1].replace(/<[^>]*>/g, ""));
    expect(items).toEqual([
      "Rip · fence ≈ 5-29/32 in · 2 cuts",
      "Crosscut · stop ≈ 8-9/32 in · 7 cuts",
      "Crosscut · stop ≈ 25/32 in · 1 cutoutside the stop block&#x27;s range: cut to a marked line",
    ]);
    expect(html.startsWith("<ol")).toBe(true);
  });
});
