// One label per part of a batch: who it is for and what it says. Pure; app/pdf/labels.server.ts draws them.
import type { MergedPart } from "./batch-parts";
import { formatSize, type DisplayUnit } from "./units";

export type PartLabel = { orderId: string; heading: string; part: string; text: string | null; product: string; batch: string };

/** Sawn parts first, then laser-cut items, each in order and item order (as merged). */
export function partLabels(batchCode: string, parts: MergedPart[], unit: DisplayUnit): PartLabel[] {
  return parts.flatMap((p) =>
    p.origins.map((o) => ({
      orderId: o.orderId,
      heading: `#${o.orderNumber} · ${o.customerName}`,
      part: `${o.partName} · ${formatSize(p.lengthUm, p.widthUm, unit)}`,
      text: o.text,
      product: `${o.productName}${p.process === "laser" ? " · laser-cut" : ""}`,
      batch: batchCode,
    })),
  );
}
