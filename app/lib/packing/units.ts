// Lengths inside the engine are integer micrometres so every comparison is exact.
export const UM_PER_MM = 1000;

export function mmToUm(mm: number): number {
  return Math.round(mm * UM_PER_MM);
}

export function umToMm(um: number): number {
  return um / UM_PER_MM;
}

/** µm² → mm² */
export function um2ToMm2(um2: number): number {
  return um2 / (UM_PER_MM * UM_PER_MM);
}
