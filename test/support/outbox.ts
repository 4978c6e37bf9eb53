// Reads what the fake SMTP server (test/fakes/smtp.ts, started by bin/test) received.
import { readdirSync, readFileSync } from "node:fs";
import { join } from "node:path";

export type CaughtMail = { to: string[]; subject: string; text: string };

function all(): CaughtMail[] {
  const dir = process.env.STOPWISE_OUTBOX_DIR;
  if (!dir) throw new Error("STOPWISE_OUTBOX_DIR is not set: run through bin/test");
  let files: string[] = [];
  try {
    files = readdirSync(dir).filter((f) => f.endsWith(".json")).sort();
  } catch {
    return [];
  }
  return files.map((f) => JSON.parse(readFileSync(join(dir, f), "utf8")));
}

export function mailTo(address: string): CaughtMail[] {
  return all().filter((m) => m.to.includes(address.toLowerCase()));
}

/** Waits for the next message to `address` after `seen` earlier ones. */
export async function waitForMail(address: string, seen = 0, timeoutMs = 5000): Promise<CaughtMail> {
  const deadline = Date.now() + timeoutMs;
  for (;;) {
    const mails = mailTo(address);
    if (mails.length > seen) return mails[mails.length - 1];
    if (Date.now() > deadline) throw new Error(`no mail to ${address} within ${timeoutMs} ms`);
    await new Promise((r) => setTimeout(r, 50));
  }
}

export function linkIn(mail: CaughtMail): string {
  const match = /https?:\/\/\S+/.exec(mail.text);
  if (!match) throw new Error(`no link in mail "${mail.subject}"`);
  return match[0];
}
