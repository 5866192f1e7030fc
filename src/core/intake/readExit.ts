/**
 * The participant's exit from the study (ADaM EOSDT, with EOSSTT and DCSREAS when mapped), gathered per participant.
 * The exit date may stand on every row of the participant (the usual merged listing) or on one row only.
 */
import { dayNumberToIso } from './dates';
import type { IssueList } from './issueList';
import { DATE_PROBLEMS, type DateColumn } from './dateColumn';
import { TEXT_OK, type CodedColumn } from './decodeColumns';

export interface ExitColumns {
  /** Per subject: the exit date as a day number (the latest given), NaN when none. */
  readonly subjectExit: Float64Array;
  readonly subjectExitStatus: string[] | null;
  readonly subjectExitReason: string[] | null;
}

/** The decoded exit columns: the exit date as readDateRole read it (in the column's decided order of day and month),
 * and the status and reason as codes; each null when not mapped. `exitCol` is the exit date's range column. */
export interface ExitInput {
  readonly exit: DateColumn | null;
  readonly exitCol: number | null;
  readonly status: CodedColumn | null;
  readonly reason: CodedColumn | null;
}

/**
 * One pass over the data rows: per participant, the exit date (the latest one when rows disagree, with an
 * 'exit-date-differs' warning at each row that differs from the latest), and the first usable status and reason
 * (blank and error values skipped). An unreadable exit date is a 'bad-exit-date' warning (use null: the row is kept).
 * Rows without a subject are skipped. O(rows), on decoded columns only.
 * @example participant K-1 with exit dates "", "2025-06-30", "" on three rows → subjectExit [45838], no issue
 */
export function readExit(input: ExitInput, subjectIndex: Int32Array, subjectIds: readonly string[], issues: IssueList): ExitColumns {
  const S = subjectIds.length;
  const subjectExit = new Float64Array(S).fill(NaN);
  const firstText = (col: CodedColumn | null): string[] | null => {
    if (col === null) return null;
    const out = new Array<string>(S).fill('');
    const ok = TEXT_OK;
    for (let i = 0; i < subjectIndex.length; i++) {
      const s = subjectIndex[i]!;
      if (s < 0 || out[s] !== '') continue;
      const c = col.codes[i]!;
      if (col.kinds[c] === ok) out[s] = col.texts[c]!;
    }
    return out;
  };
  const rowExit = input.exit === null || input.exitCol === null ? null : input.exit.days;
  const ec = input.exitCol!;
  if (rowExit !== null) {
    const problems = input.exit!.problems;
    for (let i = 0; i < subjectIndex.length; i++) {
      const s = subjectIndex[i]!;
      if (s < 0) continue;
      const d = rowExit[i]!;
      const problem = DATE_PROBLEMS[problems[i]!];
      if (!Number.isNaN(d)) {
        if (!(d <= subjectExit[s]!)) subjectExit[s] = d;
      } else if (problem !== 'blank') {
        issues.at(problem === 'error-value' ? 'error-value' : 'bad-exit-date', 'warning', i, ec, 'exit', input.exit!.texts.get(i) ?? '', null);
      }
    }
    for (let i = 0; i < rowExit.length; i++) {
      const d = rowExit[i]!;
      const s = subjectIndex[i]!;
      if (Number.isNaN(d) || s < 0 || d === subjectExit[s]) continue;
      issues.at('exit-date-differs', 'warning', i, ec, 'exit', dayNumberToIso(d), null, subjectIds[s]!, dayNumberToIso(subjectExit[s]!));
    }
  }
  return { subjectExit, subjectExitStatus: firstText(input.status), subjectExitReason: firstText(input.reason) };
}
