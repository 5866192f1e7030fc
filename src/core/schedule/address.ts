/**
 * A tiny local cell-address helper for the schedule layer (the intake layer has its own; this one keeps the
 * schedule independent of intake internals).
 */

/** Thrown when an address given by a caller is not an A1-style cell address. */
export class AddressError extends Error {
  constructor(address: string) {
    super(`Not a cell address: "${address}" (expected a column letter and a row number, e.g. "B3").`);
    this.name = 'AddressError';
  }
}

/** Column letters of a 0-based column number: 0 → "A", 25 → "Z", 26 → "AA". O(log n). */
export function columnLetters(index: number): string {
  let n = index + 1;
  let out = '';
  while (n > 0) {
    const r = (n - 1) % 26;
    out = String.fromCharCode(65 + r) + out;
    n = Math.floor((n - 1) / 26);
  }
  return out;
}

/** Splits "B3" into a 0-based column (1) and a 1-based row (3). Throws AddressError on anything else. */
export function parseCell(address: string): { readonly col: number; readonly row: number } {
  const m = /^\$?([A-Za-z]{1,3})\$?(\d+)$/.exec(address.trim());
  if (!m) throw new AddressError(address);
  const letters = m[1]!.toUpperCase();
  let col = 0;
  for (let i = 0; i < letters.length; i++) col = col * 26 + (letters.charCodeAt(i) - 64);
  return { col: col - 1, row: Number(m[2]) };
}

/** The sheet name as it appears before "!" : quoted when it holds anything but letters, digits and underscores. */
export function sheetPrefix(sheet: string): string {
  return /^[A-Za-z_][A-Za-z0-9_.]*$/.test(sheet) ? sheet : `'${sheet.replace(/'/g, "''")}'`;
}

/**
 * Address of a cell given the range's top-left cell, the 0-based column within the range and the 1-based worksheet
 * row. Example: cellAddress("Visits", "B3", 2, 17) → "Visits!D17".
 */
export function cellAddress(sheet: string, topLeft: string, column: number, sheetRow: number): string {
  const { col } = parseCell(topLeft);
  return `${sheetPrefix(sheet)}!${columnLetters(col + column)}${sheetRow}`;
}
