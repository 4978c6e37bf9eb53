// Where an order line's parts are in the shop: for each material its product needs, the batch that
// cuts them and how far it has got; and any part spoiled at the saw, until it is cut again. Answers
// "where is my order?" from the order's page. Pure: the rows come from batches.
import { batchCode } from "./batches";
import { formatDay } from "./dates";
import type { OrderStatus } from "./order-status";

export type BatchStatus = "open" | "planned" | "released" | "cut" | "closed";

export interface LineBatch {
  material: string;
  batchId: string;
  number: number;
  status: BatchStatus;
  releasedAt: string | null;
  cutAt: string | null;
}

export interface LineRecut {
  partName: string;
  spoiledIn: number;
  /** the batch that takes it again, once one does */
  again: { batchId: string; number: number; status: BatchStatus } | null;
}

export interface LineProgressInput {
  orderStatus: OrderStatus;
  /** the materials the line's product is cut from */
  materials: string[];
  batches: LineBatch[];
  /** materials the planner holds the line back from */
  held: string[];
  recuts: LineRecut[];
  /** the shop's, for the days it names (UTC unless given) */
  timeZone?: string;
}

export interface ProgressItem {
  text: string;
  /** wait: nothing cut yet; work: at the saw; done: cut */
  tone: "wait" | "work" | "done";
  batch?: { id: string; code: string };
}

const TONE: Record<BatchStatus, ProgressItem["tone"]> = { open: "wait", planned: "wait", released: "work", cut: "done", closed: "done" };

function batchText(b: LineBatch, timeZone: string): string {
  const code = batchCode(b.number);
  switch (b.status) {
    case "open":
      return `in ${code}, not planned yet`;
    case "planned":
      return `in ${code}, planned, not at the saw yet`;
    case "released":
      return b.releasedAt ? `at the saw in ${code} since ${formatDay(b.releasedAt, timeZone)}` : `at the saw in ${code}`;
    case "cut":
    case "closed":
      return b.cutAt ? `cut in ${code} on ${formatDay(b.cutAt, timeZone)}` : `cut in ${code}`;
  }
}

/** One entry per material, then one per spoiled part; nothing for a draft or cancelled order, which no batch takes. */
export function lineProgress(input: LineProgressInput): ProgressItem[] {
  if (input.orderStatus === "draft" || input.orderStatus === "cancelled") return [];
  const items: ProgressItem[] = input.materials.map((material) => {
    const batch = input.batches.find((b) => b.material === material);
    if (batch) return { text: `${material}: ${batchText(batch, input.timeZone ?? "UTC")}`, tone: TONE[batch.status], batch: { id: batch.batchId, code: batchCode(batch.number) } };
    if (input.held.includes(material)) return { text: `${material}: held back from batches by the planner`, tone: "wait" };
    return { text: `${material}: in no batch yet`, tone: "wait" };
  });
  for (const r of input.recuts) {
    const spoiled = `${r.partName} spoiled in ${batchCode(r.spoiledIn)}`;
    if (!r.again) items.push({ text: `${spoiled}: waiting to be cut again`, tone: "wait" });
    else if (TONE[r.again.status] === "done") items.push({ text: `${spoiled}: cut again in ${batchCode(r.again.number)}`, tone: "done", batch: { id: r.again.batchId, code: batchCode(r.again.number) } });
    else items.push({ text: `${spoiled}: to be cut again in ${batchCode(r.again.number)}`, tone: TONE[r.again.status], batch: { id: r.again.batchId, code: batchCode(r.again.number) } });
  }
  return items;
}
