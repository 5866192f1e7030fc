/**
 * Text longer than a spreadsheet cell holds. The report workbook cuts such text (src/files); intake warns at the cell
 * so the user knows, and the results JSON keeps the text whole up to JSON_TEXT_CAP characters.
 */
import type { IssueList } from './issueList';
import { toCellSource, type CellInput } from './cellSource';
import type { CellValue, ColumnMapping, Role } from './types';

/** The most characters a spreadsheet cell holds (32,767: the published limit of current spreadsheet programs; common practice). */
export const CELL_TEXT_LIMIT = 32_767;

/** The most characters of one text the results JSON keeps whole: 1,048,576 (2^20, 32 cells' worth). Longer text is
 * cut there with a marker: it bounds what one hostile cell costs (its text recurs in the issue, the left-out list and
 * the listings) while keeping any text a person pasted into a cell. */
export const JSON_TEXT_CAP = 1_048_576;

const ROLES: readonly Exclude<Role, 'covariate'>[] = ['subject', 'date', 'studyDay', 'reference', 'visit', 'value', 'arm', 'site', 'exit', 'exitStatus', 'exitReason'];

/**
 * Adds a 'long-text' warning (use null: the row is kept) for every header cell and every cell of a mapped column
 * whose text is longer than CELL_TEXT_LIMIT. Unmapped columns never reach an output and are not looked at.
 * O(rows · mapped columns).
 */
export function checkLongText(cells: CellInput, mapping: ColumnMapping, issues: IssueList): void {
  const source = toCellSource(cells);
  const header = source.rowCount > 0 ? source.rowCells(0) : [];
  const long = (v: CellValue): v is string => typeof v === 'string' && v.length > CELL_TEXT_LIMIT;
  const say = (dataRow: number, col: number, role: Role | null, text: string): void => {
    const context = text.length.toLocaleString('en-US');
    const other = JSON_TEXT_CAP.toLocaleString('en-US');
    if (dataRow < 0) issues.header('long-text', 'warning', col, role, text, context, other);
    else issues.at('long-text', 'warning', dataRow, col, role, text, null, context, other);
  };
  header.forEach((h, col) => {
    if (long(h)) say(-1, col, null, h);
  });
  const columns: [number, Role][] = [];
  for (const role of ROLES) if (mapping[role] !== undefined) columns.push([mapping[role], role]);
  for (const col of mapping.covariates) columns.push([col, 'covariate']);
  // Column by column: a source reads one column's cells in a row without building the rows (the order of the
  // warnings is by row, then column, as before).
  const found: [number, number, string][] = [];
  // A source that knows its longest text (a CSV file's index) is not read cell by cell when none can be too long.
  if (source.longestText !== undefined && source.longestText <= CELL_TEXT_LIMIT) columns.length = 0;
  columns.forEach(([col], k) => {
    for (let r = 1; r < source.rowCount; r++) {
      const v = source.cell(r, col);
      if (long(v)) found.push([r, k, v]);
    }
  });
  found.sort((x, y) => x[0] - y[0] || x[1] - y[1]);
  for (const [r, k, v] of found) say(r - 1, columns[k]![0], columns[k]![1], v);
}

/**
 * A copy of a JSON value with every string longer than `cap` cut to `cap` characters plus a marker saying how long
 * it was. Plain JSON values only (objects, arrays, strings, numbers, booleans, null). O(size of the value).
 * @example capJsonText({ a: "xxxxx" }, 3) // { a: "xxx … [cut: 5 characters in all]" }
 */
export function capJsonText<T>(value: T, cap: number = JSON_TEXT_CAP): T {
  // Nothing is copied unless something in it is cut: a results object of a million rows is walked without allocating.
  const walk = (v: unknown): unknown => {
    if (typeof v === 'string') return v.length <= cap ? v : `${v.slice(0, cap)} … [cut: ${v.length.toLocaleString('en-US')} characters in all]`;
    if (v === null || typeof v !== 'object') return v;
    if (Array.isArray(v)) {
      let out: unknown[] | null = null;
      for (let k = 0; k < v.length; k++) {
        const x: unknown = v[k];
        const y = walk(x);
        if (y !== x && out === null) out = v.slice(0, k);
        if (out !== null) out.push(y);
      }
      return out ?? v;
    }
    let out: Record<string, unknown> | null = null;
    const entries = v as Record<string, unknown>;
    for (const key of Object.keys(entries)) {
      const x = entries[key];
      const y = walk(x);
      if (y !== x && out === null) {
        out = {};
        for (const before of Object.keys(entries)) {
          if (before === key) break;
          out[before] = entries[before];
        }
      }
      if (out !== null) out[key] = y;
    }
    return out ?? v;
  };
  return walk(value) as T;
}
