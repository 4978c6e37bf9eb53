/** A batch's name on the floor: B-0007. */
export function batchCode(number: number): string {
  return `B-${String(number).padStart(4, "0")}`;
}

/** How many of a proposal's lines, and of the finished batches, the batches page lists by name. */
export const PROPOSAL_PREVIEW_LINES = 12;
export const FINISHED_BATCHES_SHOWN = 20;
/** How many of a batch's order lines its page lists before "Show all" (a busy batch has a hundred). */
export const BATCH_LINES_SHOWN = 30;

/**
 * What the batches page shows of a proposed batch: its counts, and only its first lines and recuts
 * (a busy season proposes thousands; the batch itself lists them all once created).
 */
export function proposalPreview<L extends { quantity: number }, R>(
  proposal: { materialId: string; materialName: string; lines: L[]; recuts: R[] },
  limit = PROPOSAL_PREVIEW_LINES,
) {
  const lines = proposal.lines.slice(0, limit);
  const recuts = proposal.recuts.slice(0, Math.max(0, limit - lines.length));
  return {
    materialId: proposal.materialId,
    materialName: proposal.materialName,
    lines,
    recuts,
    lineCount: proposal.lines.length,
    itemCount: proposal.lines.reduce((n, l) => n + l.quantity, 0),
    recutCount: proposal.recuts.length,
    notListed: proposal.lines.length + proposal.recuts.length - lines.length - recuts.length,
  };
}

/** Batches still on their way (all of them), then the latest finished ones; older finished ones are in the ledger. */
export function batchesToList<B extends { status: string }>(batches: B[], finishedShown = FINISHED_BATCHES_SHOWN): { shown: B[]; olderFinished: number } {
  const finished = (b: B) => b.status === "cut" || b.status === "closed";
  const active = batches.filter((b) => !finished(b));
  const done = batches.filter(finished);
  return { shown: [...active, ...done.slice(0, finishedShown)], olderFinished: Math.max(0, done.length - finishedShown) };
}
