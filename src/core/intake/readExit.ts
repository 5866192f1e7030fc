/**
 * The participant's exit from the study (ADaM EOSDT, with EOSSTT and DCSREAS when mapped), gathered per participant.
 * The exit date may stand on every row of the participant (the usual merged listing) or on one row only.
 */
import { cellText, readTextCell } from './cellText';
import { dayNumberToIso } from './dates';
import type { IssueList } from './issueList';
import { DATE_PROBLEMS, type DateColumn } from './dateColumn';
import { toCellSource, type CellInput } from './cellSource';
import type { ColumnMapping } from './types';

export interface ExitColumns {
  /** Per subject: the exit date as a day number (the latest given), NaN when none. */
  readonly subjectExit: Float64Array;
  readonly subjectExitStatus: string[] | null;
  readonly subjectExitReason: string[] | null;
}

/**
 * One pass over the data rows (cells[1..]), with the exit column as readDateRole already read it (`exitColumn`, in the
 * column's decided order of day and month; null when no exit column is mapped): per participant, the exit date (the latest one when rows disagree, with
 * an 'exit-date-differs' warning at each row that differs from the latest), and the first non-blank status and
 * reason. An unreadable exit date is a 'bad-exit-date' warning (use null: the row is kept). Rows without a subject
 * are skipped. O(rows).
 * @example participant K-1 with exit dates "", "2025-06-30", "" on three rows → subjectExit [45838], no issue
 */
export function readExit(
  cells: CellInput,
  mapping: ColumnMapping,
  subjectIndex: Int32Array,
  subjectIds: readonly string[],
  exitColumn: DateColumn | null,
  issues: IssueList,
): ExitColumns {
  const source = toCellSource(cells);
  const S = subjectIds.length;
  const subjectExit = new Float64Array(S).fill(NaN);
  const status = mapping.exitStatus === undefined ? null : new Array<string>(S).fill('');
  const reason = mapping.exitReason === undefined ? null : new Array<string>(S).fill('');
  const ec = mapping.exit;
  // The exit column was read once, in its decided order of day and month (readDateRole); only its day numbers and
  // problem codes are used here.
  const rowExit = ec === undefined || exitColumn === null ? null : exitColumn.days;
  for (let i = 0; i < subjectIndex.length; i++) {
    const s = subjectIndex[i]!;
    if (s < 0) continue;
    if (rowExit !== null) {
      const d = rowExit[i]!;
      const problem = DATE_PROBLEMS[exitColumn!.problems[i]!];
      if (!Number.isNaN(d)) {
        if (!(d <= subjectExit[s]!)) subjectExit[s] = d;
      } else if (problem !== 'blank') {
        issues.at(problem === 'error-value' ? 'error-value' : 'bad-exit-date', 'warning', i, ec!, 'exit', cellText(source.cell(i + 1, ec!)), null);
      }
    }
    if (status !== null && status[s] === '') status[s] = readTextCell(source.cell(i + 1, mapping.exitStatus!)) ?? '';
    if (reason !== null && reason[s] === '') reason[s] = readTextCell(source.cell(i + 1, mapping.exitReason!)) ?? '';
  }
  if (rowExit !== null) {
    for (let i = 0; i < rowExit.length; i++) {
      const d = rowExit[i]!;
      const s = subjectIndex[i]!;
      if (Number.isNaN(d) || s < 0 || d === subjectExit[s]) continue;
      issues.at('exit-date-differs', 'warning', i, ec!, 'exit', dayNumberToIso(d), null, subjectIds[s]!, dayNumberToIso(subjectExit[s]!));
    }
  }
  return { subjectExit, subjectExitStatus: status, subjectExitReason: reason };
}
