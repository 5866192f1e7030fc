/**
 * A subject's reference date (randomisation or first dose) is one date: a row whose reference date differs from the
 * one first given for its subject gets a warning, so the user can correct it before study days are counted from it.
 */
import { dayNumberToIso } from './dates';
import type { IssueList } from './issueList';

/**
 * Adds a 'reference-date-differs' warning (use null: the row is kept, its own reference date is used) for each row
 * whose reference date differs from its subject's first one. Rows without a subject or reference date are skipped.
 * O(rows).
 * @example reference [45663, 45663, 45670] for subject K-1 → one warning on the third row, naming 2025-01-06
 */
export function checkReference(
  reference: Float64Array,
  subjectIndex: Int32Array,
  subjectIds: readonly string[],
  refCol: number,
  issues: IssueList,
): void {
  const first = new Float64Array(subjectIds.length).fill(NaN);
  for (let i = 0; i < reference.length; i++) {
    const s = subjectIndex[i]!;
    const r = reference[i]!;
    if (s < 0 || Number.isNaN(r)) continue;
    if (Number.isNaN(first[s]!)) first[s] = r;
    else if (first[s] !== r) {
      issues.at('reference-date-differs', 'warning', i, refCol, 'reference', dayNumberToIso(r), null, subjectIds[s]!, dayNumberToIso(first[s]!));
    }
  }
}
