/**
 * The decoding step of intake: cells (any CellSource) into typed columns, once per mapped column, before any rule is
 * checked. Text roles become codes into a table of distinct texts, numeric roles Float64 values with a problem code
 * per cell, and only cells with a problem keep their text (for the issue that will name it). The checks after it
 * (checkRows.ts) read these columns and never the cells.
 */
import type { CellSource } from './cellSource';
import { cellText, ERROR_LITERALS, isBlankCell, isErrorCell, parsePlainDecimal } from './cellText';

/** What a text of a coded column is: usable text, blank, or a spreadsheet error value. */
export const TEXT_OK = 0;
export const TEXT_BLANK = 1;
export const TEXT_ERROR = 2;

/**
 * A text role read into codes: row i holds `texts[codes[i]]`, which is exactly cellText of its cell (trimmed text,
 * numbers by String(n), booleans TRUE/FALSE, "" for blank), and `kinds[codes[i]]` says whether that text is usable,
 * blank or an error value. Codes are given in order of first appearance.
 */
export interface CodedColumn {
  readonly codes: Int32Array;
  readonly texts: readonly string[];
  readonly kinds: Uint8Array;
}

/** Why a numeric cell gives no number; index 0 ('') means it gives one. 'bad-study-day' only in a study-day column. */
export const NUMBER_PROBLEMS = ['', 'blank-value', 'text-in-numeric', 'not-finite', 'error-value', 'bad-study-day'] as const;
export type NumberProblemName = (typeof NUMBER_PROBLEMS)[number];

const N_BLANK = 1;
const N_TEXT = 2;
const N_NOT_FINITE = 3;
const N_ERROR = 4;
const N_BAD_DAY = 5;

/** A numeric role read into numbers: `values[i]` (NaN where the cell gives none), `problems[i]` (an index into
 * NUMBER_PROBLEMS) and, for each row whose cell has a problem and is not blank, its text (cellText). */
export interface NumberColumn {
  readonly values: Float64Array;
  readonly problems: Uint8Array;
  readonly texts: ReadonlyMap<number, string>;
}

/**
 * Reads column `col` of data rows 1..rowCount-1 into codes. Each distinct raw text is trimmed and classified once.
 * O(rows) map look-ups; memory O(rows) Int32 plus the distinct texts.
 * @example decodeText(new GridSource([["Site"], [" S01 "], ["S01"], ["#N/A"], [null]]), 0)
 * // { codes: Int32Array [0, 0, 1, 2], texts: ["S01", "#N/A", ""], kinds: Uint8Array [0, 2, 1] }
 */
export function decodeText(cells: CellSource, col: number): CodedColumn {
  const n = Math.max(0, cells.rowCount - 1);
  const codes = new Int32Array(n);
  const texts: string[] = [];
  const kinds: number[] = [];
  const byText = new Map<string, number>();
  const code = (text: string): number => {
    let k = byText.get(text);
    if (k === undefined) {
      k = texts.length;
      texts.push(text);
      kinds.push(text === '' ? TEXT_BLANK : text.charCodeAt(0) === 35 /* # */ && ERROR_LITERALS.has(text.toUpperCase()) ? TEXT_ERROR : TEXT_OK);
      byText.set(text, k);
    }
    return k;
  };
  for (let i = 0; i < n; i++) {
    const cell = cells.cell(i + 1, col);
    if (typeof cell === 'string') {
      // Most cells are already trimmed: look the raw text up first, and trim only when it is not known.
      const k = byText.get(cell);
      codes[i] = k !== undefined ? k : code(cell.trim());
    } else codes[i] = code(cellText(cell));
  }
  return { codes, texts, kinds: Uint8Array.from(kinds) };
}

/**
 * Reads column `col` as numbers with the rules of readNumeric (readCell.ts): numbers as they are (not finite:
 * 'not-finite'), plain decimal text only when `acceptText`, blank, error values and other text as problems. With
 * `studyDay` the study-day rule of readStudyDay applies too (a whole number other than 0, else 'bad-study-day').
 * O(rows).
 * @example decodeNumbers(new GridSource([["AVAL"], [61.5], ["62"], [""], ["#N/A"]]), 0, true, false)
 * // values [61.5, 62, NaN, NaN], problems [0, 0, 1, 4], texts Map { 3 => "#N/A" }
 */
export function decodeNumbers(cells: CellSource, col: number, acceptText: boolean, studyDay: boolean): NumberColumn {
  const n = Math.max(0, cells.rowCount - 1);
  const values = new Float64Array(n).fill(NaN);
  const problems = new Uint8Array(n);
  const texts = new Map<number, string>();
  for (let i = 0; i < n; i++) {
    const cell = cells.cell(i + 1, col);
    let x = NaN;
    let problem = 0;
    if (typeof cell === 'number') {
      if (Number.isFinite(cell)) x = cell;
      else problem = N_NOT_FINITE;
    } else if (isBlankCell(cell)) problem = N_BLANK;
    else if (isErrorCell(cell)) problem = N_ERROR;
    else {
      problem = N_TEXT;
      if (typeof cell === 'string' && acceptText) {
        const y = parsePlainDecimal(cell);
        if (Number.isFinite(y)) {
          x = y;
          problem = 0;
        } else if (!Number.isNaN(y)) problem = N_NOT_FINITE;
      }
    }
    if (problem === 0 && studyDay && !(Number.isInteger(x) && x !== 0)) problem = N_BAD_DAY;
    if (problem === 0) values[i] = x;
    else {
      problems[i] = problem;
      if (problem !== N_BLANK) texts.set(i, cellText(cell));
    }
  }
  return { values, problems, texts };
}

/**
 * Blank data rows: 1 where cells 0..width-1 of data row i (range row i + 1) are all blank (CellSource.isBlankRow).
 * O(rows · width) at worst, usually one cell per row.
 */
export function decodeBlankRows(cells: CellSource, width: number): Uint8Array {
  const n = Math.max(0, cells.rowCount - 1);
  const blank = new Uint8Array(n);
  for (let i = 0; i < n; i++) if (cells.isBlankRow(i + 1, width)) blank[i] = 1;
  return blank;
}
