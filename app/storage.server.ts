import { randomUUID } from "node:crypto";
import { mkdir, readFile, rm, writeFile } from "node:fs/promises";
import { join, resolve } from "node:path";

// Uploaded files, outside the web root, under STOPWISE_UPLOADS_DIR (default: the data folder's
// uploads/). Names are random keys; a person's file name never touches the file system (ASVS 4.0.3 V12.3.1).
function root(): string {
  const configured = process.env.STOPWISE_UPLOADS_DIR ?? (process.env.STOPWISE_DATA ? join(process.env.STOPWISE_DATA, "uploads") : ".data/uploads");
  return resolve(configured);
}

function pathFor(key: string): string {
  if (!/^[0-9a-f-]{36}$/.test(key)) throw new Error("not a storage key");
  return join(root(), key.slice(0, 2), key);
}

export async function storeFile(bytes: Uint8Array): Promise<string> {
  const key = randomUUID();
  const path = pathFor(key);
  await mkdir(join(root(), key.slice(0, 2)), { recursive: true });
  await writeFile(path, bytes, { mode: 0o640 });
  return key;
}

export function readStoredFile(key: string): Promise<Buffer> {
  return readFile(pathFor(key));
}

export async function deleteStoredFiles(keys: string[]): Promise<void> {
  await Promise.all(keys.map((key) => rm(pathFor(key), { force: true })));
}
