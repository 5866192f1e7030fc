/**
 * Readable paragraphs: instead of one cell whose text runs off to the right, a paragraph gets a merged, wrapped area
 * from column A across the sheet's text width, on a row tall enough for its text. Pure; the renderer carries it out.
 */
import { paragraphHeight } from '../core/report/paragraphHeight';

export { LINE_POINTS, MAX_ROW_POINTS } from '../core/report/paragraphHeight';

/** A paragraph's merged, wrapped area: its row (0-based), from column A across `columnCount` columns. */
export interface WrapArea {
  readonly row: number;
  readonly columnCount: number;
  /** Row height that fits the text, in points. */
  readonly heightPoints: number;
}

/** The text width in columns never drops below this (short tables, or none) … */
export const MIN_TEXT_COLUMNS = 6;
/** … nor grows past this (a very wide table would make lines too long to read). */
export const MAX_TEXT_COLUMNS = 12;

/** Points per character of column width the add-in sets (renderSheet; common practice: about 7). */
export const POINTS_PER_CHARACTER = 7;

/**
 * Columns a sheet's paragraphs span: those of its widest table, kept within 6 to 12.
 * Example: textColumns([3, 8]) → 8; textColumns([]) → 6; textColumns([20]) → 12. Cost O(tables).
 */
export function textColumns(tableColumnCounts: readonly number[]): number {
  let widest = MIN_TEXT_COLUMNS;
  for (const n of tableColumnCounts) widest = Math.max(widest, n);
  return Math.min(MAX_TEXT_COLUMNS, widest);
}

/**
 * Plans the wrap areas of paragraphs (their rows, text and weight) across `columnCount` columns of the given widths
 * in characters, each `POINTS_PER_CHARACTER` points wide as the add-in sets them; the height is paragraphHeight's
 * (src/core/report/paragraphHeight.ts, the same function as the .xlsx writer's). Cost O(characters + columns).
 * Example: planWrapAreas([{ row: 2, text: 'Short note.', bold: false }], 8, [12, 12, 12, 12, 12, 12, 12, 12])
 * → [{ row: 2, columnCount: 8, heightPoints: 15 }].
 */
export function planWrapAreas(
  paragraphs: readonly { readonly row: number; readonly text: string; readonly bold: boolean }[],
  columnCount: number,
  widths: readonly number[],
): WrapArea[] {
  let chars = 0;
  for (let j = 0; j < columnCount; j++) chars += widths[j] ?? 0;
  const points = chars * POINTS_PER_CHARACTER;
  return paragraphs.map((p) => ({ row: p.row, columnCount, heightPoints: paragraphHeight(p.text, points, p.bold) }));
}
