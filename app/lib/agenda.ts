// What is waiting on the shop, for the home page: one entry per kind of work, a few lines each, every
// one linked to the place where the work is done. The model gathers only the facts a role may read
// (the permission table decides), so a role sees only what it can act on or read.
import { countOf } from "./plural";
import { batchCode } from "./batches";
import { formatDate } from "./dates";
import { formatMoney } from "./money";
import { STATUS_LABELS, type OrderStatus } from "./order-status";
import { checkStatus, STALE_AFTER_DAYS, type SledCheckFacts } from "./sled";

/** orders due within this many days count as due soon */
export const DUE_SOON_DAYS = 14;
/** order lines due within this many days and in no batch yet are waiting to be batched (the batches page's default due-by) */
export const BATCH_AHEAD_DAYS = 21;
/** lines listed under an entry; the rest are counted */
export const AGENDA_LINES = 5;

export type AgendaOrder = { id: string; number: number; customerName: string; dueDate: string; status: OrderStatus };
export type AgendaBatch = { id: string; number: number; materialName: string; status: "open" | "planned" | "released" | "cut" | "closed" };
export type AgendaSled = { id: string; name: string; lastCheck: SledCheckFacts | null };

/** What the model found; a kind the role may not read is left out. */
export type AgendaFacts = {
  today: string;
  dueSoon?: { total: number; orders: AgendaOrder[] };
  drafts?: number;
  ready?: number;
  unbatched?: { lines: number; recuts: number; dueBy: string };
  batches?: AgendaBatch[];
  sleds?: { list: AgendaSled[]; toleranceUmPerM: number };
  unpaidDeposits?: { count: number; amounts: { amountMinor: number; currency: string }[] };
  /** materials with batches waiting to be cut and not one full sheet on hand */
  sheetsOut?: { materialName: string; batches: number }[];
};

export type AgendaLine = { text: string; href?: string; flag?: string };
export type AgendaEntry = { key: string; title: string; href: string; lines: AgendaLine[]; urgent: boolean };


function more(total: number, shown: number): AgendaLine[] {
  return total > shown ? [{ text: `and ${total - shown} more` }] : [];
}

export function agendaEntries(facts: AgendaFacts, now: Date): AgendaEntry[] {
  const entries: AgendaEntry[] = [];
  const { today } = facts;

  if (facts.dueSoon && facts.dueSoon.total > 0) {
    const { total, orders } = facts.dueSoon;
    const shown = orders.slice(0, AGENDA_LINES);
    entries.push({
      key: "due-soon",
      title: `${countOf(total, "order")} due to leave the shop within ${DUE_SOON_DAYS} days`,
      href: "/orders",
      urgent: shown.some((o) => o.dueDate < today),
      lines: [
        ...shown.map((o) => ({
          text: `#${o.number} ${o.customerName} · due ${formatDate(o.dueDate)} · ${STATUS_LABELS[o.status].toLowerCase()}`,
          href: `/orders/${o.id}`,
          flag: o.dueDate < today ? "overdue" : o.dueDate === today ? "due today" : undefined,
        })),
        ...more(total, shown.length),
      ],
    });
  }

  if (facts.drafts) {
    entries.push({ key: "drafts", title: `${countOf(facts.drafts, "draft order")} not confirmed yet`, href: "/orders?status=draft", urgent: false, lines: [] });
  }
  if (facts.ready) {
    entries.push({ key: "ready", title: `${countOf(facts.ready, "order")} ready to hand over`, href: "/orders?status=ready", urgent: false, lines: [] });
  }

  if (facts.unbatched && facts.unbatched.lines + facts.unbatched.recuts > 0) {
    const { lines, recuts, dueBy } = facts.unbatched;
    const what = [lines > 0 ? countOf(lines, "order line") : "", recuts > 0 ? countOf(recuts, "spoiled part", "spoiled parts") + " to cut again" : ""].filter(Boolean).join(" and ");
    entries.push({ key: "unbatched", title: `${what} in no batch yet`, href: "/batches", urgent: recuts > 0, lines: lines > 0 ? [{ text: `confirmed lines due by ${formatDate(dueBy)}` }] : [] });
  }

  if (facts.batches) {
    const planning = facts.batches.filter((b) => b.status === "open" || b.status === "planned");
    const atSaw = facts.batches.filter((b) => b.status === "released");
    const line = (b: AgendaBatch, href: string, what: string): AgendaLine => ({ text: `${batchCode(b.number)} ${b.materialName} · ${what}`, href });
    if (planning.length > 0) {
      const shown = planning.slice(0, AGENDA_LINES);
      entries.push({
        key: "to-plan",
        title: `${countOf(planning.length, "batch", "batches")} to plan or release`,
        href: "/batches",
        urgent: false,
        lines: [...shown.map((b) => line(b, `/batches/${b.id}`, b.status === "open" ? "no plan yet" : "planned, not released")), ...more(planning.length, shown.length)],
      });
    }
    if (atSaw.length > 0) {
      const shown = atSaw.slice(0, AGENDA_LINES);
      entries.push({
        key: "at-saw",
        title: `${countOf(atSaw.length, "batch", "batches")} at the saw`,
        href: "/saw",
        urgent: false,
        lines: [...shown.map((b) => line(b, `/saw/${b.id}`, "released")), ...more(atSaw.length, shown.length)],
      });
    }
  }

  if (facts.sheetsOut && facts.sheetsOut.length > 0) {
    entries.push({
      key: "sheets-out",
      title: `${countOf(facts.sheetsOut.length, "material")} with no full sheet in stock`,
      href: "/catalogue/materials",
      urgent: false,
      lines: facts.sheetsOut.map((m) => ({ text: `${m.materialName} · ${countOf(m.batches, "batch", "batches")} waiting (racked offcuts may do)` })),
    });
  }

  if (facts.sleds) {
    const { list, toleranceUmPerM } = facts.sleds;
    const due: AgendaLine[] = [];
    for (const sled of list) {
      if (!sled.lastCheck) {
        due.push({ text: `${sled.name} · no five-cut test on record`, href: "/sleds" });
        continue;
      }
      const status = checkStatus(sled.lastCheck, toleranceUmPerM, now);
      if (status.outOfTolerance) due.push({ text: `${sled.name} · out of the shop's tolerance at its last check`, href: "/sleds" });
      else if (status.stale) due.push({ text: `${sled.name} · last checked ${status.ageDays} days ago (more than ${STALE_AFTER_DAYS})`, href: "/sleds" });
    }
    if (due.length > 0) entries.push({ key: "sleds", title: `${countOf(due.length, "sled")} to check for square`, href: "/sleds", urgent: true, lines: due });
  }

  if (facts.unpaidDeposits && facts.unpaidDeposits.count > 0) {
    const { count: n, amounts } = facts.unpaidDeposits;
    const sum = amounts.map((a) => formatMoney(a.amountMinor, a.currency)).join(" and ");
    entries.push({ key: "deposits", title: `${countOf(n, "deposit")} asked and not paid, ${sum} in all`, href: "/ledger/deposits", urgent: false, lines: [] });
  }

  return entries;
}
