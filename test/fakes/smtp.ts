// The local fake SMTP server of development and tests: accepts every message on loopback and keeps
// it as JSON in STOPWISE_OUTBOX_DIR, where the outbox page and the tests read it.
//   node --import tsx test/fakes/smtp.ts   (SMTP_PORT, STOPWISE_OUTBOX_DIR)
import { simpleParser } from "mailparser";
import { mkdirSync, renameSync, writeFileSync } from "node:fs";
import { join } from "node:path";
import { SMTPServer } from "smtp-server";

const port = Number(process.env.SMTP_PORT ?? 2525);
const dir = process.env.STOPWISE_OUTBOX_DIR;
if (!dir) {
  console.error("STOPWISE_OUTBOX_DIR is not set");
  process.exit(1);
}
mkdirSync(dir, { recursive: true });
let sequence = 0;

const server = new SMTPServer({
  authOptional: true,
  // Its built-in certificate has expired; the fake speaks plain SMTP on loopback only.
  disabledCommands: ["STARTTLS", "AUTH"],
  logger: false,
  async onData(stream, session, callback) {
    try {
      const mail = await simpleParser(stream);
      const id = `${Date.now()}-${String(++sequence).padStart(4, "0")}`;
      const record = {
        id,
        receivedAt: new Date().toISOString(),
        from: mail.from?.text ?? "",
        to: session.envelope.rcptTo.map((r) => r.address),
        subject: mail.subject ?? "",
        text: mail.text ?? "",
        html: typeof mail.html === "string" ? mail.html : "",
        attachments: mail.attachments.map((a) => ({ filename: a.filename ?? "", contentType: a.contentType, size: a.size })),
      };
      // Written whole, then renamed, so a reader never sees half a message.
      const file = join(dir!, `${id}.json`);
      writeFileSync(`${file}.tmp`, JSON.stringify(record, null, 2));
      renameSync(`${file}.tmp`, file);
      callback();
    } catch (error) {
      callback(error as Error);
    }
  },
});

server.on("error", (error) => console.error("fake SMTP:", error.message));
server.listen(port, "127.0.0.1", () => console.log(`fake SMTP listening on 127.0.0.1:${port}, keeping mail in ${dir}`));
const stop = () => server.close(() => process.exit(0));
process.once("SIGTERM", stop);
process.once("SIGINT", stop);
