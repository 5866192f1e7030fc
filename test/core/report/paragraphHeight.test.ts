import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { BOLD_WIDTHS, REGULAR_WIDTHS, UNITS_PER_EM } from '../../../src/core/report/fontWidths';
import {
  CELL_PADDING_POINTS,
  columnWidthPoints,
  LINE_POINTS,
  MAX_ROW_POINTS,
  paragraphHeight,
  textPoints,
  WIDTH_MARGIN,
  wrappedLines,
} from '../../../src/core/report/paragraphHeight';

/** Ten zeros: 10 × 1038 units (the digit "0" of the font table) = 55.75 points at 11 points. */
const WORD = '0000000000';

describe('paragraph heights from the font widths', () => {
  // The widths come from the Carlito font files through scripts/font-widths.ts. Carlito is metric-compatible with
  // the default spreadsheet font, whose digits are all as wide as "0" (tabular figures) — a typographic fact of the
  // family, from memory; the digit "0" at 11 points is 7 pixels at 96 dpi (5.58 points), the spreadsheet's character unit.
  it('the font table gives tabular digits, a bold face at least as wide, and the width of "0" the column unit is based on', () => {
    expect(UNITS_PER_EM).toBe(2048);
    for (let c = 0x30; c <= 0x39; c++) expect(REGULAR_WIDTHS[c]).toBe(REGULAR_WIDTHS[0x30]);
    expect(Math.round((REGULAR_WIDTHS[0x30]! / UNITS_PER_EM) * 11 * (96 / 72))).toBe(7);
    let regular = 0;
    let bold = 0;
    for (let c = 0x61; c <= 0x7a; c++) {
      regular += REGULAR_WIDTHS[c]!;
      bold += BOLD_WIDTHS[c]!;
    }
    expect(bold).toBeGreaterThanOrEqual(regular);
  });

  // Exact arithmetic on the table: units / 2048 × 11 points.
  it('measures text by its characters', () => {
    expect(textPoints(WORD)).toBeCloseTo((10 * REGULAR_WIDTHS[0x30]! * 11) / 2048, 12);
    expect(textPoints('')).toBe(0);
    expect(textPoints('ab', true)).toBeCloseTo(((BOLD_WIDTHS[0x61]! + BOLD_WIDTHS[0x62]!) * 11) / 2048, 12);
    // A character with no entry: an average lowercase letter ("n"), a wide script a full em.
    expect(textPoints('\u0416')).toBeCloseTo((REGULAR_WIDTHS[0x6e]! * 11) / 2048, 12);
    expect(textPoints('\u6f22')).toBeCloseTo(11, 12);
  });

  it('wraps greedily at spaces: a width that holds two words a line gives 3 lines for 5 words', () => {
    const two = 2 * textPoints(WORD) + textPoints(' ');
    const width = CELL_PADDING_POINTS + WIDTH_MARGIN * (two + 1); // room for 2 words and 1 point, not for 3
    const five = Array.from({ length: 5 }, () => WORD).join(' ');
    expect(wrappedLines(five, width)).toBe(3);
    expect(paragraphHeight(five, width)).toBe(3 * LINE_POINTS);
    // One point less room than two words: one word a line.
    expect(wrappedLines(five, CELL_PADDING_POINTS + WIDTH_MARGIN * (two - 1))).toBe(5);
    // Explicit line breaks start new lines; an empty text is one line.
    expect(wrappedLines(`${WORD}\n${WORD}`, 1000)).toBe(2);
    expect(wrappedLines('', 100)).toBe(1);
    // A word longer than the line is broken between characters: 30 zeros in room for 10 → 3 lines.
    expect(wrappedLines('0'.repeat(30), CELL_PADDING_POINTS + WIDTH_MARGIN * (textPoints(WORD) + 0.5))).toBe(3);
  });

  // ECMA-376 Part 1 §18.3.1.13 (col width in characters of the digit "0"); 7 px a character + 5 px padding, from memory.
  it('a column of n characters is (7n + 5) pixels, 0.75 points a pixel', () => {
    expect(columnWidthPoints(12)).toBe(66.75);
    expect(columnWidthPoints(8.43)).toBeCloseTo(48.0075, 10);
  });

  it('property: the height grows with the text, never shrinks with width, and stays within 15 to 409 points', () => {
    const words = fc.array(fc.stringMatching(/^[A-Za-z0-9,.()%-]{1,14}$/), { minLength: 1, maxLength: 400 });
    fc.assert(
      fc.property(words, fc.integer({ min: 60, max: 900 }), fc.boolean(), (ws, width, bold) => {
        const text = ws.join(' ');
        const h = paragraphHeight(text, width, bold);
        expect(h).toBeGreaterThanOrEqual(LINE_POINTS);
        expect(h).toBeLessThanOrEqual(MAX_ROW_POINTS);
        expect(h % LINE_POINTS === 0 || h === MAX_ROW_POINTS).toBe(true);
        expect(paragraphHeight(`${text} more`, width, bold)).toBeGreaterThanOrEqual(h);
        expect(paragraphHeight(text, width + 50, bold)).toBeLessThanOrEqual(h);
        // Enough lines: the text's width fits in the lines counted (each line's room plus the space that ends it).
        const lines = wrappedLines(text, width, bold);
        const room = (width - CELL_PADDING_POINTS) / WIDTH_MARGIN;
        expect(textPoints(text, bold)).toBeLessThanOrEqual(lines * room + lines * textPoints(' ', bold));
      }),
      { numRuns: 300 },
    );
  });
});
