/**
 * Reads a long-format range (header row, then one row per assessment) into typed columns, collecting every problem
 * as an issue with its cell address (SPEC §3).
 */
import { columnLetters, MAX_COLUMN_INDEX, MAX_ROW, parseCell } from './cellAddress';
import { cellText } from './cellText';
import { checkMapping, effectiveMapping } from './checkMapping';
import { checkBlindedColumns } from './armColumns';
import { planCovariate, type CovariatePlan } from './covariatePlan';
import { detectMapping } from './detect';
import { IntakeUsageError } from './errors';
import { IssueList } from './issueList';
import { readRows } from './readRows';
import { checkReference } from './checkReference';
import type { CovariateColumn, DateReading, IntakeOptions, IntakeResult } from './types';
import { readDateRole } from './dateRole';
import { checkArms } from './checkArms';
import { readExit } from './readExit';
import { checkDuplicateHeaders } from './duplicateHeaders';
import { checkLongText } from './longText';
import { toCellSource, type CellInput } from './cellSource';

/**
 * Turns cells (a 2-D array or any CellSource, cellSource.ts: a CSV file's field index, the add-in's blocks) into the
 * IntakeTable: row 0 is the header row, each later row one assessment. One linear
 * pass over the rows (plus one per covariate to decide its kind), typed arrays for numbers: O(rows · mapped columns).
 * The grid is never modified.
 *
 * A row serves each use it can: visit timing needs a non-blank subject and a valid date or study day; the model also
 * needs a numeric value, an arm in unblinded mode and every mapped covariate. Every data row is accounted for: it is
 * usable for a use, or an issue with that use names it (a row left out of timing gets one issue per use; a missing
 * value column is one range-wide 'no-value-column' issue with use 'model'; all blank rows are one 'blank-row' summary
 * whose `rowSpans` name them, left out of both uses). Columns sharing a header text warn until the mapping picks one
 * (duplicateHeaders.ts); text longer than a cell holds warns at its cell (longText.ts). Errors that block the run give ok: false:
 * an empty header row, no data rows, a mapping problem (see checkMapping), a subject in two arms, no row usable for
 * timing, fewer than two arms or fewer than two subjects in an arm (unblinded mode).
 *
 * Reading rules: error values (#N/A, ...) in any role are issues; text roles (subject, visit, site, arm, categorical
 * covariates) take numbers and booleans as their text; numeric roles take numbers, and plain decimal text only with
 * `numericText: 'accept'`; dates are serials in `dateSystem` or text in the forms of dateText.ts (ISO 8601,
 * 12JAN2025, 12/01/2025 with the order of day and month decided per column or given as `dateOrder`); a partial date
 * is never guessed; a date column that cannot be read at all, or whose order cannot be decided, is one error at its
 * header cell (dateRole.ts). A study day is a non-zero integer.
 * When both a date and a study-day column are mapped, the date is read and the study-day column is not. Visit label,
 * site and reference date are never required: a blank or unusable one is kept as missing ("" or NaN), with a warning
 * (use null) when the cell held an error value or an invalid reference date. A subject's second, different
 * reference date is a warning too ('reference-date-differs'). The row pass itself is in readRows.ts.
 *
 * Misuse throws IntakeUsageError: a malformed `topLeft`, or a grid that does not fit on a worksheet from `topLeft`.
 * @example readTable([["USUBJID", "ADY", "AVAL"], ["S1", 1, 60.5]], { sheet: "Visits", topLeft: "A1", dateSystem: 1900, mode: "blinded" })
 * // { ok: true, issues: [], table: { nRows: 1, subjectIds: ["S1"], studyDay: Float64Array [1], value: Float64Array [60.5], ... } }
 */
export function readTable(input: CellInput, options: IntakeOptions): IntakeResult {
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
  const dateRead = mapping.date === undefined ? undefined : readDateRole(cells, mapping.date, 'date', nameOf(mapping.date), dateOptions, issues);
  const refRead =
    mapping.reference === undefined ? undefined : readDateRole(cells, mapping.reference, 'reference', nameOf(mapping.reference), dateOptions, issues);
  const exitRead = mapping.exit === undefined ? undefined : readDateRole(cells, mapping.exit, 'exit', nameOf(mapping.exit), dateOptions, issues);
  if (issues.hasErrors) return { ok: false, issues: issues.items };
  const dates = { ...(dateRead === undefined ? {} : { date: dateRead }), ...(refRead === undefined ? {} : { reference: refRead }) };
  const dateReadings = [dateRead?.reading, refRead?.reading, exitRead?.reading].filter((r): r is DateReading => r !== null && r !== undefined);

  const accept = options.numericText === 'accept';
  const plans: CovariatePlan[] = mapping.covariates.map((col) => {
    const name = headers[col] !== '' ? headers[col]! : `column ${columnLetters(top.col + col)}`;
    const plan = planCovariate(cells, col, name, accept);
    if (!plan.numeric && plan.hasNumbers) {
      issues.at('bad-covariate', 'warning', plan.firstNonNumericRow, col, 'covariate', plan.firstNonNumericText, null, name);
    }
    return plan;
  });

  const cols = readRows(cells, { mapping, plans, width, top, acceptText: accept, unblinded: mode === 'unblinded', dates }, issues);
  const arms = cols.arm === null ? [] : checkArms(cols.arm, cols.subjectIndex, cols.subjectIds, cols.usableTiming, mapping.arm!, issues);
  if (mapping.reference !== undefined) checkReference(cols.reference, cols.subjectIndex, cols.subjectIds, mapping.reference, issues);
  const exit = readExit(cells, mapping, cols.subjectIndex, cols.subjectIds, exitRead?.column ?? null, issues);
  if (!cols.usableTiming.includes(1)) issues.range('no-usable-rows', 'error', null, '', null);
  else if (mapping.value !== undefined && !cols.usableModel.includes(1)) issues.range('no-usable-rows', 'warning', null, '', 'model');
  if (issues.hasErrors) return { ok: false, issues: issues.items };

  const covariates: CovariateColumn[] = plans.map((p, c) => {
    const values = cols.covariates[c]!;
    if (values instanceof Float64Array) return { name: p.name, kind: 'numeric', values };
    const levels = [...new Set(values.filter((v) => v !== ''))].sort();
    return { name: p.name, kind: 'categorical', values, levels };
  });
  const { covariates: _raw, ...columns } = cols;
  return { ok: true, issues: issues.items, table: { nRows, headers, mapping, mode, ...columns, arms, covariates, dateReadings, ...exit } };
}
