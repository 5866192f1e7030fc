/**
 * Readable paragraphs: instead of one cell whose text runs off to the right, a paragraph gets a merged, wrapped area
 * from column A across the sheet's text width, on a row tall enough for its text. Pure; the renderer carries it out.
 */

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

/** Height of one line of text at the default font size, in points (common practice: Excel's standard row, 15). */
export const LINE_POINTS = 15;
/** Excel's maximum row height in points (Excel specifications and limits: 409 points). */
export const MAX_ROW_POINTS = 409;
/**
 * Prose characters per character of column width: widths count the digit "0", and an average character of prose
 * is a little narrower (common practice approximation).
 */
const PROSE_PER_WIDTH = 1.1;

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
 * Row height in points for `characters` of text in an area `widthCharacters` wide:
 * lines = ceil(characters / (width × 1.1)), at least 1; height = lines × 15, at most 409.
 * Example: fitHeight(300, 96) → 3 lines → 45. Cost O(1).
 */
export function fitHeight(characters: number, widthCharacters: number): number {
  const perLine = Math.max(1, widthCharacters) * PROSE_PER_WIDTH;
  const lines = Math.max(1, Math.ceil(characters / perLine));
  return Math.min(MAX_ROW_POINTS, lines * LINE_POINTS);
}

/**
 * Plans the wrap areas of paragraphs (their rows and text lengths) across `columnCount` columns of the given widths
 * in characters. Cost O(paragraphs + columns).
 * Example: planWrapAreas([{ row: 2, characters: 300 }], 8, [12, 12, 12, 12, 12, 12, 12, 12])
 * → [{ row: 2, columnCount: 8, heightPoints: 45 }].
 */
export function planWrapAreas(
  paragraphs: readonly { readonly row: number; readonly characters: number }[],
  columnCount: number,
  widths: readonly number[],
): WrapArea[] {
  let width = 0;
  for (let j = 0; j < columnCount; j++) width += widths[j] ?? 0;
  return paragraphs.map((p) => ({ row: p.row, columnCount, heightPoints: fitHeight(p.characters, width) }));
}
