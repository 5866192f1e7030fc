/** Turning what the host returns for a cell into the intake's CellValue. */
import type { CellValue } from '../core/intake/types';

/**
 * One cell from `range.values`, optionally with its `range.valueTypes` entry (Excel.RangeValueType). `values` alone
 * tells what the reader needs (Excel JavaScript API reference, EmptyCellValue and the error cell values: an empty
 * cell's `values` entry is "", an error cell's is its text, e.g. "#N/A"), so the adapter reads `values` only: "" →
 * null (intake treats "" and null alike, as blank), an error → its text, numbers, text and booleans as they are;
 * anything else (linked or rich values) → its text. Example: toCellValue("#N/A") → "#N/A"; toCellValue("") → null.
 */
export function toCellValue(value: unknown, valueType?: string): CellValue {
  if (valueType === 'Empty' || value === null || value === undefined) return null;
  if (value === '' && valueType === undefined) return null;
  if (valueType === 'Error') return String(value);
  if (typeof value === 'number' || typeof value === 'string' || typeof value === 'boolean') return value;
  return String(value);
}
