import type { Issue } from '../intake/types';
import { renderMessage } from '../intake/messages';
import { columnPart, compactIssues, rangeDown } from './compactIssues';
import type { ExcludedRow } from './types';

const USES = ['timing', 'model'] as const;

/**
 * The list of left-out rows (SPEC §3), in worksheet-row order, timing before model. Every row named by a row-level
 * warning is accounted for; consecutive rows left out of one use for the same reason in the same column with the same
 * value are one entry spanning them (`row` to `lastRow`, `cell` an A1 range such as "Visits!C5:C9"; compactIssues).
 * A summary issue standing for many rows (blank rows, `rowSpans`) gives one entry per span and use. Issues about the
 * whole range (row null) or about no single use are not rows left out and are skipped; an exact repeat of an entry is
 * listed once. Cost O(issues + spans), plus sorting the entries.
 *
 * Example: [{ severity: 'warning', row: 17, cell: 'Visits!G17', use: 'model', message: 'Visits!G17: …', … },
 *           { …, row: 18, cell: 'Visits!G18', use: 'model', message: 'Visits!G18: …' } with the same code and value]
 * → [{ row: 17, lastRow: 18, cell: 'Visits!G17:G18', use: 'model', reason: 'Visits!G17:G18: …' }]
 */
export function excludedRows(issues: readonly Issue[]): ExcludedRow[] {
  const out: ExcludedRow[] = [];
  const rowIssues: Issue[] = [];
  for (const i of issues) {
    if (i.severity !== 'warning' || i.row === null) continue;
    if (i.rowSpans !== undefined) {
      for (const [a, b] of i.rowSpans) {
        for (const use of USES) {
          const first = i.cell === null ? null : `${columnPart(i.cell)}${a}`;
          const cell = first === null || a === b ? first : rangeDown(first, b);
          const reason = renderMessage({ code: i.code, role: i.role, value: i.value, cell, use });
          out.push(a === b ? { row: a, cell, use, reason } : { row: a, lastRow: b, cell, use, reason });
        }
      }
    } else if (i.use !== null) rowIssues.push(i);
  }
  const seen = new Set<string>();
  for (const i of compactIssues(rowIssues)) {
    const key = `${i.row!}\u0000${i.lastRow ?? i.row!}\u0000${i.use!}\u0000${i.message}`;
    if (seen.has(key)) continue;
    seen.add(key);
    const base = { row: i.row!, cell: i.cell, use: i.use!, reason: i.message };
    out.push(i.lastRow === undefined ? base : { ...base, lastRow: i.lastRow });
  }
  const useOrder = (u: ExcludedRow['use']): number => (u === 'timing' ? 0 : 1);
  return out.sort((a, b) => a.row - b.row || useOrder(a.use) - useOrder(b.use));
}
