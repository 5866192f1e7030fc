/** Column letters of a 1-based column number (ECMA-376 Part 1, §18.3.1.4 A1 reference style): 1 → "A", 28 → "AB". */
export function columnLetters(column: number): string {
  if (!Number.isInteger(column) || column < 1) throw new RangeError(`Column number must be a positive integer, got ${column}`);
  let n = column;
  let out = '';
  while (n > 0) {
    const r = (n - 1) % 26;
    out = String.fromCharCode(65 + r) + out;
    n = Math.floor((n - 1) / 26);
  }
  return out;
}
