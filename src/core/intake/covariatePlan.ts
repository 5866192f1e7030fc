/**
 * Decides, before the row pass, whether each covariate column is numeric or categorical: numeric when every cell that
 * is neither blank nor a spreadsheet error value is a number (or, with numeric text accepted, plain decimal text);
 * otherwise categorical. O(rows) per covariate.
 */
import { isBlankCell, isErrorCell, parsePlainDecimal, cellText } from './cellText';
import { toCellSource, type CellInput } from './cellSource';

export interface CovariatePlan {
  /** Range column index. */
  readonly col: number;
  /** Header text, or "column X" when the header cell is blank (given by the caller, who knows the sheet columns). */
  readonly name: string;
  readonly numeric: boolean;
  /** For a categorical column that also holds numbers: the first cell that made it categorical (0-based data row). */
  readonly firstNonNumericRow: number;
  readonly firstNonNumericText: string;
  readonly hasNumbers: boolean;
}

/**
 * Plans how one covariate column is read, from all its data cells (cells[1..]). O(rows).
 * @example planCovariate([["Age"], [63], [""], ["#N/A"], [58]], 0, "Age", false).numeric // true
 * @example planCovariate([["Sex"], ["F"], [2]], 0, "Sex", false) // numeric false, hasNumbers true, firstNonNumericRow 0
 */
export function planCovariate(
  cells: CellInput,
  col: number,
  name: string,
  acceptText: boolean,
): CovariatePlan {
  let firstNonNumericRow = -1;
  let firstNonNumericText = '';
  let hasNumbers = false;
  const source = toCellSource(cells);
  for (let r = 1; r < source.rowCount; r++) {
    const cell = source.cell(r, col);
    if (isBlankCell(cell) || isErrorCell(cell)) continue;
    const isNumber =
      typeof cell === 'number' || (acceptText && typeof cell === 'string' && !Number.isNaN(parsePlainDecimal(cell)));
    if (isNumber) hasNumbers = true;
    else if (firstNonNumericRow < 0) {
      firstNonNumericRow = r - 1;
      firstNonNumericText = cellText(cell);
    }
  }
  return {
    col,
    name,
    numeric: firstNonNumericRow < 0,
    firstNonNumericRow,
    firstNonNumericText,
    hasNumbers,
  };
}
