/**
 * The row pass of readTable: one linear pass over the data rows into typed columns, adding a warning for every cell
 * that keeps a row from a use (see readTable for the rules), and one summary warning for all blank rows. O(rows · mapped columns); no per-row objects beyond
 * the strings the text columns hold.
 */
import type { CellRef } from './cellAddress';
import type { CellSource } from './cellSource';
import { cellText, readTextCell } from './cellText';
import type { CovariatePlan } from './covariatePlan';
import { IntakeUsageError } from './errors';
import type { IssueList } from './issueList';
import { dateCellIssue } from './dateColumn';
import type { DateRoleRead } from './dateRole';
import { readNumeric, readStudyDay } from './readCell';
import type { CellValue, ColumnMapping, IssueCode, Role, Use } from './types';

const USES: readonly Use[] = ['timing', 'model'];

/** What the row pass needs besides the cells. `mapping` is the checked, effective mapping (subject and a time column present). */
export interface RowPassSetup {
  readonly mapping: ColumnMapping;
  readonly plans: readonly CovariatePlan[];
  /** Width of the range (the header row's length). */
  readonly width: number;
  readonly top: CellRef;
  readonly acceptText: boolean;
  /** The date columns, already decided and read (readDateRole): the visit date when timeKind is 'date', the reference date when mapped. */
  readonly dates: { readonly date?: DateRoleRead; readonly reference?: DateRoleRead };
  readonly unblinded: boolean;
}

/** The columns the row pass fills, one entry per data row. */
export interface RowColumns {
  readonly timeKind: 'date' | 'studyDay';
  readonly sheetRows: Int32Array;
  readonly subject: string[];
  readonly subjectIndex: Int32Array;
  readonly subjectIds: string[];
  readonly date: Float64Array;
  readonly studyDay: Float64Array;
  readonly reference: Float64Array;
  readonly value: Float64Array;
  readonly visit: string[] | null;
  readonly site: string[] | null;
  readonly arm: string[] | null;
  readonly covariates: (Float64Array | string[])[];
  readonly usableTiming: Uint8Array;
  readonly usableModel: Uint8Array;
  /** Present when a yes/no column is mapped: 0, 1 or NaN per row. */
  readonly responder?: Float64Array;
}

/**
 * Reads data rows 1..rowCount-1 of `cells` into columns and adds row warnings to `issues`. Text roles keep one string
 * per distinct text (a participant's id, a visit name, a site or an arm is held once, not once per row).
 * @example readRows([["Subject", "Study day", "Result"], ["K-1", 0, 60]], setup, issues).usableTiming // Uint8Array [0]
 * // with two 'bad-study-day' warnings (timing and model) at B2
 */
export function readRows(cells: CellSource, setup: RowPassSetup, issues: IssueList): RowColumns {
  const { mapping, plans, width, top, unblinded } = setup;
  const nRows = Math.max(0, cells.rowCount - 1);
  const accept = setup.acceptText;
  const timeKind = mapping.date !== undefined ? 'date' : 'studyDay';
  const sc = mapping.subject!;
  const tc = timeKind === 'date' ? mapping.date! : mapping.studyDay!;
  const dateRead = setup.dates.date;
  const refRead = setup.dates.reference;
  if ((timeKind === 'date' && dateRead === undefined) || (mapping.reference !== undefined && refRead === undefined)) {
    throw new IntakeUsageError('readRows', 'every mapped date column must be read with readDateRole first', timeKind);
  }

  const sheetRows = new Int32Array(nRows);
  const subject = new Array<string>(nRows);
  const subjectIndex = new Int32Array(nRows);
  const subjectIds: string[] = [];
  const subjectMap = new Map<string, number>();
  const date = new Float64Array(nRows).fill(NaN);
  const studyDay = new Float64Array(nRows).fill(NaN);
  const reference = new Float64Array(nRows).fill(NaN);
  const value = new Float64Array(nRows).fill(NaN);
  // The yes/no column: 0 or 1 as read, anything else NaN (the yes/no model leaves such rows out and says how many).
  const responder = mapping.responder === undefined ? undefined : new Float64Array(nRows).fill(NaN);
  const visit = mapping.visit === undefined ? null : new Array<string>(nRows).fill('');
  const site = mapping.site === undefined ? null : new Array<string>(nRows).fill('');
  const arm = unblinded ? new Array<string>(nRows).fill('') : null;
  const covValues = plans.map((p) => (p.numeric ? new Float64Array(nRows).fill(NaN) : new Array<string>(nRows).fill('')));
  const usableTiming = new Uint8Array(nRows);
  const usableModel = new Uint8Array(nRows);
  // Blank rows become one summary issue (spans of worksheet rows), not one issue per row: a stray cell far below a
  // table must not cost a million issues.
  const blankSpans: [number, number][] = [];
  let firstBlank = -1;
  // One string per distinct text of each text role.
  const visitText = new Map<string, string>();
  const siteText = new Map<string, string>();
  const armText = new Map<string, string>();
  const covText = plans.map(() => new Map<string, string>());

  for (let i = 0; i < nRows; i++) {
    const r = i + 1;
    sheetRows[i] = top.row + 1 + i;
    subject[i] = '';
    subjectIndex[i] = -1;
    if (cells.isBlankRow(r, width)) {
      const sheetRow = top.row + 1 + i;
      const last = blankSpans[blankSpans.length - 1];
      if (last !== undefined && last[1] === sheetRow - 1) last[1] = sheetRow;
      else blankSpans.push([sheetRow, sheetRow]);
      if (firstBlank < 0) firstBlank = i;
      continue;
    }
    let timingOk = true;
    let modelOk = true;

    const sCell = cells.cell(r, sc);
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
      subject[i] = subjectIds[k]!;
      subjectIndex[i] = k;
    }

    const tCell = cells.cell(r, tc);
    if (timeKind === 'date') {
      const why = dateCellIssue(dateRead!.column.problems[i]!, dateRead!.order);
      if (why === null) date[i] = dateRead!.column.days[i]!;
      else timingOk = excludeBoth(issues, why.code, i, tc, 'date', tCell, why.context);
    } else {
      const d = readStudyDay(tCell, accept);
      if (typeof d === 'number') studyDay[i] = d;
      else timingOk = excludeBoth(issues, d, i, tc, 'studyDay', tCell);
    }

    if (mapping.reference !== undefined) {
      // A reference date is never required: an unusable one is kept as missing, with a warning (use null).
      const rc = mapping.reference;
      const why = dateCellIssue(refRead!.column.problems[i]!, refRead!.order);
      if (why === null) reference[i] = refRead!.column.days[i]!;
      else if (why.code === 'error-value' || why.code === 'partial-date') issues.at(why.code, 'warning', i, rc, 'reference', cellText(cells.cell(r, rc)), null);
      else if (why.code !== 'blank-time') issues.at('bad-reference-date', 'warning', i, rc, 'reference', cellText(cells.cell(r, rc)), null, why.context);
    }
    if (visit !== null) visit[i] = optionalText(cells, mapping.visit!, 'visit', i, issues, visitText);
    if (site !== null) site[i] = optionalText(cells, mapping.site!, 'site', i, issues, siteText);

    if (mapping.value === undefined) modelOk = false;
    else {
      const vc = mapping.value;
      const vCell = cells.cell(r, vc);
      const v = readNumeric(vCell, accept);
      if (typeof v === 'number') value[i] = v;
      else modelOk = excludeModel(issues, v, i, vc, 'value', vCell);
    }

    if (responder !== undefined) {
      const v = readNumeric(cells.cell(r, mapping.responder!), accept);
      if (v === 0 || v === 1) responder[i] = v;
    }

    if (arm !== null) {
      const ac = mapping.arm!;
      const aCell = cells.cell(r, ac);
      const a = readTextCell(aCell);
      if (a === null) modelOk = excludeModel(issues, 'error-value', i, ac, 'arm', aCell);
      else if (a === '') modelOk = excludeModel(issues, 'blank-arm', i, ac, 'arm', aCell);
      else arm[i] = interned(armText, a);
    }

    for (let c = 0; c < plans.length; c++) {
      const plan = plans[c]!;
      const cell = cells.cell(r, plan.col);
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
        else out[i] = interned(covText[c]!, text);
      }
    }

    usableTiming[i] = timingOk ? 1 : 0;
    usableModel[i] = timingOk && modelOk ? 1 : 0;
  }
  if (firstBlank >= 0) issues.blankRows(firstBlank, blankSpans);

  return {
    timeKind,
    sheetRows,
    subject,
    subjectIndex,
    subjectIds,
    date,
    studyDay,
    reference,
    value,
    visit,
    site,
    arm,
    covariates: covValues,
    usableTiming,
    usableModel,
    ...(responder === undefined ? {} : { responder }),
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

/** The one kept string equal to `text` (the first one seen), so equal texts share one string. */
function interned(kept: Map<string, string>, text: string): string {
  const k = kept.get(text);
  if (k !== undefined) return k;
  kept.set(text, text);
  return text;
}

/** Text of an optional text role (visit label, site) of data row i; an error value becomes "" with a warning (use null). */
function optionalText(cells: CellSource, col: number, role: Role, i: number, issues: IssueList, kept: Map<string, string>): string {
  const cell = cells.cell(i + 1, col);
  const text = readTextCell(cell);
  if (text !== null) return interned(kept, text);
  issues.at('error-value', 'warning', i, col, role, cellText(cell), null);
  return '';
}
