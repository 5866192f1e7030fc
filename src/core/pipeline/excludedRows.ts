import type { Issue } from '../intake/types';
import type { ExcludedRow } from './types';

/**
 * The list of left-out rows (SPEC §3): one entry per (worksheet row, use, reason) named by a row-level warning, in
 * worksheet-row order, timing before model. Issues about the whole range (row null) or about no single use are not
 * rows left out and are skipped; an exact repeat of an entry is listed once. Cost O(issues · log issues).
 *
 * Example: [{ severity: 'warning', row: 17, cell: 'Visits!G17', use: 'model', message: 'The value is text.', … }]
 * → [{ row: 17, cell: 'Visits!G17', use: 'model', reason: 'The value is text.' }]
 */
export function excludedRows(issues: readonly Issue[]): ExcludedRow[] {
  const out: ExcludedRow[] = [];
  const seen = new Set<string>();
  for (const i of issues) {
    if (i.severity !== 'warning' || i.row === null || i.use === null) continue;
    const key = `${i.row}\u0000${i.use}\u0000${i.message}`;
    if (seen.has(key)) continue;
    seen.add(key);
    out.push({ row: i.row, cell: i.cell, use: i.use, reason: i.message });
  }
  const useOrder = (u: ExcludedRow['use']): number => (u === 'timing' ? 0 : 1);
  return out.sort((a, b) => a.row - b.row || useOrder(a.use) - useOrder(b.use));
}
