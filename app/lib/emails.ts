// The words of Stopwise's e-mails (plain text; links on their own lines so any mail client shows them).
import { formatMoment } from "./dates";
import type { Role } from "./permissions";

/** The expiry is told on the shop's clock (`timeZone`, UTC unless given). */
export function invitationEmail(input: { shopName: string; inviterName: string; role: Role; link: string; expiresAt: Date; timeZone?: string }) {
  return {
    subject: `${input.inviterName} invites you to ${input.shopName} on Stopwise`,
    text: [
      `${input.inviterName} has invited you to join ${input.shopName} on Stopwise as ${input.role}.`,
      "",
      "Open this link to choose your name and password:",
      input.link,
      "",
      `The link works once and until ${formatMoment(input.expiresAt.toISOString(), input.timeZone)}.`,
      "If you did not expect this, ignore this e-mail.",
    ].join("\n"),
  };
}

export function passwordResetEmail(input: { name: string; link: string }) {
  return {
    subject: "Reset your Stopwise password",
    text: [
      `Hello ${input.name},`,
      "",
      "Someone (hopefully you) asked to reset the password of your Stopwise account. Open this link to choose a new one:",
      input.link,
      "",
      "The link works once and for one hour. If you did not ask, ignore this e-mail: your password stays as it is.",
    ].join("\n"),
  };
}

export function orderConfirmationEmail(input: {
  shopName: string;
  customerName: string;
  orderNumber: number;
  eventDate: string;
  dueDate: string;
  lines: { name: string; quantity: number; total: string }[];
  total: string;
  deposit?: { amount: string; link: string };
}) {
  const width = Math.max(...input.lines.map((l) => `${l.quantity} × ${l.name}`.length), 10);
  return {
    subject: `Your order #${input.orderNumber} with ${input.shopName} is confirmed`,
    text: [
      `Dear ${input.customerName},`,
      "",
      `thank you: ${input.shopName} has confirmed your order #${input.orderNumber}.`,
      "",
      ...input.lines.map((l) => `  ${`${l.quantity} × ${l.name}`.padEnd(width)}  ${l.total}`),
      `  ${"Total".padEnd(width)}  ${input.total}`,
      "",
      `Event date: ${input.eventDate}`,
      `Ready by:   ${input.dueDate}`,
      "",
      ...(input.deposit
        ? [`To start work we ask a deposit of ${input.deposit.amount}. Pay it securely here:`, input.deposit.link, "The balance is due before delivery.", ""]
        : []),
      "Reply to this e-mail if anything needs to change.",
    ].join("\n"),
  };
}

export function orderReadyEmail(input: { shopName: string; customerName: string; orderNumber: number; eventDate: string; balance?: string }) {
  return {
    subject: `Your order #${input.orderNumber} with ${input.shopName} is ready`,
    text: [
      `Dear ${input.customerName},`,
      "",
      `your order #${input.orderNumber} is made and ready to collect, in good time for your event on ${input.eventDate}.`,
      ...(input.balance ? ["", `Still to pay: ${input.balance}.`] : []),
      "",
      "Reply to this e-mail to arrange collection or delivery.",
    ].join("\n"),
  };
}

export function releaseEmail(input: { name: string; code: string; material: string; sheets: number; setups: number; link: string }) {
  return {
    subject: `Batch ${input.code} (${input.material}) is ready for the saw`,
    text: [
      `Hello ${input.name},`,
      "",
      `batch ${input.code} of ${input.material} has been released: ${input.sheets} panel${input.sheets === 1 ? "" : "s"} to pull, ${input.setups} fence and stop setting${input.setups === 1 ? "" : "s"}.`,
      "The set-up sheet and the panels to pull are here:",
      input.link,
      "",
      "Work to the saw maker's manual and the shop's own rules: guard and riving knife on, push sticks ready.",
    ].join("\n"),
  };
}

export function depositRequestEmail(input: { shopName: string; customerName: string; orderNumber: number; amount: string; total: string; link: string }) {
  return {
    subject: `Deposit for your order #${input.orderNumber} with ${input.shopName}`,
    text: [
      `Dear ${input.customerName},`,
      "",
      `${input.shopName} asks a deposit of ${input.amount} towards your order #${input.orderNumber} (total ${input.total}). Pay it securely here:`,
      input.link,
      "",
      "The balance is due before delivery. Reply to this e-mail with any question.",
    ].join("\n"),
  };
}
