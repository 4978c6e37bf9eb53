// Crosscut-sled squareness from the five-cut test (TRADE-FACTS §4), and when a set-up sheet must warn.
// Inputs are integer micrometres (µm) as stored; results are exact quotients in µm (not rounded —
// the display rounds), so the published worked examples come out to their last digit.
//
// The geometry: every cut on the sled turns the cut edge by the fence's error ε against the
// referenced edge; after four turns the fifth cut is 4ε off the first edge, so the strip it removes
// tapers by A − B = 4 ε L. Hence ε = (A − B) / (4 L) radians.
//
// Stopwise's convention (shown on the sleds page with a diagram): the sled's fence is the one nearest
// you, the work lies beyond it, and the fence pivots on a bolt near the blade and is adjusted at its
// far end, D from the pivot. A is the strip's width at the end that met the blade first (the end
// furthest from the fence), B at the fence end. A wider than B (ε > 0) means the fence's far end sits
// too far away from you: pull it toward you by ε × D. A narrower than B: push it away from you.

export type FiveCutInput = {
  /** width of the final strip at the end that met the blade first (A), µm */
  widthFirstEndUm: number;
  /** width at the other end, by the fence (B), µm */
  widthSecondEndUm: number;
  /** length of the strip, µm */
  stripLengthUm: number;
  /** distance from the fence's pivot to its adjustment point, µm */
  pivotDistanceUm: number;
};

export type FenceMove = "toward-you" | "away-from-you" | "none";

export type FiveCutResult = {
  /** A − B, µm */
  taperUm: number;
  /** the error one cut makes over the strip's length: (A − B) / 4, µm */
  errorPerCutUm: number;
  /** angle per cut, radians (signed like A − B) */
  angleRad: number;
  /** error over one metre of crosscut, µm per metre (signed) */
  errorUmPerM: number;
  /** how far to move the adjustment point, µm (signed like A − B) */
  correctionUm: number;
  move: FenceMove;
};

export const STALE_AFTER_DAYS = 90;
const DAY_MS = 86_400_000;

export function fiveCut({ widthFirstEndUm, widthSecondEndUm, stripLengthUm, pivotDistanceUm }: FiveCutInput): FiveCutResult {
  if (!(stripLengthUm > 0)) throw new RangeError("The strip's length must be more than zero.");
  const taperUm = widthFirstEndUm - widthSecondEndUm;
  const fourL = 4 * stripLengthUm;
  return {
    taperUm,
    errorPerCutUm: taperUm / 4,
    angleRad: taperUm / fourL,
    // ε × 1 m = taper × 1 000 000 µm / 4L
    errorUmPerM: (taperUm * 1_000_000) / fourL,
    correctionUm: (taperUm * pivotDistanceUm) / fourL,
    move: taperUm > 0 ? "toward-you" : taperUm < 0 ? "away-from-you" : "none",
  };
}

export const MOVE_TEXT: Record<FenceMove, string> = {
  "toward-you": "pull the fence's far end toward you",
  "away-from-you": "push the fence's far end away from you",
  none: "leave the fence where it is",
};

export type SledCheckFacts = { checkedAt: Date; errorUmPerM: number };

export type SledWarning =
  | { warn: false; errorOverLengthUm: number; allowedUm: number; ageDays: number }
  | { warn: true; reason: "no-sled" | "no-check" | "stale" | "out-of-tolerance"; message: string; errorOverLengthUm?: number; allowedUm?: number; ageDays?: number };

/**
 * Whether a set-up sheet must warn about the sled: no sled or no check recorded, the last check older
 * than 90 days, or its error over the batch's longest crosscut above the shop's tolerance × that length.
 * `longestCrosscutUm` is the longest crosscut line of the batch (the widest piece crossed on the sled).
 */
export function sledWarning(check: SledCheckFacts | null, toleranceUmPerM: number, longestCrosscutUm: number, now: Date, hasSled = true): SledWarning {
  if (!hasSled) return { warn: true, reason: "no-sled", message: "No sled is recorded for this plan: check the sled you use is square before cutting." };
  if (!check) return { warn: true, reason: "no-check", message: "This sled has no squareness check on record: do a five-cut test before cutting." };
  const ageDays = Math.floor((now.getTime() - check.checkedAt.getTime()) / DAY_MS);
  // Both in µm over the batch's own crosscut, so the sawyer can compare them with a square.
  const errorOverLengthUm = (Math.abs(check.errorUmPerM) * longestCrosscutUm) / 1_000_000;
  const allowedUm = (toleranceUmPerM * longestCrosscutUm) / 1_000_000;
  if (ageDays > STALE_AFTER_DAYS) {
    return { warn: true, reason: "stale", message: `The sled's last squareness check is ${ageDays} days old (more than ${STALE_AFTER_DAYS}): do a five-cut test before cutting.`, errorOverLengthUm, allowedUm, ageDays };
  }
  if (errorOverLengthUm > allowedUm) {
    return { warn: true, reason: "out-of-tolerance", message: "The sled is out of the shop's tolerance for this batch's longest crosscut: square the fence before cutting.", errorOverLengthUm, allowedUm, ageDays };
  }
  return { warn: false, errorOverLengthUm, allowedUm, ageDays };
}

/** A check on its own (no batch): stale, or out of tolerance per metre. */
export function checkStatus(check: SledCheckFacts, toleranceUmPerM: number, now: Date): { stale: boolean; outOfTolerance: boolean; ageDays: number } {
  const ageDays = Math.floor((now.getTime() - check.checkedAt.getTime()) / DAY_MS);
  return { stale: ageDays > STALE_AFTER_DAYS, outOfTolerance: Math.abs(check.errorUmPerM) > toleranceUmPerM, ageDays };
}

// Thin-kerf blades cut about 2.4 mm, full-kerf ones about 3.2 mm (TRADE-FACTS §2, common practice).
export const THIN_KERF_UM = 2400;
export const FULL_KERF_UM = 3200;
export const KERF_MIN_UM = 500;
export const KERF_MAX_UM = 6000;

/** How a measured kerf compares with the usual blades, for the note beside the measurement. */
export function kerfComment(kerfUm: number): string {
  const near = (a: number) => Math.abs(kerfUm - a) <= 300;
  if (near(THIN_KERF_UM)) return "about what a thin-kerf blade cuts (≈ 2.4 mm)";
  if (near(FULL_KERF_UM)) return "about what a full-kerf blade cuts (≈ 3.2 mm)";
  if (kerfUm < THIN_KERF_UM) return "narrower than a thin-kerf blade (≈ 2.4 mm): measure the test cut again";
  if (kerfUm > FULL_KERF_UM) return "wider than a full-kerf blade (≈ 3.2 mm): check for blade wobble or a dado stack, or measure again";
  return "between a thin-kerf (≈ 2.4 mm) and a full-kerf (≈ 3.2 mm) blade";
}

/**
 * Small sled figures need decimals, not 1/32 in: millimetres to 0.001, inches to 0.0001.
 * Signed values keep their sign ("−0.468 mm").
 */
export function formatFine(um: number, unit: "mm" | "in"): string {
  const sign = um < 0 ? "−" : "";
  const abs = Math.abs(um);
  // Rounded half up on integers first: (3.175).toFixed(2) would give "3.17".
  return unit === "mm" ? `${sign}${(Math.round(abs) / 1000).toFixed(3)} mm` : `${sign}${(Math.round((abs / 25_400) * 10_000) / 10_000).toFixed(4)} in`;
}

/** The error per metre of crosscut in the shop's unit: "0.850 mm per metre" or "0.0102 in per foot". */
export function formatErrorRate(umPerM: number, unit: "mm" | "in"): string {
  return unit === "mm" ? `${formatFine(umPerM, "mm")} per metre` : `${formatFine(umPerM * 0.3048, "in")} per foot`;
}

/** A kerf: "3.20 mm" or "0.126 in" (a blade is measured finer than 0.1 mm or 1/32 in). */
export function formatKerf(um: number, unit: "mm" | "in"): string {
  return unit === "mm" ? `${(Math.round(um / 10) / 100).toFixed(2)} mm` : `${(Math.round((um / 25_400) * 1000) / 1000).toFixed(3)} in`;
}
