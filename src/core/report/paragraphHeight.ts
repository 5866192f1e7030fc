/**
 * Row heights for wrapped paragraphs: the lines a text takes in a merged area of a given width, counted by laying the
 * words out with the default font's own character widths (fontWidths.ts, 11 points), and the row height that shows
 * them all. One pure function for every writer (the .xlsx writer and the add-in), so no reader cuts a paragraph.
 */
import { BOLD_WIDTHS, REGULAR_WIDTHS, UNITS_PER_EM } from './fontWidths';

/** The body font size in points (the default of current workbooks). */
export const FONT_POINTS = 11;
/** Height of one line of 11-point text in points (common practice: a spreadsheet's standard row is 15 points). */
export const LINE_POINTS = 15;
/** The largest row height in points (spreadsheet specifications and limits: 409 points). */
export const MAX_ROW_POINTS = 409;
/** Room a cell keeps free beside its text, both sides together, in points (about 2 pixels a side, from memory). */
export const CELL_PADDING_POINTS = 4;
/**
 * Text is laid out as if it were this much wider than measured: readers round glyph positions to pixels, slant italic
 * and may substitute a font a little wider, so a line that just fits by the metrics may not on screen (8%, a margin
 * of our own choosing that keeps the render check's longest caution whole in LibreOffice with room to spare).
 */
export const WIDTH_MARGIN = 1.08;

/** Width of a character with no entry in the tables: an average lowercase letter; wide scripts take a full em. */
function fallbackWidth(code: number, table: Readonly<Record<number, number>>): number {
  if (code >= 0x2e80) return UNITS_PER_EM;
  return table[0x6e] ?? UNITS_PER_EM / 2; // "n"
}

/**
 * The width of `text` in points at 11 points, regular or bold, from the font's advance widths (no kerning).
 * Example: textPoints("0000") → 4 × 1038 / 2048 × 11 = 22.30. Cost O(characters).
 */
export function textPoints(text: string, bold = false): number {
  const table = bold ? BOLD_WIDTHS : REGULAR_WIDTHS;
  let units = 0;
  for (const ch of text) {
    const code = ch.codePointAt(0)!;
    units += table[code] ?? fallbackWidth(code, table);
  }
  return (units / UNITS_PER_EM) * FONT_POINTS;
}

/**
 * Lines `text` takes when wrapped greedily at spaces into `widthPoints` (a word too long for a line is broken
 * between characters; explicit line breaks start a new line), with the cell padding and WIDTH_MARGIN taken off the
 * width first. At least 1. Cost O(characters).
 * Example: wrappedLines("a b", 1000) → 1.
 */
export function wrappedLines(text: string, widthPoints: number, bold = false): number {
  const room = Math.max(1, (widthPoints - CELL_PADDING_POINTS) / WIDTH_MARGIN);
  const space = textPoints(' ', bold);
  let lines = 0;
  for (const paragraph of text.split(/\r\n|\r|\n/)) {
    lines += 1;
    let used = 0;
    for (const word of paragraph.split(' ')) {
      const w = textPoints(word, bold);
      if (used > 0 && used + space + w <= room) {
        used += space + w;
        continue;
      }
      if (used > 0) lines += 1;
      if (w <= room) {
        used = w;
        continue;
      }
      // A word longer than a line: as many characters per line as fit, the rest starts the next line.
      used = 0;
      for (const ch of word) {
        const c = textPoints(ch, bold);
        if (used > 0 && used + c > room) {
          lines += 1;
          used = 0;
        }
        used += c;
      }
    }
  }
  return Math.max(1, lines);
}

/**
 * The width in points of a column `chars` characters wide: a character is the width of the digit "0" of the default
 * font (7 pixels at 96 dpi) plus 5 pixels of padding per column (ECMA-376 Part 1, §18.3.1.13, the col element's
 * width; the pixel figures are from memory), at 0.75 points a pixel. Example: columnWidthPoints(12) → 66.75.
 */
export function columnWidthPoints(chars: number): number {
  return (chars * 7 + 5) * 0.75;
}

/**
 * The row height in points that shows all of `text` in a merged, wrapped area `widthPoints` wide: one 15-point line
 * per wrapped line, at most 409 points (longer text is cut by every reader; 27 lines of the widest area is far beyond
 * any paragraph we write). Cost O(characters).
 * Examples: paragraphHeight("Short note.", 400) → 15; a 330-character caution in 8 columns of 12 characters
 * (8 × 66.75 = 534 points) in bold → 4 lines → 60.
 */
export function paragraphHeight(text: string, widthPoints: number, bold = false): number {
  return Math.min(MAX_ROW_POINTS, wrappedLines(text, widthPoints, bold) * LINE_POINTS);
}
