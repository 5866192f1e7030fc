/** The add-in writes each 'significant' cell's own code within the patch's one number-format request. */
import { afterEach, describe, expect, it } from 'vitest';
import { numberFormatFor } from '../../src/core/report/formats';
import type { SheetSpec } from '../../src/core/report/types';
import { layoutSheet } from '../../src/excel/layout';
import { renderSheet } from '../../src/excel/renderSheet';
import { installFakeExcel, type Op } from './fakeExcel';

const VALUES = [0.00062, 1234.5678, -0.0000123, 0];
const SPEC: SheetSpec = {
  name: 'Numbers',
  title: 'Numbers by magnitude (invented)',
  blocks: [{ kind: 'table', id: 'Rates', caption: 'Estimates', columns: [{ header: 'Term', format: 'text' }, { header: 'Estimate', format: 'significant' }], rows: VALUES.map((v, i) => [`T${i}`, v]) }],
};

afterEach(() => {
  Reflect.deleteProperty(globalThis, 'Excel');
});

describe('significant cells in the add-in', () => {
  it('the layout gives each number its own code, the same as the .xlsx writer', () => {
    const layout = layoutSheet(SPEC, 1900);
    const body = layout.patches.find((p) => p.values.length === VALUES.length)!;
    expect(body.formats.map((r) => r[1])).toEqual(['0.0000000', '0', '0.00000000', '0']);
    expect(body.formats.map((r) => r[1])).toEqual(VALUES.map((v) => numberFormatFor(v, 'significant')));
  });

  it('writes the table body with one number-format request holding every cell code, before its values', async () => {
    const wb = installFakeExcel([]);
    await renderSheet(SPEC, { dateSystem: 1900 });
    const formats = wb.ops.filter((o): o is Extract<Op, { op: 'numberFormat' }> => o.op === 'numberFormat' && o.address === 'A5:B8');
    expect(formats).toHaveLength(1);
    expect(formats[0]!.value.map((r) => r[1])).toEqual(['0.0000000', '0', '0.00000000', '0']);
  });
});
