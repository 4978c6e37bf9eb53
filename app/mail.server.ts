import nodemailer, { type Transporter } from "nodemailer";

// SMTP through nodemailer. bin/start and bin/test point SMTP_HOST / SMTP_PORT at the local fake
// (test/fakes/smtp.ts); a real deployment sets them, with SMTP_USER / SMTP_PASSWORD, to its provider.
let transport: Transporter | undefined;

function transporter(): Transporter {
  if (!transport) {
    const host = process.env.SMTP_HOST;
    if (!host) throw new Error("SMTP_HOST is not set: mail cannot be sent");
    const port = Number(process.env.SMTP_PORT ?? 587);
    transport = nodemailer.createTransport({
      host,
      port,
      secure: port === 465,
      // The local fake offers no TLS; anything else must.
      ignoreTLS: process.env.SMTP_INSECURE === "1",
      requireTLS: process.env.SMTP_INSECURE !== "1" && port !== 465,
      auth: process.env.SMTP_USER ? { user: process.env.SMTP_USER, pass: process.env.SMTP_PASSWORD ?? "" } : undefined,
      connectionTimeout: 5000,
      greetingTimeout: 5000,
      socketTimeout: 10000,
    });
  }
  return transport;
}

export type Mail = { to: string; subject: string; text: string; html?: string };

export async function sendMail(mail: Mail): Promise<{ messageId: string }> {
  const from = process.env.MAIL_FROM ?? "Stopwise <no-reply@stopwise.invalid>";
  const info = await transporter().sendMail({ from, ...mail });
  return { messageId: info.messageId };
}

/** The address links in e-mails point at: STOPWISE_PUBLIC_URL, or the request's own origin. */
export function publicOrigin(request: Request): string {
  return process.env.STOPWISE_PUBLIC_URL?.replace(/\/$/, "") ?? new URL(request.url).origin;
}
