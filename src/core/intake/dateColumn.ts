/**
 * Reads one date column in one pass, once its order is decided: each cell becomes a day number or a problem code.
 * Any date role (visit date, reference date, exit date) is read this way, so every date column follows one set of rules.
 */
import { cellText, isBlankCell, isErrorCell } from './cellText';
import { serialToDayNumber } from './dates';
import { parseDateText } from './dateText';
import { toCellSource, type CellInput } from './cellSource';
import type { DateOrder, DateSystem, IssueCode } from './types';

/** Why a date cell gives no day number; index 0 ('') means it gives one. */
export const DATE_PROBLEMS = ['', 'blank', 'error-value', 'serial', 'malformed', 'impossible', 'two-digit-year', 'partial', 'wrong-order', 'needs-order'] as const;
export type DateProblemName = (typeof DATE_PROBLEMS)[number];

const BLANK = 1;
const ERROR_VALUE = 2;
const SERIAL = 3;
const MALFORMED = 4;
const PROBLEM_OF: Readonly<Record<string, number>> = { impossible: 5, 'two-digit-year': 6, partial: 7, 'wrong-order': 8, 'needs-order': 9, malformed: MALFORMED };

/** How many unreadable values a column keeps as examples for its message. */
const EXAMPLES = 3;
/** How many distinct date texts a column remembers the reading of: a listing repeats each visit date and each
 * reference date many times (about a thousand distinct days in a million rows), so each text is parsed once. */
const REMEMBERED_TEXTS = 65_536;
/** A remembered reading that is a problem, not a day: PROBLEM_BASE - problem (day numbers lie far above it). */
const PROBLEM_BASE = -1e9;

/** One date column read into day numbers. Index i is data row i (worksheet row top + 1 + i). */
export interface DateColumn {
  /** Day number (0 = 1899-12-30) per data row; NaN where the cell gives no date. */
  readonly days: Float64Array;
  /** Index into DATE_PROBLEMS per data row (0 where the cell gives a date). */
  readonly problems: Uint8Array;
  /** How many cells give a full date, and how many a partial one. */
  readonly dates: number;
  readonly partials: number;
  /** Up to three distinct non-blank values that give neither a date nor a partial date. */
  readonly examples: readonly string[];
  /** True when some value has a two-digit year. */
  readonly twoDigitYears: boolean;
  /** The text (cellText) of each row whose cell gives no date and is not blank, for the issue that names it. */
  readonly texts: ReadonlyMap<number, string>;
}

/**
 * Reads column `col` of `cells` (row 0 is the header) as dates: numbers are serials in `system` (ECMA-376 Part 1,
 * §18.17.4), text is read by parseDateText with the column's `order`, booleans are not dates. Never throws. O(rows).
 * @example readDateColumn([["ADT"], ["12JAN2025"], [45669], ["2025-01"]], 0, 1900, null).days // Float64Array [45669, 45669, NaN]
 */
export function readDateColumn(cells: CellInput, col: number, system: DateSystem, order: DateOrder | null): DateColumn {
  const source = toCellSource(cells);
  const n = Math.max(0, source.rowCount - 1);
  const days = new Float64Array(n).fill(NaN);
  const problems = new Uint8Array(n);
  const examples: string[] = [];
  let dates = 0;
  let partials = 0;
  let twoDigitYears = false;
  const texts = new Map<number, string>();
  // Text → day number, or PROBLEM_BASE - problem; the same text always reads the same way in one column.
  const seen = new Map<string, number>();
  for (let i = 0; i < n; i++) {
    const cell = source.cell(i + 1, col);
    let problem = 0;
    if (typeof cell === 'number') {
      const d = serialToDayNumber(cell, system);
      if (Number.isNaN(d)) problem = SERIAL;
      else days[i] = d;
    } else if (isBlankCell(cell)) problem = BLANK;
    else if (typeof cell !== 'string') problem = MALFORMED;
    else if (isErrorCell(cell)) problem = ERROR_VALUE;
    else {
      const known = seen.get(cell);
      if (known !== undefined) {
        if (known > PROBLEM_BASE) days[i] = known;
        else problem = PROBLEM_BASE - known;
      } else {
        const r = parseDateText(cell, order);
        if (r.kind === 'date') days[i] = r.day;
        else problem = PROBLEM_OF[r.kind] ?? MALFORMED;
        if (r.kind === 'two-digit-year') twoDigitYears = true;
        if (seen.size < REMEMBERED_TEXTS) seen.set(cell, r.kind === 'date' ? r.day : PROBLEM_BASE - problem);
      }
    }
    problems[i] = problem;
    if (problem !== 0 && problem !== BLANK) texts.set(i, cellText(cell));
    if (problem === 0) dates++;
    else if (DATE_PROBLEMS[problem] === 'partial') partials++;
    else if (problem !== BLANK && problem !== ERROR_VALUE && examples.length < EXAMPLES) {
      const text = typeof cell === 'string' ? cell.trim() : String(cell);
      if (!examples.includes(text)) examples.push(text);
    }
  }
  return { days, problems, dates, partials, examples, twoDigitYears, texts };
}

/** True when the column has values but none gives a date or a partial date: one message for the column, not one per row. */
export function unreadableColumn(c: DateColumn): boolean {
  return c.dates === 0 && c.partials === 0 && c.examples.length > 0;
}

/**
 * The issue code and message context for a date cell's problem in a date role that leaves the row out ('bad-date'
 * carries its reason as context); null for no problem.
 * @example dateCellIssue(7, 'dmy') // { code: 'partial-date' }; dateCellIssue(8, 'dmy') // { code: 'bad-date', context: 'order-dmy' }
 */
export function dateCellIssue(problem: number, order: DateOrder | null): { readonly code: IssueCode; readonly context?: string } | null {
  switch (DATE_PROBLEMS[problem]) {
    case '':
    case undefined:
      return null;
    case 'blank':
      return { code: 'blank-time' };
    case 'error-value':
      return { code: 'error-value' };
    case 'partial':
      return { code: 'partial-date' };
    case 'wrong-order':
      return { code: 'bad-date', context: `order-${order ?? 'dmy'}` };
    case 'malformed':
      return { code: 'bad-date' };
    default:
      return { code: 'bad-date', context: DATE_PROBLEMS[problem] };
  }
}
