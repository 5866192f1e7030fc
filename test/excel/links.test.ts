/** The one-line caution's link to the summary sheet in the add-in: layout (row 2, first table's header on row 4) and Range.hyperlink. */
import { afterEach, describe, expect, it } from 'vitest';
import { cautionLine } from '../../src/core/report/cautions';
import type { SheetSpec } from '../../src/core/report/types';
import { layoutSheet } from '../../src/excel/layout';
import { documentReference, renderSheet } from '../../src/excel/renderSheet';
import { installFakeExcel, type Op } from './fakeExcel';

/** An invented listing sheet: the one-line caution, then a two-row table. */
const SPEC: SheetSpec = {
  name: 'Listing',
  title: 'Invented listing',
  blocks: [
    cautionLine('blinded'),
    { kind: 'table', id: 'List', caption: 'Rows', columns: [{ header: 'Participant', format: 'text' }], rows: [['P-1'], ['P-2']] },
  ],
};

afterEach(() => {
  Reflect.deleteProperty(globalThis, 'Excel');
});

describe('the one-line caution link in the add-in', () => {
  it('sits on row 2 under the title, so the first table has its caption on row 3 and its header on row 4', () => {
    const layout = layoutSheet(SPEC, 1900);
    expect(layout.links).toEqual([{ row: 1, column: 0, text: cautionLine('blinded').text, sheet: 'Summary', cell: 'A1' }]);
    expect(layout.tables[0]!.row).toBe(3); // 0-based: Excel row 4
    expect(layout.wrapAreas.some((a) => a.row === 1)).toBe(false);
  });

  it('links to the name the summary sheet got (here made unique as "Summary (2)"), quoting it as a document reference', async () => {
    const wb = installFakeExcel(['Data']);
    await renderSheet(SPEC, { dateSystem: 1900, linkTargets: new Map([['Summary', 'Summary (2)']]) });
    const links = wb.ops.filter((o): o is Extract<Op, { op: 'hyperlink' }> => o.op === 'hyperlink');
    expect(links).toEqual([
      { op: 'hyperlink', sheet: 'Listing', address: 'A2', value: { documentReference: "'Summary (2)'!A1", textToDisplay: cautionLine('blinded').text, screenTip: 'Go to the full cautions' } },
    ]);
    expect(documentReference("Tom's sheet", 'B3')).toBe("'Tom''s sheet'!B3"); // apostrophes doubled, as in formulas (ECMA-376 Part 1, §18.17)
  });

  it('writes the text without a link when the summary sheet was not written', async () => {
    const wb = installFakeExcel(['Data']);
    await renderSheet(SPEC, { dateSystem: 1900 });
    expect(wb.ops.some((o) => o.op === 'hyperlink')).toBe(false);
    expect(wb.ops.some((o) => o.op === 'values' && o.address === 'A2' && o.value[0]![0] === cautionLine('blinded').text)).toBe(true);
  });
});
