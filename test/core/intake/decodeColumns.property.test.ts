import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { cellText, ERROR_LITERALS, GridSource, readTextCell, type CellValue } from '../../../src/core/intake';
import { decodeNumbers, decodeText, NUMBER_PROBLEMS, TEXT_BLANK, TEXT_ERROR, TEXT_OK } from '../../../src/core/intake/decodeColumns';
import { readDateColumn } from '../../../src/core/intake/dateColumn';
import { readNumeric, readStudyDay } from '../../../src/core/intake/readCell';

// Property tests: the decoding step (decodeColumns.ts) gives, for every cell of a random column with bad cells, exactly
// what reading that cell alone gives (readTextCell, cellText, readNumeric, readStudyDay). Exact properties, no tolerance.

const anyCell: fc.Arbitrary<CellValue> = fc.oneof(
  fc.double(), // includes NaN, ±Infinity, -0
  fc.integer({ min: -100, max: 3_000_000 }),
  fc.string({ maxLength: 6 }),
  fc.constantFrom(...ERROR_LITERALS, ' #n/a ', '#N/A', '=1+1', ' K-1 ', 'K-1', '1,000', ' 7 ', '7', '0', '-1e3', '1e999', '2.5', '2025-03-04', '2025-03'),
  fc.boolean(),
  fc.constantFrom(null, undefined, '', '   '),
);
// A column of repeated cells, as a listing repeats its sites, arms and values.
const column = fc.array(anyCell, { minLength: 1, maxLength: 8 }).chain((pool) => fc.array(fc.constantFrom(...pool), { maxLength: 40 }));
const source = (cells: readonly CellValue[]): GridSource => new GridSource([['Header'], ...cells.map((c) => [c])]);

describe('decoded columns equal the cell-by-cell reading', () => {
  it('decodeText gives each cell its cellText and says blank or error value as readTextCell does', () => {
    fc.assert(
      fc.property(column, (cells) => {
        const coded = decodeText(source(cells), 0);
        expect(coded.codes.length).toBe(cells.length);
        expect(new Set(coded.texts).size).toBe(coded.texts.length); // each text once
        cells.forEach((cell, i) => {
          const k = coded.codes[i]!;
          expect(coded.texts[k]).toBe(cellText(cell));
          const alone = readTextCell(cell);
          expect(coded.kinds[k]).toBe(alone === null ? TEXT_ERROR : alone === '' ? TEXT_BLANK : TEXT_OK);
        });
      }),
      { numRuns: 400 },
    );
  });

  it('decodeNumbers gives readNumeric (and readStudyDay) per cell, keeping the text of every non-blank bad cell', () => {
    fc.assert(
      fc.property(column, fc.boolean(), fc.boolean(), (cells, accept, studyDay) => {
        const read = decodeNumbers(source(cells), 0, accept, studyDay);
        cells.forEach((cell, i) => {
          const alone = studyDay ? readStudyDay(cell, accept) : readNumeric(cell, accept);
          const problem = NUMBER_PROBLEMS[read.problems[i]!];
          if (typeof alone === 'number') {
            expect(problem).toBe('');
            expect(Object.is(read.values[i], alone)).toBe(true);
            expect(read.texts.has(i)).toBe(false);
          } else {
            expect(Number.isNaN(read.values[i])).toBe(true);
            // readStudyDay names a blank cell 'blank-time'; the decoded column keeps 'blank-value' (checkRows renames it).
            expect(problem === 'blank-value' && alone === 'blank-time' ? 'blank-time' : problem).toBe(alone);
            expect(read.texts.get(i) ?? '').toBe(cellText(cell));
          }
        });
      }),
      { numRuns: 400 },
    );
  });

  it('readDateColumn keeps the text of every non-blank cell that gives no date', () => {
    fc.assert(
      fc.property(column, (cells) => {
        const read = readDateColumn(source(cells), 0, 1900, 'dmy');
        cells.forEach((cell, i) => {
          if (read.problems[i] === 0 || cellText(cell) === '') expect(read.texts.has(i)).toBe(false);
          else expect(read.texts.get(i)).toBe(cellText(cell));
        });
      }),
      { numRuns: 300 },
    );
  });
});
