import Papa from "papaparse";

// A guest list or table-number list as CSV: one text per row, from the column whose header the person
// chose (the first column when they chose none). UTF-8 with or without a byte-order mark; commas,
// semicolons or tabs; blank rows skipped.
export const MAX_PERSONALISATION_ROWS = 2000;
export const MAX_CSV_BYTES = 1024 * 1024;

export type CsvResult =
  | { ok: true; texts: string[]; headers: string[]; column: string }
  | { ok: false; error: string; headers?: string[]; field: "csv" | "csvHeader" };

export function decodeUtf8(bytes: Uint8Array): string | null {
  if (bytes.includes(0)) return null; // NUL bytes: a binary file, whatever its name says
  try {
    return new TextDecoder("utf-8", { fatal: true }).decode(bytes).replace(/^\uFEFF/, "");
  } catch {
    return null;
  }
}

export function parsePersonalisationCsv(text: string, chosenHeader = ""): CsvResult {
  const parsed = Papa.parse<string[]>(text.replace(/^\uFEFF/, ""), { skipEmptyLines: "greedy", delimitersToGuess: [",", ";", "\t", "|"] });
  const rows = parsed.data.map((row) => row.map((cell) => cell.normalize("NFC").trim()));
  if (rows.length === 0) return { ok: false, error: "The file has no rows.", field: "csv" };
  const headers = rows[0];
  const wanted = chosenHeader.trim();
  const column = wanted ? headers.findIndex((h) => h.toLowerCase() === wanted.toLowerCase()) : 0;
  if (column < 0) {
    return { ok: false, error: `No column is headed "${wanted}". The file's headers are: ${headers.map((h) => `"${h}"`).join(", ")}.`, headers, field: "csvHeader" };
  }
  const texts = rows.slice(1).map((row) => row[column] ?? "").filter((t) => t !== "");
  if (texts.length === 0) return { ok: false, error: `The column "${headers[column]}" has no texts below its header.`, headers, field: "csv" };
  if (texts.length > MAX_PERSONALISATION_ROWS) {
    return { ok: false, error: `The file has ${texts.length.toLocaleString("en-GB")} texts; a line takes at most ${MAX_PERSONALISATION_ROWS.toLocaleString("en-GB")}.`, headers, field: "csv" };
  }
  return { ok: true, texts, headers, column: headers[column] };
}

/** Typed personalisation: one text per line of the text box. */
export function parseTypedTexts(text: string): string[] {
  return text
    .split(/\r?\n/)
    .map((t) => t.normalize("NFC").trim())
    .filter((t) => t !== "");
}
