/**
 * The row checks of readTable, on decoded columns (decodeTable.ts): one linear pass over the data rows that decides
 * what each row can serve and adds a warning for every cell that keeps a row from a use (see readTable for the rules),
 * and one summary warning for all blank rows. Reads typed arrays and code tables only, never a cell: O(rows · mapped
 * columns) on numbers; strings are made only for issues and for the table's text columns (one reference per row).
 */
import type { CellRef } from './cellAddress';
import type { CovariatePlan } from './covariatePlan';
import { IntakeUsageError } from './errors';
import type { IssueList } from './issueList';
import { DATE_PROBLEMS, dateCellIssue } from './dateColumn';
import { NUMBER_PROBLEMS, TEXT_BLANK, TEXT_ERROR, TEXT_OK, type CodedColumn } from './decodeColumns';
import type { DecodedColumns } from './decodeTable';
import type { ColumnMapping, IssueCode, Role, TextCodes, Use } from './types';
import { textsOfCodes } from './textCodes';

const USES: readonly Use[] = ['timing', 'model'];
// Local copies of the code kinds, read per row.
const OK = TEXT_OK;
const BLANK = TEXT_BLANK;
const ERROR = TEXT_ERROR;

/** What the row checks need besides the columns. `mapping` is the checked, effective mapping (subject and a time column present). */
export interface RowCheckSetup {
  readonly mapping: ColumnMapping;
  readonly plans: readonly CovariatePlan[];
  readonly top: CellRef;
}

/** The columns the row checks give, one entry per data row. */
export interface RowColumns {
  readonly timeKind: 'date' | 'studyDay';
  readonly sheetRows: Int32Array;
  readonly subjectIndex: Int32Array;
  readonly subjectIds: string[];
  readonly date: Float64Array;
  readonly studyDay: Float64Array;
  readonly reference: Float64Array;
  readonly value: Float64Array;
  readonly visitCodes: TextCodes | null;
  readonly siteCodes: TextCodes | null;
  readonly armCodes: TextCodes | null;
  readonly covariates: (Float64Array | string[])[];
  readonly usableTiming: Uint8Array;
  readonly usableModel: Uint8Array;
  /** Present when a yes/no column is mapped: 0, 1 or NaN per row. */
  readonly responder?: Float64Array;
}

/**
 * Checks data rows 0..nRows-1 of the decoded columns and adds row warnings to `issues`, in the order a row-by-row
 * reading gives them (per row: subject, time, reference date, visit, site, value, arm, covariates; then the blank-row
 * summary). Number columns are shared with the decoded columns, not copied; text columns are given as codes (the
 * per-row strings of the table are made by checkTable only when read).
 * @example checkRows(decoded of [["Subject", "Study day", "Result"], ["K-1", 0, 60]], setup, issues).usableTiming // Uint8Array [0]
 * // with two 'bad-study-day' warnings (timing and model) at B2
 */
export function checkRows(columns: DecodedColumns, setup: RowCheckSetup, issues: IssueList): RowColumns {
  const { mapping, plans, top } = setup;
  const n = columns.nRows;
  const timeKind = mapping.date !== undefined ? 'date' : 'studyDay';
  const sc = mapping.subject!;
  const tc = timeKind === 'date' ? mapping.date! : mapping.studyDay!;
  const dateRead = columns.date;
  const dayRead = columns.studyDay;
  const refRead = columns.reference;
  if ((timeKind === 'date' && dateRead === null) || (timeKind === 'studyDay' && dayRead === null) || (mapping.reference !== undefined && refRead === null)) {
    throw new IntakeUsageError('checkRows', 'every mapped date and time column must be decoded first', timeKind);
  }
  const blank = columns.blank;

  // Subjects: codes of usable texts, renumbered in order of first appearance among non-blank rows.
  const subj = columns.subject;
  const subjectOfCode = new Int32Array(subj.texts.length).fill(-1);
  const subjectIds: string[] = [];
  const subjectIndex = new Int32Array(n).fill(-1);
  const sheetRows = new Int32Array(n);
  for (let i = 0; i < n; i++) {
    sheetRows[i] = top.row + 1 + i;
    if (blank[i] === 1) continue;
    const c = subj.codes[i]!;
    if (subj.kinds[c] !== OK) continue;
    let k = subjectOfCode[c]!;
    if (k < 0) {
      k = subjectIds.length;
      subjectOfCode[c] = k;
      subjectIds.push(subj.texts[c]!);
    }
    subjectIndex[i] = k;
  }

  const nan = (): Float64Array => new Float64Array(n).fill(NaN);
  const date = dateRead === null ? nan() : dateRead.column.days;
  const studyDay = dayRead === null ? nan() : dayRead.values;
  const reference = refRead === null ? nan() : refRead.column.days;
  const value = columns.value === null ? nan() : columns.value.values;
  const responder = columns.responder === null ? undefined : zeroOrOne(columns.responder.values);
  const usableTiming = new Uint8Array(n);
  const usableModel = new Uint8Array(n);
  const blankSpans: [number, number][] = [];
  let firstBlank = -1;
  const visitCol = columns.visit;
  const siteCol = columns.site;
  const armCol = columns.arm;
  const valueCol = columns.value;

  for (let i = 0; i < n; i++) {
    if (blank[i] === 1) {
      const sheetRow = top.row + 1 + i;
      const last = blankSpans[blankSpans.length - 1];
      if (last !== undefined && last[1] === sheetRow - 1) last[1] = sheetRow;
      else blankSpans.push([sheetRow, sheetRow]);
      if (firstBlank < 0) firstBlank = i;
      continue;
    }
    let timingOk = true;
    let modelOk = true;

    const sCode = subj.codes[i]!;
    const sKind = subj.kinds[sCode]!;
    if (sKind === ERROR) timingOk = excludeBoth(issues, 'error-value', i, sc, 'subject', subj.texts[sCode]!);
    else if (sKind === BLANK) timingOk = excludeBoth(issues, 'blank-subject', i, sc, 'subject', '');

    if (timeKind === 'date') {
      const col = dateRead!.column;
      const p = col.problems[i]!;
      if (p !== 0) {
        const why = dateCellIssue(p, dateRead!.order)!;
        timingOk = excludeBoth(issues, why.code, i, tc, 'date', col.texts.get(i) ?? '', why.context);
      }
    } else {
      const p = dayRead!.problems[i]!;
      if (p !== 0) timingOk = excludeBoth(issues, studyDayCode(p), i, tc, 'studyDay', dayRead!.texts.get(i) ?? '');
    }

    if (refRead !== null) {
      // A reference date is never required: an unusable one is kept as missing, with a warning (use null).
      const col = refRead.column;
      const p = col.problems[i]!;
      if (p !== 0 && DATE_PROBLEMS[p] !== 'blank') {
        const rc = mapping.reference!;
        const why = dateCellIssue(p, refRead.order)!;
        const text = col.texts.get(i) ?? '';
        if (why.code === 'error-value' || why.code === 'partial-date') issues.at(why.code, 'warning', i, rc, 'reference', text, null);
        else issues.at('bad-reference-date', 'warning', i, rc, 'reference', text, null, why.context);
      }
    }
    if (visitCol !== null) optionalText(visitCol, mapping.visit!, 'visit', i, issues);
    if (siteCol !== null) optionalText(siteCol, mapping.site!, 'site', i, issues);

    if (valueCol === null) modelOk = false;
    else {
      const p = valueCol.problems[i]!;
      if (p !== 0) modelOk = excludeModel(issues, NUMBER_PROBLEMS[p] as IssueCode, i, mapping.value!, 'value', valueCol.texts.get(i) ?? '');
    }

    if (armCol !== null) {
      const c = armCol.codes[i]!;
      const kind = armCol.kinds[c]!;
      if (kind === ERROR) modelOk = excludeModel(issues, 'error-value', i, mapping.arm!, 'arm', armCol.texts[c]!);
      else if (kind === BLANK) modelOk = excludeModel(issues, 'blank-arm', i, mapping.arm!, 'arm', '');
    }

    for (let c = 0; c < plans.length; c++) {
      const plan = plans[c]!;
      const col = columns.covariates[c]!;
      if ('values' in col) {
        const p = col.problems[i]!;
        // In a numeric column, text can only be numeric text, so 'text-in-numeric' cannot occur here.
        if (p !== 0) modelOk = excludeModel(issues, NUMBER_PROBLEMS[p] as IssueCode, i, plan.col, 'covariate', col.texts.get(i) ?? '', plan.name);
      } else {
        const code = col.codes[i]!;
        const kind = col.kinds[code]!;
        if (kind === ERROR) modelOk = excludeModel(issues, 'error-value', i, plan.col, 'covariate', col.texts[code]!, plan.name);
        else if (kind === BLANK) modelOk = excludeModel(issues, 'blank-value', i, plan.col, 'covariate', '', plan.name);
      }
    }

    usableTiming[i] = timingOk ? 1 : 0;
    usableModel[i] = timingOk && modelOk ? 1 : 0;
  }
  if (firstBlank >= 0) issues.blankRows(firstBlank, blankSpans);

  const visitCodes = visitCol === null ? null : tableCodes(visitCol, blank);
  const siteCodes = siteCol === null ? null : tableCodes(siteCol, blank);
  const armCodes = armCol === null ? null : tableCodes(armCol, blank);
  return {
    timeKind,
    sheetRows,
    subjectIndex,
    subjectIds,
    date,
    studyDay,
    reference,
    value,
    visitCodes,
    siteCodes,
    armCodes,
    covariates: columns.covariates.map((col) => ('values' in col ? col.values : textsOfCodes(tableCodes(col, blank)))),
    usableTiming,
    usableModel,
    ...(responder === undefined ? {} : { responder }),
  };
}

/** The issue code of a study-day cell's problem: a blank study day is 'blank-time'. */
function studyDayCode(problem: number): IssueCode {
  const name = NUMBER_PROBLEMS[problem]!;
  return name === 'blank-value' ? 'blank-time' : (name as IssueCode);
}

/** 0 or 1 as read, anything else NaN (the yes/no model leaves such rows out and says how many). */
function zeroOrOne(values: Float64Array): Float64Array {
  const out = new Float64Array(values.length);
  for (let i = 0; i < values.length; i++) {
    const v = values[i]!;
    out[i] = v === 0 || v === 1 ? v : NaN;
  }
  return out;
}

/** Adds a warning for each use (timing and model) and returns false, the row's new timing usability. */
function excludeBoth(issues: IssueList, code: IssueCode, i: number, col: number, role: Role, text: string, context?: string): false {
  for (const use of USES) issues.at(code, 'warning', i, col, role, text, use, context);
  return false;
}

/** Adds a warning for the model and returns false, the row's new model usability. */
function excludeModel(issues: IssueList, code: IssueCode, i: number, col: number, role: Role, text: string, context?: string): false {
  issues.at(code, 'warning', i, col, role, text, 'model', context);
  return false;
}

/** An optional text role (visit label, site) of data row i: an error value becomes "" with a warning (use null). */
function optionalText(col: CodedColumn, c: number, role: Role, i: number, issues: IssueList): void {
  const code = col.codes[i]!;
  if (col.kinds[code] === ERROR) issues.at('error-value', 'warning', i, c, role, col.texts[code]!, null);
}

/**
 * The table's codes of a text column: an error value and a blank row read as "", and every text once. Rows are
 * recoded only when some code changes (an error value, or a blank row whose cell is not the table's "").
 */
function tableCodes(col: CodedColumn, blank: Uint8Array): TextCodes {
  const texts: string[] = [];
  const at = new Map<string, number>();
  const remap = new Int32Array(col.texts.length);
  let same = true;
  col.texts.forEach((t, k) => {
    const text = col.kinds[k] === TEXT_ERROR ? '' : t;
    let j = at.get(text);
    if (j === undefined) {
      j = texts.length;
      at.set(text, j);
      texts.push(text);
    }
    remap[k] = j;
    if (j !== k) same = false;
  });
  const empty = (): number => {
    let j = at.get('');
    if (j === undefined) {
      j = texts.length;
      at.set('', j);
      texts.push('');
    }
    return j;
  };
  // Blank rows hold "" in every text column: their cells are blank, so their code is already the blank text's.
  if (same) return { codes: col.codes, texts };
  const codes = new Int32Array(col.codes.length);
  for (let i = 0; i < codes.length; i++) codes[i] = blank[i] === 1 ? empty() : remap[col.codes[i]!]!;
  return { codes, texts };
}

