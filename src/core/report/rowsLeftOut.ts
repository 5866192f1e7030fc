/**
 * How many distinct worksheet rows a list of left-out entries covers, each entry naming row..lastRow (lastRow absent:
 * one row). Overlaps count once. O(entries log entries).
 * @example rowsLeftOut([{ row: 5 }, { row: 5, lastRow: 9 }, { row: 20 }]) // 6
 */
export function rowsLeftOut(entries: readonly { readonly row: number; readonly lastRow?: number }[]): number {
  const spans = entries.map((e): [number, number] => [e.row, e.lastRow ?? e.row]).sort((a, b) => a[0] - b[0]);
  let count = 0;
  let end = -Infinity;
  for (const [a, b] of spans) {
    if (b <= end) continue;
    count += b - Math.max(a, end + 1) + 1;
    end = b;
  }
  return count;
}
