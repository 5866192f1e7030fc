/**
 * Block reads of large ranges (src/excel/readRange.ts) against office-addin-mock: values only appear after load()
 * and context.sync(), so a read that forgets either fails here as it would in Excel.
 */
import { afterEach, describe, expect, it } from 'vitest';
import { blockRows, isPayloadTooLarge, jsonBytes, readRange } from '../../src/excel/readRange';
import { installExcelMock, setMockValue } from './officeMock';

const ROWS = 100_000;
const COLS = 6;

/** An invented visit export: subject, visit date serial, visit label, eGFR, arm, and a site cell that is #N/A every 997th row. */
function sheetRow(i: number): [unknown[], string[]] {
  if (i === 0) return [['Subject', 'Visit date', 'Visit', 'eGFR', 'Arm', 'Site'], ['String', 'String', 'String', 'String', 'String', 'String']];
  const na = i % 997 === 0;
  const blank = i % 1009 === 0;
  return [
    [`S${String(i).padStart(6, '0')}`, 45000 + (i % 400), `Week ${12 * (i % 5)}`, blank ? '' : 40 + (i % 50) / 10, i % 2 === 0 ? 'A' : 'B', na ? '#N/A' : `Site ${i % 12}`],
    ['String', 'Double', 'String', blank ? 'Empty' : 'Double', 'String', na ? 'Error' : 'String'],
  ];
}

interface Fake {
  readonly requests: { row: number; rowCount: number; bytes: number }[];
  readonly runs: () => number;
}

/** A workbook whose selection is A1:F100000 on sheet "Visits", in the 1900 date system unless said otherwise. */
function fakeWorkbook(options: { probe?: number; refuseOver?: number; failWith?: unknown; emptySelection?: boolean } = {}): Fake {
  const requests: { row: number; rowCount: number; bytes: number }[] = [];
  let pending: { rowCount: number } | null = null;
  const context = {
    workbook: {
      // The selection is columns A:F; its intersection with the used range is A1:F100000.
      selection: {
        worksheet: {
          used: { address: 'Visits!A1:F100000' },
          getUsedRange: function (this: { used: unknown }, valuesOnly: boolean) {
            expect(valuesOnly).toBe(true);
            return this.used;
          },
        },
        intersection: { rowIndex: 0, columnIndex: 0, rowCount: ROWS, columnCount: COLS, worksheet: { name: 'Visits' } },
        getIntersectionOrNullObject: function (this: { intersection: unknown }) {
          return this.intersection;
        },
      },
      getSelectedRange: function (this: { selection: unknown }) {
        return this.selection;
      },
      functions: {
        probe: { value: options.probe ?? 1462 },
        date: function (this: { probe: unknown }) {
          return this.probe;
        },
      },
      worksheets: {
        sheet: { block: { values: [], valueTypes: [] } },
        getItem: function (this: { sheet: unknown }, name: string) {
          expect(name).toBe('Visits');
          return this.sheet;
        },
      },
    },
  };
  const mock = installExcelMock(context, () => {
    if (pending === null) return;
    const p = pending;
    pending = null;
    if (options.failWith !== undefined) throw options.failWith;
    if (options.refuseOver !== undefined && p.rowCount > options.refuseOver) {
      throw Object.assign(new Error('The request payload size has exceeded the limit.'), { code: 'RequestPayloadSizeLimitExceeded' });
    }
  });
  // isNullObject needs no load() in Excel; office-addin-mock would demand one, so it is set on the mocked object.
  const mocked = mock.excel as unknown as { context: { workbook: { selection: { intersection: object } } } };
  Object.defineProperty(mocked.context.workbook.selection.intersection, 'isNullObject', { value: options.emptySelection === true });
  // The mock copies plain data at construction, so the block reader is attached to the mocked sheet afterwards.
  const mockedSheet = (mock.excel as unknown as { context: { workbook: { worksheets: { sheet: { block: unknown; getRangeByIndexes?: unknown } } } } }).context.workbook.worksheets.sheet;
  mockedSheet.getRangeByIndexes = (row: number, column: number, rowCount: number, columnCount: number) => {
    expect([column, columnCount]).toEqual([0, COLS]);
    const values: unknown[][] = [];
    const types: string[][] = [];
    for (let i = row; i < row + rowCount; i++) {
      const [v, t] = sheetRow(i);
      values.push(v);
      types.push(t);
    }
    setMockValue(mockedSheet.block, 'values', values);
    // Only `values` is given and counted: the adapter reads values alone (valueTypes would about double the bytes).
    void types;
    requests.push({ row, rowCount, bytes: jsonBytes(values) });
    pending = { rowCount };
    return mockedSheet.block;
  };
  return { requests, runs: mock.runs };
}

afterEach(() => {
  Reflect.deleteProperty(globalThis, 'Excel');
});

describe('readRange', () => {
  it('reads a 100,000-row selection in blocks under the byte and cell budgets, every row once and in order', async () => {
    const fake = fakeWorkbook();
    const progress: number[] = [];
    const r = await readRange({ kind: 'selection' }, { onProgress: (f) => progress.push(f) });
    expect(r.cells).toHaveLength(ROWS);
    for (let i = 0; i < ROWS; i += 1) {
      const expected = i === 0 ? 'Subject' : `S${String(i).padStart(6, '0')}`;
      if (r.cells[i]?.[0] !== expected) throw new Error(`row ${i} out of order: ${String(r.cells[i]?.[0])}`);
    }
    // Blocks tile the range exactly: each starts where the previous ended.
    let next = 0;
    for (const q of fake.requests) {
      expect(q.row).toBe(next);
      next += q.rowCount;
    }
    expect(next).toBe(ROWS);
    // First block: 20,000 cells / 6 columns = 3,333 rows (the default first block). Every block stays under the
    // default 1,500,000-byte aim (a third of the web host's 5 MB limit) and 500,000 cells.
    expect(fake.requests[0]?.rowCount).toBe(3333);
    for (const q of fake.requests) {
      expect(q.bytes).toBeLessThan(1_500_000);
      expect(q.rowCount * COLS).toBeLessThanOrEqual(500_000);
    }
    // Later blocks are sized from the first one's bytes per cell, so there are few of them: one geometry request
    // plus the blocks, and far fewer blocks than 100,000 / 3,333 = 30.
    expect(fake.runs()).toBe(1 + fake.requests.length);
    expect(fake.requests.length).toBeGreaterThanOrEqual(3);
    expect(fake.requests.length).toBeLessThanOrEqual(12);
    expect(r.blockRequests).toBe(fake.requests.length);
    expect(progress.at(-1)).toBe(1);
    expect([...progress].sort((a, b) => a - b)).toEqual(progress);
    expect(r).toMatchObject({ sheet: 'Visits', address: 'A1:F100000', topLeft: 'A1', dateSystem: 1900 });
  });

  it('rejects a selection that holds no values with a plain message and reads nothing', async () => {
    const fake = fakeWorkbook({ emptySelection: true });
    await expect(readRange({ kind: 'selection' })).rejects.toThrow(/selection holds no values/);
    expect(fake.requests).toHaveLength(0);
  });

  it('turns error cells into their text and empty cells into null', async () => {
    fakeWorkbook();
    const r = await readRange({ kind: 'selection' });
    expect(r.cells[997]?.[5]).toBe('#N/A');
    expect(r.cells[1009]?.[3]).toBeNull();
    expect(r.cells[1]?.[3]).toBe(40.1);
  });

  it('retries a block the host refuses for its size with half the rows, and keeps blocks that small afterwards', async () => {
    const fake = fakeWorkbook({ refuseOver: 2000 });
    const r = await readRange({ kind: 'selection' });
    expect(r.cells).toHaveLength(ROWS);
    // 3,333 rows refused → 1,667 rows accepted; later blocks never exceed 1,667 rows again.
    expect(fake.requests.slice(0, 2).map((q) => q.rowCount)).toEqual([3333, 1667]);
    expect(fake.requests.slice(1).every((q) => q.rowCount <= 1667)).toBe(true);
    expect(r.blockRequests).toBe(fake.requests.length);
    expect(r.cells[ROWS - 1]?.[0]).toBe('S099999');
  });

  it('passes on an error that is not about size without retrying', async () => {
    const fake = fakeWorkbook({ failWith: Object.assign(new Error('The sheet is protected.'), { code: 'AccessDenied' }) });
    await expect(readRange({ kind: 'selection' })).rejects.toThrow('The sheet is protected.');
    expect(fake.requests).toHaveLength(1);
  });

  it('reads the date system with the same first request: DATE(1904,1,1) = 0 means the 1904 system', async () => {
    fakeWorkbook({ probe: 0 });
    const r = await readRange({ kind: 'selection' }, { firstBlockCells: 600_000 });
    expect(r.dateSystem).toBe(1904);
  });
});

describe('block sizing helpers', () => {
  it('blockRows takes the smaller of the byte and cell budgets and never goes below one row', () => {
    // Exact arithmetic: 1,500,000 / (30 · 10) = 5,000 rows; 500,000 / 10 = 50,000 rows.
    expect(blockRows(10, 30, 1_500_000, 500_000)).toBe(5000);
    expect(blockRows(10, 1, 1_500_000, 500_000)).toBe(50_000);
    expect(blockRows(10, 1e9, 1_500_000, 500_000)).toBe(1);
  });

  it('isPayloadTooLarge recognises the host size codes and no others', () => {
    for (const code of ['RequestPayloadSizeLimitExceeded', 'ResponsePayloadSizeLimitExceeded', 'PayloadTooLarge']) {
      expect(isPayloadTooLarge({ code, message: '' })).toBe(true);
    }
    expect(isPayloadTooLarge({ code: 'AccessDenied', message: 'No.' })).toBe(false);
  });
});
