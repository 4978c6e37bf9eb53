// The set-up sheet as a PDF: lays out what app/lib/setup-sheet.ts derived. Points (1/72 in) throughout.
// Panel drawings follow the plan view's convention: x along the panel's length, left to right; the
// plan's y (up from the lower edge) drawn upwards.
import PDFDocument from "pdfkit";
import { PARTS_LEAD, type PanelView, type SetupRow, type SetupSheet } from "~/lib/setup-sheet";
import { inferTrim, PANEL_LOOK } from "~/lib/panel-look";
import { collect, PAPER, registerFonts, type Paper } from "./fonts.server";

const MARGIN = 36;
const INK = "#1f2329";
const MUTED = "#5d6470";
const LINE = "#b9b0a0";
const BAD = "#a12a2a";
const PART_FILL = "#f6e3d4";
const PART_STROKE = "#b8561d";
const OFFCUT_FILL = "#d9e2ea";
const RAIL = "#1f2d3a";

type Doc = PDFKit.PDFDocument;

class Sheet {
  y = MARGIN;
  constructor(readonly doc: Doc) {}
  get width() {
    return this.doc.page.width - 2 * MARGIN;
  }
  get bottom() {
    return this.doc.page.height - MARGIN - 14; // room for the footer
  }
  /** Starts a new page unless `height` points still fit on this one. */
  ensure(height: number) {
    if (this.y + height > this.bottom) {
      this.doc.addPage();
      this.y = MARGIN;
    }
  }
  text(text: string, options: { size?: number; font?: string; color?: string; x?: number; width?: number; gap?: number } = {}) {
    const { size = 10, font = "Plex", color = INK, x = MARGIN, width = this.width - (x - MARGIN), gap = 2 } = options;
    this.doc.font(font).fontSize(size).fillColor(color);
    this.ensure(this.doc.heightOfString(text, { width }));
    this.doc.text(text, x, this.y, { width });
    this.y = this.doc.y + gap;
  }
  /** A line with a box to tick in front of it. */
  check(text: string, size = 10.5) {
    this.doc.font("Plex").fontSize(size);
    this.ensure(this.doc.heightOfString(text, { width: this.width - 18 }));
    this.doc.save().lineWidth(0.9).rect(MARGIN, this.y + 2, 9, 9).stroke(INK).restore();
    this.text(text, { size, x: MARGIN + 16 });
  }
  heading(text: string) {
    this.ensure(40);
    this.y += 8;
    this.text(text, { size: 13, font: "Plex-Bold", gap: 4 });
  }
}

function warningBox(s: Sheet, message: string) {
  const { doc } = s;
  doc.font("Plex").fontSize(11);
  const h = doc.heightOfString(message, { width: s.width - 24 }) + 34;
  s.ensure(h);
  doc.save().lineWidth(2.5).rect(MARGIN, s.y, s.width, h).fillAndStroke("#f8dede", BAD).restore();
  doc.font("Plex-Bold").fontSize(13).fillColor(BAD).text("WARNING: SLED", MARGIN + 12, s.y + 8, { width: s.width - 24 });
  doc.font("Plex").fontSize(11).fillColor(INK).text(message, MARGIN + 12, doc.y + 2, { width: s.width - 24 });
  s.y += h + 8;
}

function cautionsBox(s: Sheet, cautions: string[]) {
  const { doc } = s;
  const inner = s.width - 24;
  doc.font("Plex").fontSize(9.5);
  const body = cautions.map((c) => doc.heightOfString(`•  ${c}`, { width: inner }) + 2).reduce((a, b) => a + b, 0);
  const h = body + 30;
  s.ensure(h);
  doc.save().lineWidth(1.5).rect(MARGIN, s.y, s.width, h).stroke(RAIL).restore();
  doc.font("Plex-Bold").fontSize(11).fillColor(INK).text("At the saw, every time", MARGIN + 12, s.y + 8);
  let y = doc.y + 3;
  for (const c of cautions) {
    doc.font("Plex").fontSize(9.5).fillColor(INK).text(`•  ${c}`, MARGIN + 12, y, { width: inner });
    y = doc.y + 2;
  }
  s.y += h + 8;
}

/** One square per cut to tick, up to 30; beyond that a box to keep a running tally. */
function tally(doc: Doc, x: number, y: number, width: number, count: number): number {
  const box = 11;
  const gap = 3;
  if (count > 30) {
    doc.save().lineWidth(1).rect(x, y, width, 26).stroke(INK).restore();
    doc.font("Plex").fontSize(8).fillColor(MUTED).text(`tally: ____ of ${count}`, x + 4, y + 8, { width: width - 8 });
    return 26;
  }
  const perRow = Math.max(1, Math.floor((width + gap) / (box + gap)));
  for (let i = 0; i < count; i++) {
    const cx = x + (i % perRow) * (box + gap);
    const cy = y + Math.floor(i / perRow) * (box + gap);
    doc.save().lineWidth(0.8).rect(cx, cy, box, box).stroke(INK).restore();
  }
  return Math.ceil(count / perRow) * (box + gap);
}

function setupBlock(s: Sheet, row: SetupRow) {
  const { doc } = s;
  const tallyWidth = 130;
  const textWidth = s.width - tallyWidth - 16;
  const left = MARGIN;
  const lines: { text: string; size: number; font: string; color: string }[] = [
    ...row.flags.map((f) => ({ text: `!  ${f}`, size: 9.5, font: "Plex-Bold", color: BAD })),
    ...row.notes.map((n) => ({ text: n, size: 9, font: "Plex-SemiBold", color: INK })),
    { text: row.where, size: 9, font: "Plex", color: MUTED },
    ...(row.parts.length ? [{ text: `${PARTS_LEAD[row.kind]}:`, size: 8, font: "Plex", color: MUTED }] : []),
    ...row.parts.map((p) => ({ text: `${p.count} × ${p.label}${p.orders ? ` — ${p.orders}` : ""}`, size: 9, font: "Plex", color: INK })),
  ].filter((l) => l.text);
  const heading = `${row.number}.  ${row.heading}   ${row.count} ${row.count === 1 ? "cut" : "cuts"}`;
  doc.font("Plex-SemiBold").fontSize(12);
  let h = doc.heightOfString(heading, { width: textWidth }) + 4;
  for (const l of lines) h += doc.font(l.font).fontSize(l.size).heightOfString(l.text, { width: textWidth }) + 1;
  const tallyH = row.count > 30 ? 26 : Math.ceil(row.count / Math.floor((tallyWidth + 3) / 14)) * 14;
  h = Math.max(h, tallyH + 12) + 8;
  s.ensure(h);
  const top = s.y;
  if (row.flags.length) doc.save().rect(left - 6, top - 3, 3, h - 6).fill(BAD).restore();
  doc.font("Plex-SemiBold").fontSize(12).fillColor(INK).text(heading, left, top, { width: textWidth });
  let y = doc.y + 2;
  for (const l of lines) {
    doc.font(l.font).fontSize(l.size).fillColor(l.color).text(l.text, left + 14, y, { width: textWidth - 14 });
    y = doc.y + 1;
  }
  doc.font("Plex").fontSize(7).fillColor(MUTED).text("tick each cut", MARGIN + s.width - tallyWidth, top, { width: tallyWidth });
  tally(doc, MARGIN + s.width - tallyWidth, top + 10, tallyWidth, row.count);
  s.y = top + h;
  doc.save().lineWidth(0.5).moveTo(MARGIN, s.y - 4).lineTo(MARGIN + s.width, s.y - 4).stroke(LINE).restore();
}

function fitLabel(doc: Doc, text: string, w: number, h: number): number | null {
  for (let size = 9; size >= 5; size -= 0.5) {
    doc.font("Plex-SemiBold").fontSize(size);
    if (doc.widthOfString(text) <= w * 0.92 && size * 1.2 <= h * 0.9) return size;
  }
  return null;
}

const HATCH_GAP = 3.5; // pt between hatch lines, at right angles to them

/** Scrap as on screen: the pale red ground, then "/" lines clipped to the rectangle. */
function hatchScrap(doc: Doc, x: number, y: number, w: number, h: number) {
  doc.save().rect(x, y, w, h).fill(PANEL_LOOK.scrapGround);
  doc.rect(x, y, w, h).clip();
  const step = HATCH_GAP * Math.SQRT2; // along the top edge, for lines at 45°
  for (let at = x + step / 2; at < x + w + h; at += step) doc.moveTo(at - h, y + h).lineTo(at, y);
  doc.lineWidth(HATCH_GAP * PANEL_LOOK.scrapLineShare).strokeOpacity(PANEL_LOOK.scrapLineOpacity).stroke(PANEL_LOOK.scrapLine);
  doc.restore();
}

function panelDrawing(s: Sheet, panel: PanelView, kerfMm: number) {
  const { doc } = s;
  const { sheet } = panel;
  const maxH = 340;
  const scale = Math.min(s.width / sheet.length, maxH / sheet.width);
  const w = sheet.length * scale;
  const h = sheet.width * scale;
  s.ensure(h + 40);
  s.text(panel.title, { size: 11, font: "Plex-Bold", gap: 4 });
  const x0 = MARGIN;
  const y0 = s.y;
  const X = (x: number) => x0 + x * scale;
  const Y = (y: number) => y0 + h - y * scale; // plan y up from the lower edge

  // The screen's look (lib/panel-look.ts): trim band, the panel inside it, scrap hatched.
  const trim = inferTrim(sheet) * scale;
  doc.save().rect(x0, y0, w, h).fillOpacity(PANEL_LOOK.trimBandOpacity).fill(PANEL_LOOK.trimBand).restore();
  doc.save().rect(x0 + trim, y0 + trim, Math.max(0, w - 2 * trim), Math.max(0, h - 2 * trim)).fill(PANEL_LOOK.inside).restore();
  doc.save().lineWidth(1.2).rect(x0, y0, w, h).stroke(RAIL).restore();
  for (const r of sheet.scrap) hatchScrap(doc, X(r.x), Y(r.y + r.width), r.length * scale, r.width * scale);
  for (const o of sheet.offcuts) {
    doc.save().lineWidth(0.6).rect(X(o.x), Y(o.y + o.width), o.length * scale, o.width * scale).fillAndStroke(OFFCUT_FILL, RAIL).restore();
    const label = "offcut: rack it";
    const size = fitLabel(doc, label, o.length * scale, o.width * scale);
    if (size) doc.font("Plex-SemiBold").fontSize(size).fillColor(RAIL).text(label, X(o.x), Y(o.y + o.width / 2) - size * 0.6, { width: o.length * scale, align: "center", lineBreak: false });
  }
  for (const p of sheet.placements) {
    const px = X(p.x);
    const py = Y(p.y + p.width);
    const pw = p.length * scale;
    const ph = p.width * scale;
    doc.save().lineWidth(0.6).rect(px, py, pw, ph).fillAndStroke(PART_FILL, PART_STROKE).restore();
    const name = panel.labels[p.partId] ?? p.partId;
    const size = fitLabel(doc, name, pw, ph);
    if (size) doc.font("Plex-SemiBold").fontSize(size).fillColor(INK).text(name, px, py + ph / 2 - size * 0.6, { width: pw, align: "center", lineBreak: false });
  }
  // Cut lines at the kerf's centre, numbered at their start.
  sheet.cuts.forEach((cut) => {
    const c = cut.at + kerfMm / 2;
    const [x1, y1, x2, y2] = cut.axis === "y" ? [X(cut.from), Y(c), X(cut.to), Y(c)] : [X(c), Y(cut.from), X(c), Y(cut.to)];
    doc.save().lineWidth(1.1).moveTo(x1, y1).lineTo(x2, y2).stroke(RAIL).restore();
  });
  sheet.cuts.forEach((cut, i) => {
    const c = cut.at + kerfMm / 2;
    const [cx, cy] = cut.axis === "y" ? [X(cut.from), Y(c)] : [X(c), Y(cut.from)];
    const r = 6;
    doc.save().circle(cx, cy, r).fillAndStroke(RAIL, "#ffffff").restore();
    doc.font("Plex-Bold").fontSize(i + 1 >= 100 ? 5 : 6.5).fillColor("#ffffff").text(String(i + 1), cx - r, cy - 4.2, { width: 2 * r, align: "center", lineBreak: false });
  });
  s.y = y0 + h + 6;
  if (panel.breakdown.length) s.text(`Breakdown: ${panel.breakdown.join(" · ")}`, { size: 9 });
  s.text(panel.offcutsToRack.length ? `Offcuts to rack from this panel: ${panel.offcutsToRack.join(" · ")}` : "No offcuts to rack from this panel.", { size: 9, color: MUTED, gap: 10 });
}

export async function setupSheetPdf(sheet: SetupSheet, kerfMm: number, paper: Paper): Promise<Buffer> {
  const doc = new PDFDocument({ size: PAPER[paper], margin: MARGIN, bufferPages: true, info: { Title: sheet.title, Author: "Stopwise", Subject: sheet.subtitle } });
  const done = collect(doc);
  registerFonts(doc);
  const s = new Sheet(doc);

  s.text(sheet.title, { size: 22, font: "Plex-Bold", gap: 2 });
  s.text(sheet.subtitle, { size: 10.5, color: MUTED, gap: 8 });
  if (sheet.warning) warningBox(s, sheet.warning);

  s.heading("Pull these");
  for (const line of sheet.pull) s.check(line);
  if (sheet.unplaced.length) for (const u of sheet.unplaced) s.text(`Not in this plan: ${u}`, { size: 10, font: "Plex-Bold", color: BAD });

  s.heading("Saw, kerf and sled");
  s.text(`${sheet.saw} · kerf ${sheet.kerf}`, { size: 10 });
  s.text(sheet.sled, { size: 10 });
  for (const line of sheet.sledCheck) s.text(line, { size: 10 });
  s.y += 6;
  cautionsBox(s, sheet.cautions);

  s.heading("Set-ups in cutting order");
  s.text("Set each fence or stop once and make every cut listed before moving it. Stops are measured from the blade's cut line; fence and stop travel one way.", { size: 9, color: MUTED, gap: 8 });
  if (!sheet.setups.length) s.text("No saw set-ups in this plan.");
  for (const row of sheet.setups) setupBlock(s, row);

  s.heading("Panels, to scale");
  s.text("Numbers are the cut order on each panel. Parts are labelled; blue pieces are offcuts to rack, red hatching is scrap.", { size: 9, color: MUTED, gap: 6 });
  for (const panel of sheet.panels) panelDrawing(s, panel, kerfMm);

  s.heading("Offcuts to rack");
  if (!sheet.offcutsToRack.length) s.text("None.", { size: 10 });
  for (const o of sheet.offcutsToRack) s.check(`${o}   rack place: ______________`);

  const range = doc.bufferedPageRange();
  for (let i = range.start; i < range.start + range.count; i++) {
    doc.switchToPage(i);
    const bottom = doc.page.height - MARGIN + 4;
    doc.page.margins.bottom = 0; // writing in the bottom margin must not open a new page
    doc.font("Plex").fontSize(8).fillColor(MUTED).text(`${sheet.title} · page ${i + 1} of ${range.count}`, MARGIN, bottom, { width: doc.page.width - 2 * MARGIN, align: "right", lineBreak: false });
  }
  doc.end();
  return done;
}
