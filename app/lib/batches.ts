/** A batch's name on the floor: B-0007. */
export function batchCode(number: number): string {
  return `B-${String(number).padStart(4, "0")}`;
}
