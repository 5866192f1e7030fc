/** The Excel host actions (src/excel/actions.ts) that need no data read: names, starter schedule, cell selection. */
import { afterEach, describe, expect, it } from 'vitest';
import { starterScheduleCells } from '../../src/core/schedule';
import { createExcelActions, scheduleMessage, STARTER_ALLOWANCE_RULE, STARTER_DAY_RULE } from '../../src/excel/actions';
import { supportsExcelApi } from '../../src/excel/features';
import { installFakeExcel, type Op } from './fakeExcel';

afterEach(() => {
  Reflect.deleteProperty(globalThis, 'Excel');
  Reflect.deleteProperty(globalThis, 'Office');
});

/** A stand-in Office global whose host supports ExcelApi up to `highest` (minor versions of 1.x compared as numbers). */
function installOffice(highest: number): string[] {
  const asked: string[] = [];
  const isSetSupported = (name: string, version: string): boolean => {
    asked.push(`${name} ${version}`);
    return name === 'ExcelApi' && Number(version.split('.')[1]) <= highest;
  };
  Object.assign(globalThis, { Office: { context: { requirements: { isSetSupported } } } });
  return asked;
}

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

  it('adds cell checks to the starter schedule where ExcelApi 1.8 is supported: whole days, no day 0, allowances of 0 or more', async () => {
    const asked = installOffice(8);
    const wb = installFakeExcel([]);
    await createExcelActions().createStarterSchedule();
    expect(asked).toContain('ExcelApi 1.8');
    const rows = starterScheduleCells().length;
    const checks = wb.ops.filter((o): o is Extract<Op, { op: 'validation' }> => o.op === 'validation');
    expect(checks.map((c) => [c.address, c.key])).toEqual([
      [`B2:B${rows}`, 'rule'],
      [`B2:B${rows}`, 'errorAlert'],
      [`C2:D${rows}`, 'rule'],
      [`C2:D${rows}`, 'errorAlert'],
    ]);
    expect(checks[0]?.value).toEqual({ wholeNumber: { formula1: 0, operator: 'NotEqualTo' } });
    expect(checks[1]?.value).toMatchObject({ showAlert: true, style: 'Stop', message: STARTER_DAY_RULE });
    expect(checks[2]?.value).toEqual({ wholeNumber: { formula1: 0, operator: 'GreaterThanOrEqualTo' } });
    expect(checks[3]?.value).toMatchObject({ showAlert: true, style: 'Stop', message: STARTER_ALLOWANCE_RULE });
  });

  it('in an Excel that stops at ExcelApi 1.7 the starter schedule is written the same, only without the cell checks', async () => {
    installOffice(7);
    const wb = installFakeExcel([]);
    const name = await createExcelActions().createStarterSchedule();
    expect(name).toBe('Visit schedule');
    expect(wb.ops.filter((o) => o.op === 'validation')).toEqual([]);
    expect(wb.ops.filter((o) => o.op === 'table')).toHaveLength(1);
    expect(wb.cells.get('Visit schedule!B3')).toBe(starterScheduleCells()[2]?.[1]);
  });

  it('supportsExcelApi asks the host, and answers false where there is no Office host (the page, tests)', () => {
    expect(supportsExcelApi('1.8')).toBe(false);
    installOffice(7);
    expect(supportsExcelApi('1.7')).toBe(true);
    expect(supportsExcelApi('1.8')).toBe(false);
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
