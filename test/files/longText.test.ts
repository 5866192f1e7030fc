import { describe, expect, it } from 'vitest';
import { readXlsxBuffer } from '../../src/files/readXlsx';
import { CUT_MARKER, fitCell, MAX_CELL_TEXT, writeWorkbook } from '../../src/files/writeWorkbook';
import type { SheetSpec } from '../../src/core/report/types';

describe('the report writer and Excel\'s cell limit (issue item 9)', () => {
  it('fitCell leaves text up to 32,767 characters alone and cuts longer text to exactly 32,767 ending with the marker', () => {
    // 32,767 characters per cell: Excel specifications and limits (Microsoft's published table, from memory).
    expect(MAX_CELL_TEXT).toBe(32_767);
    const fits = 'x'.repeat(MAX_CELL_TEXT);
    expect(fitCell(fits)).toBe(fits);
    const cut = fitCell('y'.repeat(MAX_CELL_TEXT + 1));
    expect(cut.length).toBe(MAX_CELL_TEXT);
    expect(cut.endsWith(CUT_MARKER)).toBe(true);
  });

  it('writes no cell over 32,767 characters into the workbook, in tables and paragraphs alike', async () => {
    const long = 'S'.repeat(100_000);
    const spec: SheetSpec = {
      name: 'Long',
      title: 'Long text',
      blocks: [
        { kind: 'paragraph', text: long },
        { kind: 'table', id: 'T', caption: 'c', columns: [{ header: 'Subject', format: 'text' }], rows: [[long]] },
      ],
    };
    const read = await readXlsxBuffer(await writeWorkbook([spec]));
    const texts = read.cells.flat().filter((v): v is string => typeof v === 'string');
    expect(texts.filter((t) => t.startsWith('SSS')).length).toBe(2);
    for (const t of texts) expect(t.length).toBeLessThanOrEqual(MAX_CELL_TEXT);
    expect(texts.filter((t) => t.endsWith(CUT_MARKER)).length).toBe(2);
  });
});
