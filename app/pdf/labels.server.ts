// Part labels as a PDF: 3 × 8 per page on A4 or US Letter, each with a QR code to the order drawn as
// vector squares (stays sharp on any printer).
import PDFDocument from "pdfkit";
import QRCode from "qrcode";
import type { PartLabel } from "~/lib/part-labels";
import { collect, PAPER, registerFonts, type Paper } from "./fonts.server";

const COLS = 3;
const ROWS = 8;
const MARGIN_X = 24;
const MARGIN_Y = 30;
const PAD = 6;

function drawQr(doc: PDFKit.PDFDocument, text: string, x: number, y: number, size: number) {
  const qr = QRCode.create(text, { errorCorrectionLevel: "M" });
  const n = qr.modules.size;
  const cell = size / (n + 2); // a one-module quiet zone each side
  doc.save().fillColor("#000000");
  for (let r = 0; r < n; r++) for (let c = 0; c < n; c++) if (qr.modules.get(r, c)) doc.rect(x + (c + 1) * cell, y + (r + 1) * cell, cell, cell);
  doc.fill().restore();
}

export async function labelsPdf(labels: PartLabel[], linkOf: (label: PartLabel) => string, paper: Paper, title: string): Promise<Buffer> {
  const doc = new PDFDocument({ size: PAPER[paper], margin: 0, autoFirstPage: false, info: { Title: title, Author: "Stopwise" } });
  const done = collect(doc);
  registerFonts(doc);
  let w = 0;
  let h = 0;
  labels.forEach((label, i) => {
    const slot = i % (COLS * ROWS);
    if (slot === 0) {
      doc.addPage();
      w = (doc.page.width - 2 * MARGIN_X) / COLS;
      h = (doc.page.height - 2 * MARGIN_Y) / ROWS;
    }
    const x = MARGIN_X + (slot % COLS) * w;
    const y = MARGIN_Y + Math.floor(slot / COLS) * h;
    // A faint outline to cut or peel along.
    doc.save().lineWidth(0.3).dash(2, { space: 2 }).rect(x + 1, y + 1, w - 2, h - 2).stroke("#b9b0a0").undash().restore();
    // ~20 mm square: scans from a phone at arm's length and leaves room for the text.
    const qr = Math.min(h - 2 * PAD, 58);
    drawQr(doc, linkOf(label), x + PAD - 3, y + (h - qr) / 2, qr);
    const tx = x + PAD + qr;
    const tw = w - (tx - x) - PAD;
    doc.font("Plex").fontSize(7).fillColor("#5d6470").text(label.heading, tx, y + PAD, { width: tw, height: 9, ellipsis: true, lineBreak: false });
    doc.font("Plex-Bold").fontSize(10).fillColor("#1f2329").text(label.text ?? "—", tx, y + PAD + 10, { width: tw, height: 26, ellipsis: true });
    doc.font("Plex-SemiBold").fontSize(7.5).fillColor("#1f2329").text(label.part, tx, y + PAD + 37, { width: tw, height: 20, ellipsis: true });
    doc.font("Plex").fontSize(6.5).fillColor("#5d6470").text(`${label.product} · ${label.batch}`, tx, y + h - PAD - 8, { width: tw, height: 8, ellipsis: true, lineBreak: false });
  });
  if (labels.length === 0) {
    doc.addPage();
    doc.font("Plex").fontSize(12).text("This batch has no parts to label.", 48, 48);
  }
  doc.end();
  return done;
}
