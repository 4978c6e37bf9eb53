/** "1 batch", "3 batches": a count with its noun (the plural adds an s unless given). */
export function countOf(n: number, one: string, many = `${one}s`): string {
  return `${n} ${n === 1 ? one : many}`;
}
