/**
 * Reads a long-format range (header row, then one row per assessment) into typed columns, collecting every problem
 * as an issue with its cell address (SPEC §3).
 */
import { checkRows } from './checkRows';
import { checkArms } from './checkArms';
import { checkReference } from './checkReference';
import { decodeTable, type DecodedTable } from './decodeTable';
import { IssueList } from './issueList';
import { readExit } from './readExit';
import type { CellInput } from './cellSource';
import type { CovariateColumn, IntakeOptions, IntakeResult, IntakeTable } from './types';
import { textsOfCodes } from './textCodes';
import { lazyProperty } from './lazyProperty';

/**
 * Turns cells (a 2-D array or any CellSource, cellSource.ts: a CSV file's field index, the add-in's blocks) into the
 * IntakeTable: row 0 is the header row, each later row one assessment. One pass per mapped column decodes it (plus
 * one per covariate to decide its kind), then one pass of checks on the typed columns: O(rows · mapped columns).
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
 * reference date is a warning too ('reference-date-differs'). Two steps: decodeTable (decodeTable.ts) checks the header and decodes each mapped column once into typed columns; checkTable
 * applies the row rules to those columns (checkRows.ts), never reading a cell.
 *
 * Misuse throws IntakeUsageError: a malformed `topLeft`, or a grid that does not fit on a worksheet from `topLeft`.
 * @example readTable([["USUBJID", "ADY", "AVAL"], ["S1", 1, 60.5]], { sheet: "Visits", topLeft: "A1", dateSystem: 1900, mode: "blinded" })
 * // { ok: true, issues: [], table: { nRows: 1, subjectIds: ["S1"], studyDay: Float64Array [1], value: Float64Array [60.5], ... } }
 */
export function readTable(input: CellInput, options: IntakeOptions): IntakeResult {
  const decoded = decodeTable(input, options);
  return decoded.ok ? checkTable(decoded.decoded) : { ok: false, issues: decoded.issues };
}

/**
 * The second step of readTable: the row rules, the arm, reference-date and exit checks on decoded columns, and the
 * IntakeTable. Reads no cell; may be called again on the same decoded table (nothing in it is changed).
 * O(rows · mapped columns) on typed arrays.
 */
export function checkTable(decoded: DecodedTable): IntakeResult {
  const { options, top, headers, mapping, plans, nRows, columns } = decoded;
  const issues = new IssueList(options.sheet, top);
  issues.addAll(decoded.issues);
  const cols = checkRows(columns, { mapping, plans, top }, issues);
  const arms = cols.armCodes === null ? [] : checkArms(cols.armCodes, cols.subjectIndex, cols.subjectIds, cols.usableTiming, mapping.arm!, issues);
  if (mapping.reference !== undefined) checkReference(cols.reference, cols.subjectIndex, cols.subjectIds, mapping.reference, issues);
  const exitInput = { exit: columns.exit?.column ?? null, exitCol: mapping.exit ?? null, status: columns.exitStatus, reason: columns.exitReason };
  const exit = readExit(exitInput, cols.subjectIndex, cols.subjectIds, issues);
  if (!cols.usableTiming.includes(1)) issues.range('no-usable-rows', 'error', null, '', null);
  else if (mapping.value !== undefined && !cols.usableModel.includes(1)) issues.range('no-usable-rows', 'warning', null, '', 'model');
  if (issues.hasErrors) return { ok: false, issues: issues.items };

  const covariates: CovariateColumn[] = plans.map((p, c) => {
    const values = cols.covariates[c]!;
    if (values instanceof Float64Array) return { name: p.name, kind: 'numeric', values };
    const levels = [...new Set(values.filter((v) => v !== ''))].sort();
    return { name: p.name, kind: 'categorical', values, levels };
  });
  const { covariates: _raw, visitCodes, siteCodes, armCodes, ...columnsOut } = cols;
  const codes = {
    ...(visitCodes === null ? {} : { visitCodes }),
    ...(siteCodes === null ? {} : { siteCodes }),
    ...(armCodes === null ? {} : { armCodes }),
  };
  const mode = options.mode;
  const dateReadings = decoded.dateReadings;
  const table = { nRows, headers, mapping, mode, ...columnsOut, arms, covariates, dateReadings, ...exit, ...codes };
  // The per-row texts (one string reference per row) are made when first read: visit timing works on the codes.
  const { subjectIds, subjectIndex } = cols;
  lazyProperty(table, 'subject', () => Array.from(subjectIndex, (k) => (k < 0 ? '' : subjectIds[k]!)));
  lazyProperty(table, 'visit', () => (visitCodes === null ? null : textsOfCodes(visitCodes)));
  lazyProperty(table, 'site', () => (siteCodes === null ? null : textsOfCodes(siteCodes)));
  lazyProperty(table, 'arm', () => (armCodes === null ? null : textsOfCodes(armCodes)));
  return { ok: true, issues: issues.items, table: table as unknown as IntakeTable };
}
