// A batch expands to its parts: every product item of every order line gives its copies of each part,
// and identical parts across lines and orders merge into one row, so one fence and one stop setting
// serve them all. Each copy keeps its origin (order, line, item, personalisation) for labels and costs.

export type PartProcess = "saw" | "laser";

/** One product part of one order line in the batch. */
export type BatchSource = {
  orderId: string;
  orderNumber: number;
  customerName: string;
  lineId: string;
  productName: string;
  lineQuantity: number;
  /** text i belongs to product item i; may be shorter than lineQuantity or empty */
  personalisation: string[];
  /** the line's item number of personalisation[0]: a recut is one item that keeps its own number */
  firstItemIndex?: number;
  partName: string;
  lengthUm: number;
  widthUm: number;
  quantityPerItem: number;
  grainLocked: boolean;
  process: PartProcess;
};

export type PartOrigin = {
  orderId: string;
  orderNumber: number;
  customerName: string;
  lineId: string;
  productName: string;
  partName: string;
  /** the product item on the order line, 0..lineQuantity-1 */
  itemIndex: number;
  text: string | null;
};

export type MergedPart = {
  key: string;
  name: string;
  lengthUm: number;
  widthUm: number;
  grainLocked: boolean;
  process: PartProcess;
  quantity: number;
  origins: PartOrigin[];
};

/** Size as it is merged: a part whose grain is free is the same part turned, so longer side first. */
export function normalisedSize(lengthUm: number, widthUm: number, grainLocked: boolean): { lengthUm: number; widthUm: number } {
  if (grainLocked || lengthUm >= widthUm) return { lengthUm, widthUm };
  return { lengthUm: widthUm, widthUm: lengthUm };
}

/** Stable identity of a merged row, e.g. "saw:210000x150000:locked". */
export function partKey(process: PartProcess, lengthUm: number, widthUm: number, grainLocked: boolean): string {
  return `${process}:${lengthUm}x${widthUm}:${grainLocked ? "locked" : "free"}`;
}

function compareText(a: string, b: string): number {
  return a < b ? -1 : a > b ? 1 : 0;
}

function compareOrigins(a: PartOrigin, b: PartOrigin): number {
  return (
    a.orderNumber - b.orderNumber ||
    compareText(a.orderId, b.orderId) ||
    compareText(a.lineId, b.lineId) ||
    a.itemIndex - b.itemIndex ||
    compareText(a.partName, b.partName)
  );
}

function count(value: number): number {
  return Number.isFinite(value) && value > 0 ? Math.floor(value) : 0;
}

export function mergeBatchParts(sources: BatchSource[]): MergedPart[] {
  const rows = new Map<string, MergedPart & { names: Set<string> }>();

  for (const source of sources) {
    const size = normalisedSize(source.lengthUm, source.widthUm, source.grainLocked);
    const key = partKey(source.process, size.lengthUm, size.widthUm, source.grainLocked);
    let row = rows.get(key);
    if (!row) {
      row = { key, name: "", ...size, grainLocked: source.grainLocked, process: source.process, quantity: 0, origins: [], names: new Set() };
      rows.set(key, row);
    }
    const items = count(source.lineQuantity);
    const copies = count(source.quantityPerItem);
    if (items === 0 || copies === 0) continue;
    row.names.add(source.partName);
    for (let itemIndex = 0; itemIndex < items; itemIndex++) {
      const text = source.personalisation[itemIndex] ?? null;
      for (let copy = 0; copy < copies; copy++) {
        row.origins.push({
          orderId: source.orderId,
          orderNumber: source.orderNumber,
          customerName: source.customerName,
          lineId: source.lineId,
          productName: source.productName,
          partName: source.partName,
          itemIndex: (source.firstItemIndex ?? 0) + itemIndex,
          text,
        });
      }
    }
  }

  const merged: MergedPart[] = [];
  for (const { names, ...row } of rows.values()) {
    if (row.origins.length === 0) continue;
    // Array.prototype.sort is stable, so copies of one item keep their input order.
    row.origins.sort(compareOrigins);
    merged.push({ ...row, name: [...names].sort(compareText).join(" / "), quantity: row.origins.length });
  }
  const processRank = (process: PartProcess) => (process === "saw" ? 0 : 1);
  return merged.sort(
    (a, b) =>
      processRank(a.process) - processRank(b.process) ||
      b.lengthUm * b.widthUm - a.lengthUm * a.widthUm ||
      compareText(a.key, b.key),
  );
}

/** One product item a merged row was made for: the index of its first origin and how many pieces it holds. */
export type PartItem = { first: number; pieces: number; origin: PartOrigin };

/** The distinct items behind a merged row, in the row's order (copies of one item sit together). */
export function itemsOf(origins: PartOrigin[]): PartItem[] {
  const items = new Map<string, PartItem>();
  origins.forEach((origin, i) => {
    const key = `${origin.lineId}:${origin.itemIndex}`;
    const item = items.get(key);
    if (item) item.pieces++;
    else items.set(key, { first: i, pieces: 1, origin });
  });
  return [...items.values()];
}

export type SpoiledPick = { ok: true; origins: (PartOrigin | null)[] } | { ok: false; field: "item" | "quantity"; error: string };

/**
 * Which origins spoiled pieces carry into their recut: the chosen item's own pieces, or, with no item
 * chosen, the row's first ones. A row without origins (a laser blank) gives pieces of no order.
 */
export function spoiledOrigins(origins: PartOrigin[], item: number | null, quantity: number): SpoiledPick {
  if (origins.length === 0) return { ok: true, origins: Array.from({ length: quantity }, () => null) };
  if (item === null) {
    if (quantity > origins.length) return { ok: false, field: "quantity", error: `How many: this batch has ${origins.length} of this part.` };
    return { ok: true, origins: origins.slice(0, quantity) };
  }
  const chosen = itemsOf(origins).find((i) => i.first === item);
  if (!chosen) return { ok: false, field: "item", error: "Which item: choose one of this part's items." };
  if (quantity > chosen.pieces) {
    return { ok: false, field: "quantity", error: `How many: that item has ${chosen.pieces === 1 ? "1 piece" : `${chosen.pieces} pieces`} of this part.` };
  }
  return { ok: true, origins: origins.slice(chosen.first, chosen.first + quantity) };
}

/** "#1042 Ardent Events · Table number · Table 7": one copy's order, customer, product and text. */
export function describeOrigin(o: PartOrigin): string {
  return `#${o.orderNumber} ${o.customerName} · ${o.productName}${o.text ? ` · ${o.text}` : ""}`;
}
