// Reading the lines of an order form: product, quantity, personalisation typed or from a CSV, notes,
// artwork. Pure: the bytes of uploads come in, checked lines or field messages go out.
import { ARTWORK_TYPES, MAX_ARTWORK_BYTES, sniffArtwork, type ArtworkType } from "./file-sniff";
import { decodeUtf8, MAX_CSV_BYTES, MAX_PERSONALISATION_ROWS, parsePersonalisationCsv, parseTypedTexts } from "./personalisation-csv";

export const MAX_LINES = 50;
export const MAX_QUANTITY = 10_000;
export const MAX_FILES_PER_LINE = 10;
/** The longest personalisation text an item takes. */
const MAX_TEXT_CHARS = 500;

export type Upload = { name: string; bytes: Uint8Array };
export type RawLine = {
  productId: string;
  quantity: string;
  texts: string;
  csv: Upload | null;
  csvHeader: string;
  followRows: boolean;
  notes: string;
  files: Upload[];
};
export type CheckedLine = {
  productId: string;
  quantity: number;
  personalisation: string[];
  notes: string;
  files: { fileName: string; contentType: ArtworkType; bytes: Uint8Array }[];
};

const field = (index: number, name: string) => `line-${index}-${name}`;

/** The raw lines of a submitted form (fields named line-N-…); rows left wholly empty are not lines. */
export function rawLinesFrom(entries: Iterable<[string, string | Upload]>): Map<number, RawLine> {
  const lines = new Map<number, RawLine>();
  const line = (i: number) => {
    let l = lines.get(i);
    if (!l) lines.set(i, (l = { productId: "", quantity: "", texts: "", csv: null, csvHeader: "", followRows: false, notes: "", files: [] }));
    return l;
  };
  for (const [name, value] of entries) {
    const match = /^line-(\d{1,3})-(\w+)$/.exec(name);
    if (!match) continue;
    const l = line(Number(match[1]));
    const text = typeof value === "string" ? value : "";
    switch (match[2]) {
      case "product": l.productId = text.trim(); break;
      case "quantity": l.quantity = text.trim(); break;
      case "texts": l.texts = text; break;
      case "csvHeader": l.csvHeader = text; break;
      case "followRows": l.followRows = text === "on" || text === "true"; break;
      case "notes": l.notes = text.trim(); break;
      case "csv": if (typeof value !== "string") l.csv = value; break;
      case "files": if (typeof value !== "string") l.files.push(value); break;
    }
  }
  for (const [i, l] of lines) {
    const blank = !l.productId && !l.quantity && !l.texts.trim() && !l.csv && !l.notes && l.files.length === 0;
    if (blank) lines.delete(i);
  }
  return lines;
}

export function checkLines(raw: Map<number, RawLine>, productIds: Set<string>): { ok: true; lines: CheckedLine[] } | { ok: false; errors: Record<string, string> } {
  const errors: Record<string, string> = {};
  const lines: CheckedLine[] = [];
  if (raw.size > MAX_LINES) return { ok: false, errors: { lines: `An order takes at most ${MAX_LINES} lines.` } };

  for (const [i, l] of [...raw].sort(([a], [b]) => a - b)) {
    if (!l.productId) errors[field(i, "product")] = "Choose a product.";
    else if (!productIds.has(l.productId)) errors[field(i, "product")] = "That product is not offered in this shop's catalogue (it may have been retired).";

    let texts = parseTypedTexts(l.texts);
    let csvRefused = false;
    if (l.csv) {
      const text = l.csv.bytes.length > MAX_CSV_BYTES ? null : decodeUtf8(l.csv.bytes);
      if (l.csv.bytes.length > MAX_CSV_BYTES) errors[field(i, "csv")] = "The CSV file is larger than 1 MB.";
      else if (text === null) errors[field(i, "csv")] = `"${l.csv.name}" is not a text CSV file in UTF-8.`;
      else {
        const parsed = parsePersonalisationCsv(text, l.csvHeader);
        if (!parsed.ok) errors[field(i, parsed.field)] = parsed.error;
        else texts = parsed.texts;
      }
      csvRefused = Boolean(errors[field(i, "csv")] || errors[field(i, "csvHeader")]);
    }
    if (texts.length > MAX_PERSONALISATION_ROWS) errors[field(i, "texts")] = `At most ${MAX_PERSONALISATION_ROWS} texts per line.`;
    const tooLong = texts.find((t) => t.length > MAX_TEXT_CHARS);
    if (tooLong) errors[field(i, "texts")] = `A text is longer than ${MAX_TEXT_CHARS} characters: "${tooLong.slice(0, 40)}…".`;

    let quantity: number;
    if (l.followRows) {
      quantity = texts.length;
      // A refused CSV already says why there are no texts; a second message on the quantity only confuses.
      if (quantity === 0 && !csvRefused) errors[field(i, "quantity")] = "The quantity follows the texts, but there are none.";
    } else {
      quantity = /^\d+$/.test(l.quantity) ? Number(l.quantity) : NaN;
      if (!Number.isInteger(quantity) || quantity < 1) errors[field(i, "quantity")] = "Enter a whole number of items, 1 or more.";
      else if (quantity > MAX_QUANTITY) errors[field(i, "quantity")] = `At most ${MAX_QUANTITY.toLocaleString("en-GB")} items per line.`;
      else if (texts.length > 0 && texts.length !== quantity) {
        errors[field(i, "quantity")] = `${quantity} items but ${texts.length} personalisation texts: make them match, or let the quantity follow the texts.`;
      }
    }
    if (l.notes.length > 2000) errors[field(i, "notes")] = "Notes: at most 2,000 characters.";

    const files: CheckedLine["files"] = [];
    if (l.files.length > MAX_FILES_PER_LINE) errors[field(i, "files")] = `At most ${MAX_FILES_PER_LINE} artwork files per line.`;
    for (const file of l.files) {
      if (file.bytes.length > MAX_ARTWORK_BYTES) {
        errors[field(i, "files")] = `"${file.name}" is larger than 10 MB.`;
        continue;
      }
      const type = sniffArtwork(file.bytes);
      if (!type) {
        errors[field(i, "files")] = `"${file.name}" is not an SVG, PNG or PDF file (judged by its content).`;
        continue;
      }
      files.push({ fileName: safeDisplayName(file.name, type), contentType: type, bytes: file.bytes });
    }
    lines.push({ productId: l.productId, quantity, personalisation: texts, notes: l.notes, files });
  }
  return Object.keys(errors).length ? { ok: false, errors } : { ok: true, lines };
}

/** A name fit to show and to offer on download: no path, no control characters, the true extension. */
export function safeDisplayName(name: string, type: ArtworkType): string {
  const base = (name.split(/[\\/]/).pop() ?? "")
    .replace(/[\u0000-\u001f\u007f"]/g, "")
    .replace(/\.[^.]*$/, "")
    .trim()
    .slice(0, 120);
  return `${base || "artwork"}.${ARTWORK_TYPES[type]}`;
}

/**
 * New personalisation texts for a line already on an order (a misspelt name): one per item, so as many
 * as the line has items, or none to clear them.
 */
export function checkLineTexts(typed: string, quantity: number): { ok: true; texts: string[] } | { ok: false; error: string } {
  const texts = parseTypedTexts(typed);
  const tooLong = texts.find((t) => t.length > MAX_TEXT_CHARS);
  if (tooLong) return { ok: false, error: `Texts: one is longer than ${MAX_TEXT_CHARS} characters: "${tooLong.slice(0, 40)}…".` };
  if (texts.length > 0 && texts.length !== quantity) {
    return { ok: false, error: `Texts: this line has ${quantity} item${quantity === 1 ? "" : "s"} but ${texts.length} text${texts.length === 1 ? "" : "s"} were given; one text per item, or none.` };
  }
  return { ok: true, texts };
}
