import { data } from "react-router";
import type { Upload } from "~/lib/order-lines";
import { deleteStoredFiles, storeFile } from "~/storage.server";
import type { CheckedLine } from "~/lib/order-lines";
import type { NewLine } from "./orders.server";

// Fifty lines of artwork at 10 MB would be absurd; a whole form is refused above this, before parsing.
const MAX_FORM_BYTES = 64 * 1024 * 1024;

/** The form's fields, with uploaded files read into bytes (empty file inputs dropped). */
export async function readOrderForm(request: Request): Promise<{ fields: Record<string, string>; entries: [string, string | Upload][] }> {
  const length = Number(request.headers.get("Content-Length") ?? 0);
  if (length > MAX_FORM_BYTES) throw data("The upload is larger than 64 MB in all; attach fewer or smaller files.", { status: 413 });
  const form = await request.formData();
  const entries: [string, string | Upload][] = [];
  const fields: Record<string, string> = {};
  for (const [name, value] of form) {
    if (typeof value === "string") {
      entries.push([name, value]);
      fields[name] ??= value;
    } else if (value.size > 0) {
      entries.push([name, { name: value.name, bytes: new Uint8Array(await value.arrayBuffer()) }]);
    }
  }
  return { fields, entries };
}

/**
 * Stores the artwork of checked lines, then runs `write` (one database transaction). When `write`
 * fails, the stored bytes are deleted again, so a failed save leaves no orphan files.
 */
export async function withStoredArtwork<T>(lines: CheckedLine[], write: (lines: NewLine[]) => Promise<T>): Promise<T> {
  const stored: string[] = [];
  try {
    const newLines: NewLine[] = [];
    for (const line of lines) {
      const files = [];
      for (const file of line.files) {
        const storageKey = await storeFile(file.bytes);
        stored.push(storageKey);
        files.push({ fileName: file.fileName, contentType: file.contentType, sizeBytes: file.bytes.length, storageKey });
      }
      newLines.push({ productId: line.productId, quantity: line.quantity, personalisation: line.personalisation, notes: line.notes, files });
    }
    return await write(newLines);
  } catch (error) {
    await deleteStoredFiles(stored);
    throw error;
  }
}
