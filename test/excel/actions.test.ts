/** The Excel host actions (src/excel/actions.ts) that need no data read: names, starter schedule, cell selection. */
import { afterEach, describe, expect, it } from 'vitest';
import { starterScheduleCells } from '../../src/core/schedule';
import { createExcelActions, scheduleMessage } from '../../src/excel/actions';
import { installFakeExcel, type Op } from './fakeExcel';

afterEach(() => {
  Reflect.deleteProperty(globalThis, 'Excel');
});

describe('createExcelActions', () => {
  it('offers the selection and the used range, and refuses a file with a plain message', async () => {
    const actions = createExcelActions();
    expect(actions.sourceKinds).toEqual(['selection', 'usedRange']);
    await expect(actions.loadData('file')).rejects.toThrow(/selection or the sheet in use/);
  });

  it('lists the sheets as schedule sources', async () => {
    installFakeExcel(['Visits', 'Visit schedule']);
    await expect(createExcelActions().listScheduleSources()).resolves.toEqual([{ name: 'Visits' }, { name: 'Visit schedule' }]);
  });

  it('writes the starter schedule at A1 of a new sheet, headings and labels as text, as a table', async () => {
    const wb = installFakeExcel(['Visit schedule']);
    const name = await createExcelActions().createStarterSchedule();
    expect(name).toBe('Visit schedule (2)');
    const cells = starterScheduleCells();
    const values = wb.ops.find((o) => o.op === 'values');
    const formats = wb.ops.find((o): o is Extract<Op, { op: 'numberFormat' }> => o.op === 'numberFormat');
    expect(values).toMatchObject({ sheet: name, address: `A1:D${cells.length}`, value: cells });
    expect(formats?.value[0]).toEqual(['@', '@', '@', '@']);
    expect(formats?.value[1]).toEqual(['@', '0', '0', '0']);
    expect(wb.ops.findIndex((o) => o.op === 'numberFormat')).toBeLessThan(wb.ops.findIndex((o) => o.op === 'values'));
    expect(wb.ops.filter((o) => o.op === 'table').map((o) => ('address' in o ? o.address : ''))).toEqual([`A1:D${cells.length}`]);
  });

  it('writeResults renders every sheet as a new sheet, shows the first and reports progress up to 1', async () => {
    const wb = installFakeExcel(['Data', 'Model']);
    const sheet = (name: string) => ({ name, title: `${name} title`, blocks: [{ kind: 'paragraph' as const, text: 'x' }] });
    const output = { ok: true as const, issues: [], excluded: [], sheets: [sheet('Model'), sheet('Visit timing')], json: {} };
    const progress: number[] = [];
    const written = await createExcelActions().writeResults(output, (f) => progress.push(f));
    expect(written).toEqual([
      { name: 'Model (2)', title: 'Model title' },
      { name: 'Visit timing', title: 'Visit timing title' },
    ]);
    expect(wb.sheets).toEqual(['Data', 'Model', 'Model (2)', 'Visit timing']);
    expect(wb.ops.filter((o) => o.op === 'activate')).toEqual([{ op: 'activate', sheet: 'Model (2)' }]);
    expect(progress.at(-1)).toBe(1);
    expect([...progress].sort((a, b) => a - b)).toEqual(progress);
  });

  it('selectCell activates the named sheet (quoted names included) and rejects an address without a sheet', async () => {
    const wb = installFakeExcel(["Bob's data"]);
    await createExcelActions().selectCell("'Bob''s data'!C17");
    expect(wb.ops.filter((o) => o.op === 'activate')).toEqual([{ op: 'activate', sheet: "Bob's data" }]);
    await expect(createExcelActions().selectCell('C17')).rejects.toThrow(/sheet name/);
  });

  it('scheduleMessage lists blocking problems with their cells and leaves warnings out', () => {
    const msg = scheduleMessage([
      { code: 'schedule-bad-target-day', severity: 'error', cell: 'Schedule!B3', row: 3, value: 'x', use: null, message: 'The target day must be a whole number.' },
      { code: 'schedule-overlap', severity: 'warning', cell: 'Schedule!B4', row: 4, value: '', use: null, message: 'Windows overlap.' },
    ]);
    expect(msg).toBe('Schedule!B3: The target day must be a whole number.');
  });
});
