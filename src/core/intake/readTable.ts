/**
 * Reads a long-format range (header row, then one row per assessment) into typed columns, collecting every problem
 * as an issue with its cell address (SPEC §3).
 */
import { columnLetters, MAX_COLUMN_INDEX, MAX_ROW, parseCell } from './cellAddress';
import { cellText, isBlankCell, readTextCell } from './cellText';
import { checkMapping, effectiveMapping } from './checkMapping';
import { planCovariate, type CovariatePlan } from './covariatePlan';
import { detectMapping } from './detect';
import { IntakeUsageError } from './errors';
import { IssueList } from './issueList';
import { readDate, readNumeric, readStudyDay } from './readCell';
import type { CellValue, CovariateColumn, IntakeOptions, IntakeResult, IssueCode, Role, Use } from './types';
import { checkArms } from './checkArms';

const EMPTY_ROW: readonly CellValue[] = [];
const USES: readonly Use[] = ['timing', 'model'];

/**
 * Turns a grid of cells into the IntakeTable: cells[0] is the header row, each later row one assessment. One linear
 * pass over the rows (plus one per covariate to decide its kind), typed arrays for numbers: O(rows · mapped columns).
 * The grid is never modified.
 *
 * A row serves each use it can: visit timing needs a non-blank subject and a valid date or study day; the model also
 * needs a numeric value, an arm in unblinded mode and every mapped covariate. Every data row is accounted for: it is
 * usable for a use, or an issue with that use names it (a row left out of timing gets one issue per use; a missing
 * value column is one range-wide 'no-value-column' issue with use 'model'). Errors that block the run give ok: false:
 * an empty header row, no data rows, a mapping problem (see checkMapping), a subject in two arms, no row usable for
 * timing, fewer than two arms or fewer than two subjects in an arm (unblinded mode).
 *
 * Reading rules: error values (#N/A, ...) in any role are issues; text roles (subject, visit, site, arm, categorical
 * covariates) take numbers and booleans as their text; numeric roles take numbers, and plain decimal text only with
 * `numericText: 'accept'`; dates are serials in `dateSystem` or ISO 8601 text; a study day is a non-zero integer.
 * When both a date and a study-day column are mapped, the date is read and the study-day column is not. Visit label,
 * site and reference date are never required: a blank or unusable one is kept as missing ("" or NaN), with a warning
 * (use null) when the cell held an error value or an invalid reference date.
 *
 * Misuse throws IntakeUsageError: a malformed `topLeft`, or a grid that does not fit on a worksheet from `topLeft`.
 * @example readTable([["USUBJID", "ADY", "AVAL"], ["S1", 1, 60.5]], { sheet: "Visits", topLeft: "A1", dateSystem: 1900, mode: "blinded" })
 * // { ok: true, issues: [], table: { nRows: 1, subjectIds: ["S1"], studyDay: Float64Array [1], value: Float64Array [60.5], ... } }
 */
export function readTable(cells: readonly (readonly CellValue[])[], options: IntakeOptions): IntakeResult {
  const top = parseCell(options.topLeft);
  const headerRow = cells[0] ?? EMPTY_ROW;
  const width = headerRow.length;
  const nRows = Math.max(0, cells.length - 1);
  if (top.col + Math.max(width, 1) - 1 > MAX_COLUMN_INDEX || top.row + nRows > MAX_ROW) {
    throw new IntakeUsageError('readTable', 'the grid does not fit on a worksheet from its top-left cell', `${options.topLeft}, ${cells.length} rows x ${width} columns`);
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
  if (issues.hasErrors) return { ok: false, issues: issues.items };

  const accept = options.numericText === 'accept';
  const plans: CovariatePlan[] = mapping.covariates.map((col) => {
    const name = headers[col] !== '' ? headers[col]! : `column ${columnLetters(top.col + col)}`;
    const plan = planCovariate(cells, col, name, accept);
    if (!plan.numeric && plan.hasNumbers) {
      issues.at('bad-covariate', 'warning', plan.firstNonNumericRow, col, 'covariate', plan.firstNonNumericText, null, name);
    }
    return plan;
  });

  const timeKind = mapping.date !== undefined ? 'date' : 'studyDay';
  const sc = mapping.subject!;
  const tc = timeKind === 'date' ? mapping.date! : mapping.studyDay!;
  const unblinded = mode === 'unblinded';

  const sheetRows = new Int32Array(nRows);
  const subject = new Array<string>(nRows);
  const subjectIndex = new Int32Array(nRows);
  const subjectIds: string[] = [];
  const subjectMap = new Map<string, number>();
  const date = new Float64Array(nRows).fill(NaN);
  const studyDay = new Float64Array(nRows).fill(NaN);
  const reference = new Float64Array(nRows).fill(NaN);
  const value = new Float64Array(nRows).fill(NaN);
  const visit = mapping.visit === undefined ? null : new Array<string>(nRows).fill('');
  const site = mapping.site === undefined ? null : new Array<string>(nRows).fill('');
  const arm = unblinded ? new Array<string>(nRows).fill('') : null;
  const covValues = plans.map((p) => (p.numeric ? new Float64Array(nRows).fill(NaN) : new Array<string>(nRows).fill('')));
  const usableTiming = new Uint8Array(nRows);
  const usableModel = new Uint8Array(nRows);

  for (let i = 0; i < nRows; i++) {
    const row = cells[i + 1] ?? EMPTY_ROW;
    sheetRows[i] = top.row + 1 + i;
    subject[i] = '';
    subjectIndex[i] = -1;
    if (isBlankRow(row, width)) {
      for (const use of USES) issues.at('blank-row', 'warning', i, 0, null, '', use);
      continue;
    }
    let timingOk = true;
    let modelOk = true;

    const sCell = row[sc];
    const id = readTextCell(sCell);
    if (id === null) timingOk = excludeBoth(issues, 'error-value', i, sc, 'subject', sCell);
    else if (id === '') timingOk = excludeBoth(issues, 'blank-subject', i, sc, 'subject', sCell);
    else {
      let k = subjectMap.get(id);
      if (k === undefined) {
        k = subjectIds.length;
        subjectMap.set(id, k);
        subjectIds.push(id);
      }
      subject[i] = id;
      subjectIndex[i] = k;
    }

    const tCell = row[tc];
    if (timeKind === 'date') {
      const d = readDate(tCell, options.dateSystem);
      if (typeof d === 'number') date[i] = d;
      else timingOk = excludeBoth(issues, d, i, tc, 'date', tCell, typeof tCell === 'number' ? 'serial' : undefined);
    } else {
      const d = readStudyDay(tCell, accept);
      if (typeof d === 'number') studyDay[i] = d;
      else timingOk = excludeBoth(issues, d, i, tc, 'studyDay', tCell);
    }

    if (mapping.reference !== undefined) {
      const rc = mapping.reference;
      const d = readDate(row[rc], options.dateSystem);
      if (typeof d === 'number') reference[i] = d;
      else if (d === 'error-value') issues.at('error-value', 'warning', i, rc, 'reference', cellText(row[rc]), null);
      else if (d !== 'blank-time') issues.at('bad-reference-date', 'warning', i, rc, 'reference', cellText(row[rc]), null);
    }
    if (visit !== null) visit[i] = optionalText(row, mapping.visit!, 'visit', i, issues);
    if (site !== null) site[i] = optionalText(row, mapping.site!, 'site', i, issues);

    if (mapping.value === undefined) modelOk = false;
    else {
      const vc = mapping.value;
      const v = readNumeric(row[vc], accept);
      if (typeof v === 'number') value[i] = v;
      else modelOk = excludeModel(issues, v, i, vc, 'value', row[vc]);
    }

    if (arm !== null) {
      const ac = mapping.arm!;
      const a = readTextCell(row[ac]);
      if (a === null) modelOk = excludeModel(issues, 'error-value', i, ac, 'arm', row[ac]);
      else if (a === '') modelOk = excludeModel(issues, 'blank-arm', i, ac, 'arm', row[ac]);
      else arm[i] = a;
    }

    for (let c = 0; c < plans.length; c++) {
      const plan = plans[c]!;
      const cell = row[plan.col];
      const out = covValues[c]!;
      if (out instanceof Float64Array) {
        const v = readNumeric(cell, accept);
        // In a numeric column, text can only be numeric text, so 'text-in-numeric' cannot occur here.
        if (typeof v === 'number') out[i] = v;
        else modelOk = excludeModel(issues, v, i, plan.col, 'covariate', cell, plan.name);
      } else {
        const text = readTextCell(cell);
        if (text === null) modelOk = excludeModel(issues, 'error-value', i, plan.col, 'covariate', cell, plan.name);
        else if (text === '') modelOk = excludeModel(issues, 'blank-value', i, plan.col, 'covariate', cell, plan.name);
        else out[i] = text;
      }
    }

    usableTiming[i] = timingOk ? 1 : 0;
    usableModel[i] = timingOk && modelOk ? 1 : 0;
  }

  const arms = arm === null ? [] : checkArms(arm, subjectIndex, subjectIds, usableTiming, mapping.arm!, issues);
  if (!usableTiming.includes(1)) issues.range('no-usable-rows', 'error', null, '', null);
  else if (mapping.value !== undefined && !usableModel.includes(1)) issues.range('no-usable-rows', 'warning', null, '', 'model');
  if (issues.hasErrors) return { ok: false, issues: issues.items };

  const covariates: CovariateColumn[] = plans.map((p, c) => {
    const values = covValues[c]!;
    if (values instanceof Float64Array) return { name: p.name, kind: 'numeric', values };
    const levels = [...new Set(values.filter((v) => v !== ''))].sort();
    return { name: p.name, kind: 'categorical', values, levels };
  });

  return {
    ok: true,
    issues: issues.items,
    table: {
      nRows,
      headers,
      mapping,
      mode,
      sheetRows,
      subject,
      subjectIndex,
      subjectIds,
      timeKind,
      date,
      studyDay,
      reference,
      visit,
      value,
      arm,
      arms,
      site,
      covariates,
      usableTiming,
      usableModel,
    },
  };
}

/** Adds a warning for each use (timing and model) and returns false, the row's new timing usability. */
function excludeBoth(issues: IssueList, code: IssueCode, i: number, col: number, role: Role, cell: CellValue, context?: string): false {
  for (const use of USES) issues.at(code, 'warning', i, col, role, cellText(cell), use, context);
  return false;
}

/** Adds a warning for the model and returns false, the row's new model usability. */
function excludeModel(issues: IssueList, code: IssueCode, i: number, col: number, role: Role, cell: CellValue, context?: string): false {
  issues.at(code, 'warning', i, col, role, cellText(cell), 'model', context);
  return false;
}

/** True when every cell of the row within the range's width is blank. Stops at the first non-blank cell. */
function isBlankRow(row: readonly CellValue[], width: number): boolean {
  for (let c = 0; c < width; c++) if (!isBlankCell(row[c])) return false;
  return true;
}

/** Text of an optional text role (visit label, site); an error value becomes "" with a warning (use null). */
function optionalText(row: readonly CellValue[], col: number, role: Role, i: number, issues: IssueList): string {
  const text = readTextCell(row[col]);
  if (text !== null) return text;
  issues.at('error-value', 'warning', i, col, role, cellText(row[col]), null);
  return '';
}
