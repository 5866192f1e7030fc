/**
 * The first half of readTable: the header row and the mapping are checked, then every mapped column of the source is
 * decoded once into typed columns (decodeColumns.ts; dates by readDateRole). Nothing after this step reads a cell.
 */
import { columnLetters, MAX_COLUMN_INDEX, MAX_ROW, parseCell, type CellRef } from './cellAddress';
import { cellText } from './cellText';
import { checkMapping, effectiveMapping } from './checkMapping';
import { checkBlindedColumns } from './armColumns';
import { planCovariate, type CovariatePlan } from './covariatePlan';
import { detectMapping } from './detect';
import { IntakeUsageError } from './errors';
import { IssueList } from './issueList';
import type { ColumnMapping, DateReading, IntakeOptions, Issue } from './types';
import { readDateRole, type DateRoleRead } from './dateRole';
import { checkDuplicateHeaders } from './duplicateHeaders';
import { checkLongText } from './longText';
import { toCellSource, type CellInput, type CellSource } from './cellSource';
import { decodeBlankRows, decodeNumbers, decodeText, type CodedColumn, type NumberColumn } from './decodeColumns';

/** Every mapped column of the data rows as typed columns; index i is data row i (range row i + 1). */
export interface DecodedColumns {
  readonly nRows: number;
  /** 1 where every cell of the row's range width is blank. */
  readonly blank: Uint8Array;
  readonly subject: CodedColumn;
  /** The visit date (timeKind 'date'), read in its decided order. */
  readonly date: DateRoleRead | null;
  /** The study day (timeKind 'studyDay'), read with the study-day rule. */
  readonly studyDay: NumberColumn | null;
  readonly reference: DateRoleRead | null;
  readonly exit: DateRoleRead | null;
  readonly visit: CodedColumn | null;
  readonly site: CodedColumn | null;
  /** Unblinded mode only. */
  readonly arm: CodedColumn | null;
  readonly value: NumberColumn | null;
  readonly responder: NumberColumn | null;
  readonly exitStatus: CodedColumn | null;
  readonly exitReason: CodedColumn | null;
  /** One per covariate plan: numbers for a numeric covariate, codes for a categorical one. */
  readonly covariates: readonly (NumberColumn | CodedColumn)[];
}

/** What the checks need: the decoded columns and everything decided from the header row. */
export interface DecodedTable {
  readonly options: IntakeOptions;
  readonly top: CellRef;
  readonly headers: readonly string[];
  readonly mapping: ColumnMapping;
  readonly width: number;
  readonly nRows: number;
  readonly plans: readonly CovariatePlan[];
  /** Issues found while decoding (mapping, headers, long text, covariate kinds): warnings only, or the result is not ok. */
  readonly issues: readonly Issue[];
  readonly dateReadings: readonly DateReading[];
  readonly columns: DecodedColumns;
}

export type DecodeResult = { readonly ok: true; readonly decoded: DecodedTable } | { readonly ok: false; readonly issues: readonly Issue[] };

/**
 * Checks the header row and the mapping, then decodes every mapped column (see readTable for the rules). Stops with
 * ok: false on an empty header row, no data rows, a mapping problem or a date column that cannot be read. Throws
 * IntakeUsageError on a malformed `topLeft` or a grid that does not fit on a worksheet. O(rows · mapped columns).
 * @example decodeTable([["USUBJID", "ADY", "AVAL"], ["S1", 1, 60.5]], options).ok // true; columns.value.values [60.5]
 */
export function decodeTable(input: CellInput, options: IntakeOptions): DecodeResult {
  const top = parseCell(options.topLeft);
  const cells = toCellSource(input);
  const headerRow = cells.rowCount > 0 ? cells.rowCells(0) : [];
  const width = headerRow.length;
  const nRows = Math.max(0, cells.rowCount - 1);
  if (top.col + Math.max(width, 1) - 1 > MAX_COLUMN_INDEX || top.row + nRows > MAX_ROW) {
    throw new IntakeUsageError('readTable', 'the grid does not fit on a worksheet from its top-left cell', `${options.topLeft}, ${cells.rowCount} rows x ${width} columns`);
  }
  const issues = new IssueList(options.sheet, top);
  const headers = Array.from(headerRow, (h) => cellText(h));
  if (headers.every((h) => h === '')) {
    issues.range('empty-header', 'error', null, '', null);
    return { ok: false, issues: issues.items };
  }
  if (nRows === 0) {
    issues.range('no-rows', 'error', null, '', null);
    return { ok: false, issues: issues.items };
  }
  const mode = options.mode;
  const mapping = effectiveMapping(options.mapping ?? detectMapping(headers, mode).mapping, mode);
  checkMapping(mapping, headers, mode, issues);
  checkDuplicateHeaders(headers, mapping, options.sheet, top, issues);
  checkLongText(cells, mapping, issues);
  if (mode === 'blinded') checkBlindedColumns(mapping, headers, issues);
  if (issues.hasErrors) return { ok: false, issues: issues.items };

  // Date columns first: each decides its order of day and month, and a column that cannot be read, or whose order
  // cannot be decided, stops the run with one message at its header cell before any row is read.
  const nameOf = (col: number): string => (headers[col] !== '' ? headers[col]! : `column ${columnLetters(top.col + col)}`);
  const dateOptions = { dateSystem: options.dateSystem, ...(options.dateOrder === undefined ? {} : { dateOrder: options.dateOrder }) };
  const dateRead = mapping.date === undefined ? null : readDateRole(cells, mapping.date, 'date', nameOf(mapping.date), dateOptions, issues);
  const refRead = mapping.reference === undefined ? null : readDateRole(cells, mapping.reference, 'reference', nameOf(mapping.reference), dateOptions, issues);
  const exitRead = mapping.exit === undefined ? null : readDateRole(cells, mapping.exit, 'exit', nameOf(mapping.exit), dateOptions, issues);
  if (issues.hasErrors) return { ok: false, issues: issues.items };
  const dateReadings = [dateRead?.reading, refRead?.reading, exitRead?.reading].filter((r): r is DateReading => r !== null && r !== undefined);

  const accept = options.numericText === 'accept';
  const plans: CovariatePlan[] = mapping.covariates.map((col) => {
    const plan = planCovariate(cells, col, nameOf(col), accept);
    if (!plan.numeric && plan.hasNumbers) {
      issues.at('bad-covariate', 'warning', plan.firstNonNumericRow, col, 'covariate', plan.firstNonNumericText, null, plan.name);
    }
    return plan;
  });
  const columns = decodeColumns(cells, mapping, plans, width, accept, mode === 'unblinded', { date: dateRead, reference: refRead, exit: exitRead });
  return { ok: true, decoded: { options, top, headers, mapping, width, nRows, plans, issues: issues.items, dateReadings, columns } };
}

/** Decodes the mapped columns other than dates (already read). `mapping` is checked: a subject and a time column exist. */
function decodeColumns(
  cells: CellSource,
  mapping: ColumnMapping,
  plans: readonly CovariatePlan[],
  width: number,
  accept: boolean,
  unblinded: boolean,
  dates: { readonly date: DateRoleRead | null; readonly reference: DateRoleRead | null; readonly exit: DateRoleRead | null },
): DecodedColumns {
  const text = (col: number | undefined): CodedColumn | null => (col === undefined ? null : decodeText(cells, col));
  const numbers = (col: number | undefined, studyDay = false): NumberColumn | null => (col === undefined ? null : decodeNumbers(cells, col, accept, studyDay));
  return {
    nRows: Math.max(0, cells.rowCount - 1),
    blank: decodeBlankRows(cells, width),
    subject: decodeText(cells, mapping.subject!),
    date: dates.date,
    studyDay: mapping.date === undefined ? numbers(mapping.studyDay, true) : null,
    reference: dates.reference,
    exit: dates.exit,
    visit: text(mapping.visit),
    site: text(mapping.site),
    arm: unblinded ? text(mapping.arm) : null,
    value: numbers(mapping.value),
    responder: numbers(mapping.responder),
    exitStatus: text(mapping.exitStatus),
    exitReason: text(mapping.exitReason),
    covariates: plans.map((p) => (p.numeric ? decodeNumbers(cells, p.col, accept, false) : decodeText(cells, p.col))),
  };
}
