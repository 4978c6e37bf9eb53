// Artwork uploads are judged by their bytes, not their name or the browser's word (OWASP ASVS 4.0.3 V12.2.1).
export const ARTWORK_TYPES = { "image/svg+xml": "svg", "image/png": "png", "application/pdf": "pdf" } as const;
export type ArtworkType = keyof typeof ARTWORK_TYPES;
export const MAX_ARTWORK_BYTES = 10 * 1024 * 1024;

export function sniffArtwork(bytes: Uint8Array): ArtworkType | null {
  const starts = (...sig: number[]) => sig.every((b, i) => bytes[i] === b);
  if (starts(0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a)) return "image/png";
  if (starts(0x25, 0x50, 0x44, 0x46, 0x2d)) return "application/pdf"; // %PDF-
  // SVG is text: an <svg element within the first few kilobytes, after any XML prolog or comments.
  const head = new TextDecoder("utf-8", { fatal: false }).decode(bytes.subarray(0, 4096)).replace(/^\uFEFF/, "").trimStart();
  if (/^(<\?xml[^>]*>\s*)?(<!--[\s\S]*?-->\s*)*(<!DOCTYPE svg[^>]*>\s*)?<svg[\s>]/i.test(head)) return "image/svg+xml";
  return null;
}
