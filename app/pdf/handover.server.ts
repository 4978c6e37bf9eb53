// The handover checklist as a PDF (see lib/handover.ts): points (1/72 in) throughout.
import PDFDocument from "pdfkit";
import type { HandoverSection } from "~/lib/handover";
import { collect, PAPER, registerFonts, type Paper } from "./fonts.server";

const MARGIN = 42;
const INK = "#1f2329";
const MUTED = "#5d6470";
const BOX = 10;

export interface HandoverSheet {
  title: string;
  shopName: string;
  customer: string;
  /** e-mail and phone, as far as known */
  contact: string;
  eventDate: string;
  dueDate: string;
  sections: HandoverSection[];
  /** what is still to pay, for those who may read deposits */
  money?: { total: string; paid: string; balance: string };
}

export async function handoverPdf(sheet: HandoverSheet, paper: Paper): Promise<Buffer> {
  const doc = new PDFDocument({ size: PAPER[paper], margin: MARGIN, info: { Title: sheet.title, Author: "Stopwise" } });
  const done = collect(doc);
  registerFonts(doc);
  const width = doc.page.width - 2 * MARGIN;
  const bottom = () => doc.page.height - MARGIN;
  let y = MARGIN;
  const ensure = (h: number) => {
    if (y + h <= bottom()) return;
    doc.addPage();
    y = MARGIN;
    doc.font("Plex").fontSize(9).fillColor(MUTED).text(`${sheet.title} (continued)`, MARGIN, y, { width });
    y = doc.y + 8;
  };
  const write = (text: string, size: number, font = "Plex", color = INK, gap = 3) => {
    doc.font(font).fontSize(size).fillColor(color);
    ensure(doc.heightOfString(text, { width }));
    doc.text(text, MARGIN, y, { width });
    y = doc.y + gap;
  };
  const box = (x: number, top: number) => doc.save().lineWidth(0.9).rect(x, top + 2, BOX, BOX).stroke(INK).restore();

  write(sheet.shopName, 9, "Plex", MUTED);
  write(sheet.title, 18, "Plex-Bold");
  write(`${sheet.customer}${sheet.contact ? ` · ${sheet.contact}` : ""}`, 11);
  write(`Event ${sheet.eventDate} · due ${sheet.dueDate}`, 11, "Plex", MUTED, 10);
  write("Tick each item as it goes into the box; every name is checked against its text here.", 9.5, "Plex", MUTED, 8);

  const columnWidth = (width - 12) / 2;
  for (const section of sheet.sections) {
    ensure(40);
    y += 6;
    write(section.heading, 12.5, "Plex-SemiBold", INK, 4);
    // Named items in two columns, filled row by row so the numbers read across.
    doc.font("Plex").fontSize(10.5);
    for (let i = 0; i < section.named.length; i += 2) {
      const pair = section.named.slice(i, i + 2);
      const labels = pair.map((item) => `${item.n}. ${item.text}`);
      const h = Math.max(...labels.map((l) => doc.heightOfString(l, { width: columnWidth - BOX - 6 }))) + 3;
      ensure(h);
      labels.forEach((label, k) => {
        const x = MARGIN + k * (columnWidth + 12);
        box(x, y);
        doc.font("Plex").fontSize(10.5).fillColor(INK).text(label, x + BOX + 6, y, { width: columnWidth - BOX - 6 });
      });
      y += h;
    }
    if (section.unnamed > 0) {
      const label = section.named.length ? `and ${section.unnamed} more without a text: counted ____ of ${section.unnamed}` : `counted ____ of ${section.unnamed}`;
      ensure(16);
      box(MARGIN, y);
      doc.font("Plex").fontSize(10.5).fillColor(INK).text(label, MARGIN + BOX + 6, y, { width: width - BOX - 6 });
      y = doc.y + 3;
    }
  }

  ensure(90);
  y += 14;
  if (sheet.money) write(`Order total ${sheet.money.total} · deposit held ${sheet.money.paid} · still to pay ${sheet.money.balance}`, 11, "Plex-SemiBold", INK, 10);
  write("Packed and checked by ______________________    on ____________", 10.5, "Plex", INK, 12);
  write("Handed to the customer by ______________________    on ____________", 10.5);
  doc.end();
  return done;
}
