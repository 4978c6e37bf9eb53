import { readdir, readFile } from "node:fs/promises";
import { join } from "node:path";

// The mail the local fake SMTP server received (development and tests only).
export type OutboxMessage = { id: string; receivedAt: string; from: string; to: string[]; subject: string; text: string };

export function outboxEnabled(): boolean {
  return Boolean(process.env.STOPWISE_OUTBOX_DIR);
}

export async function readOutbox(limit = 50): Promise<OutboxMessage[]> {
  const dir = process.env.STOPWISE_OUTBOX_DIR;
  if (!dir) return [];
  const files = (await readdir(dir).catch(() => [] as string[])).filter((f) => f.endsWith(".json")).sort().reverse().slice(0, limit);
  return Promise.all(files.map(async (f) => JSON.parse(await readFile(join(dir, f), "utf8")) as OutboxMessage));
}
