// The PDF fonts: full IBM Plex Sans TTFs committed in fonts/ (the web font's subsets drop glyphs in pdfkit).
import { resolve } from "node:path";

export const PAPER = { a4: "A4", letter: "LETTER" } as const;
export type Paper = keyof typeof PAPER;

/** ?paper=a4|letter; anything else is the shop's default for its unit (Letter for inch shops). */
export function paperFrom(url: URL, unit: "mm" | "in"): Paper | null {
  const asked = url.searchParams.get("paper");
  if (asked === null || asked === "") return unit === "in" ? "letter" : "a4";
  return asked === "a4" || asked === "letter" ? asked : null;
}

export function registerFonts(doc: PDFKit.PDFDocument) {
  const dir = resolve(process.cwd(), "fonts");
  doc.registerFont("Plex", resolve(dir, "IBMPlexSans-Regular.ttf"));
  doc.registerFont("Plex-SemiBold", resolve(dir, "IBMPlexSans-SemiBold.ttf"));
  doc.registerFont("Plex-Bold", resolve(dir, "IBMPlexSans-Bold.ttf"));
  doc.font("Plex");
}

export function collect(doc: PDFKit.PDFDocument): Promise<Buffer> {
  return new Promise((done, fail) => {
    const chunks: Buffer[] = [];
    doc.on("data", (c: Buffer) => chunks.push(c));
    doc.on("end", () => done(Buffer.concat(chunks)));
    doc.on("error", fail);
  });
}

export function pdfResponse(buffer: Buffer, filename: string): Response {
  return new Response(new Uint8Array(buffer), {
    headers: {
      "Content-Type": "application/pdf",
      // A fixed name built from the batch code, never from user text (ASVS 5.0 V5.4.1).
      "Content-Disposition": `inline; filename="${filename}"`,
      "X-Content-Type-Options": "nosniff",
      "Cache-Control": "private, no-store",
    },
  });
}
