/** Turning what the host returns for a cell into the intake's CellValue. */
import type { CellValue } from '../core/intake/types';

/**
 * One cell from `range.values` and `range.valueTypes` (Excel.RangeValueType): "Empty" → null, "Error" → the
 * error's text ("#N/A", "#VALUE!"; values already carries it), numbers, text and booleans as they are; anything
 * else (linked or rich values) → its text. Example: toCellValue("#N/A", "Error") → "#N/A".
 */
export function toCellValue(value: unknown, valueType: string | undefined): CellValue {
  if (valueType === 'Empty' || value === null || value === undefined) return null;
  if (valueType === 'Error') return String(value);
  if (typeof value === 'number' || typeof value === 'string' || typeof value === 'boolean') return value;
  return String(value);
}
