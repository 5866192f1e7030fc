import type { Issue } from '../intake/types';

/** An issue standing for worksheet rows `row` to `lastRow` (absent: the one row `row`). */
export type CompactIssue = Issue & { readonly lastRow?: number };

/** The column part of an address: "Visits!C17" → "Visits!C". */
export const columnPart = (cell: string): string => cell.replace(/\d+$/, '');

/** The A1 range from `cell` down to row `lastRow` of its column: ("Visits!C5", 9) → "Visits!C5:C9". */
export const rangeDown = (cell: string, lastRow: number): string => `${cell}:${columnPart(cell).replace(/^.*!/, '')}${lastRow}`;

/**
 * Joins row issues that say the same thing about consecutive rows of one column into one issue spanning them, so that
 * a column of 200,000 identical bad values is one entry, not 200,000. Two row issues join when they have the same
 * code, severity, role, use, column and value, their sentences agree after the leading cell address, and the second is on the next worksheet row (an exact repeat on the same row is dropped). The joined issue
 * keeps the first issue's place in the list, its `cell` becomes the A1 range ("Visits!C5:C9"), its message starts
 * with that range, and `lastRow` is its last row. Issues without a row or cell, or whose message does not start with
 * their cell, and summary issues (rowSpans) pass through unchanged. Nothing is lost: every row stays named. O(issues).
 *
 * Example: issues at Visits!C5 and Visits!C6, both '… "NA" is not a number …' → one issue, cell "Visits!C5:C6", lastRow 6.
 */
export function compactIssues(issues: readonly Issue[]): CompactIssue[] {
  const out: Issue[] = [];
  const lastRows: number[] = []; // per entry of out: its last row (its own row unless joined)
  const tails: string[] = []; // per entry of out: its message after the cell address
  const open = new Map<string, number>(); // key → index in out of the run it may extend
  for (const i of issues) {
    if (i.row === null || i.cell === null || i.rowSpans !== undefined || !i.message.startsWith(i.cell)) {
      out.push(i);
      lastRows.push(i.row ?? -1);
      tails.push('');
      continue;
    }
    const tail = i.message.slice(i.cell.length);
    // The key leaves the sentence out (hashing it per issue is the costly part); the run's tail is compared instead.
    const key = `${i.code}\u0000${i.severity}\u0000${i.role ?? ''}\u0000${i.use ?? ''}\u0000${columnPart(i.cell)}\u0000${i.value}`;
    const at = open.get(key);
    if (at !== undefined && tails[at] === tail) {
      const last = lastRows[at]!;
      if (i.row === last) continue; // an exact repeat of the run's last row
      if (i.row === last + 1) {
        lastRows[at] = i.row;
        continue;
      }
    }
    open.set(key, out.length);
    out.push(i);
    lastRows.push(i.row);
    tails.push(tail);
  }
  // Rewrite the addresses of joined issues once, at the end (linear: one string per joined issue).
  return out.map((i, k) => {
    const lastRow = lastRows[k]!;
    if (i.cell === null || i.row === null || lastRow === i.row || i.rowSpans !== undefined) return i;
    const cell = rangeDown(i.cell, lastRow);
    return { ...i, cell, lastRow, message: cell + i.message.slice(i.cell.length) };
  });
}
