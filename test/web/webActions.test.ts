// @vitest-environment jsdom
import { describe, expect, it, vi } from 'vitest';
import { File as NodeFile } from 'node:buffer';
import { readFileSync } from 'node:fs';
import { resolve } from 'node:path';
import { STARTER_SCHEDULE } from '../../src/core/schedule';
import type { AnalysisOutput } from '../../src/core/pipeline/types';
import ExcelJS from 'exceljs';
import { fromSaved, toAnalysisSettings } from '../../src/taskpane/paneSettings';
import {
  baseName,
  createWebActions,
  readDataFile,
  scheduleMessage,
  splitAddress,
  STARTER_NAME,
} from '../../src/web/webActions';

// jsdom's File has no text(); Node's File (the same Web File API) does, and is what the page's code gets in a browser.
const csv = (name: string, text: string): File => new NodeFile([text], name, { type: 'text/csv' }) as unknown as File;
const demo = (name: string): File => csv(name, readFileSync(resolve(process.cwd(), 'demo', name), 'utf8'));

describe('reading files on the page', () => {
  it('reads a CSV file as text cells, names the sheet after the file, and lets intake read numbers from text', async () => {
    const actions = createWebActions();
    const source = await actions.loadData('file', csv('visits.csv', 'USUBJID,AVAL\nK-1,61.5\n'));
    expect(source).toEqual({
      label: 'visits.csv',
      sheet: 'visits',
      topLeft: 'A1',
      dateSystem: 1900,
      cells: [
        ['USUBJID', 'AVAL'],
        ['K-1', '61.5'],
      ],
      numericText: 'accept',
    });
    expect(actions.store.get().source).toBe(source);
  });

  it('reads a CSV file as the command line does: damaged UTF-8 and fields past the header are notes with their cells, passed on to the run', async () => {
    // Generated: a header, a value with one invalid byte (0xFF, never valid in UTF-8: Unicode Standard, Table 3-7,
    // from memory) among site names with valid two-byte UTF-8 (so the file reads as UTF-8), then a field past the header.
    const bytes = Uint8Array.from([...Buffer.from('USUBJID,AVAL,SITEID\nK-1,6'), 0xff, ...Buffer.from('1.5,Zürich\nK-2,60,Düren,extra\n')]);
    const source = await readDataFile(new NodeFile([bytes], 'visits.csv') as unknown as File);
    expect(source.label).toBe('visits.csv');
    expect(source.cells[1]).toEqual(['K-1', '6\uFFFD1.5', 'Zürich', '']);
    expect(source.fileNotes).toHaveLength(2);
    expect(source.fileNotes?.[0]).toMatch(/^visits!B2: the file is UTF-8 with 1 invalid byte sequence, shown as \uFFFD/);
    expect(source.fileNotes?.[1]).toMatch(/^visits!D3: /);
    const settings = toAnalysisSettings(source, { subject: 0, value: 1, covariates: [] }, STARTER_SCHEDULE, fromSaved(null), '2026-01-01T00:00:00.000Z');
    expect(settings.fileNotes).toEqual(source.fileNotes);
  });

  it('reads the first sheet of an .xlsx file from its first used cell, with numbers as numbers', async () => {
    const wb = new ExcelJS.Workbook();
    const ws = wb.addWorksheet('Visits');
    ws.getCell('B3').value = 'USUBJID';
    ws.getCell('C3').value = 'AVAL';
    ws.getCell('B4').value = 'K-1';
    ws.getCell('C4').value = 61.5;
    const bytes = new Uint8Array(await wb.xlsx.writeBuffer());
    const file = new NodeFile([bytes], 'visits.xlsx') as unknown as File;
    expect(await readDataFile(file)).toEqual({
      label: 'visits.xlsx (sheet Visits)',
      sheet: 'Visits',
      topLeft: 'B3',
      dateSystem: 1900,
      cells: [
        ['USUBJID', 'AVAL'],
        ['K-1', 61.5],
      ],
      numericText: 'reject',
    });
  });

  it('refuses to load without a file, with a message that says what to do', async () => {
    await expect(createWebActions().loadData('selection')).rejects.toThrow(/choose a CSV or .xlsx file/);
  });

  it('reads the invented demo schedule and offers it again by name', async () => {
    const actions = createWebActions();
    const loaded = await actions.loadSchedule('egfr-schedule.csv', demo('egfr-schedule.csv'));
    expect(loaded.ok && loaded.schedule.map((v) => [v.label, v.targetDay])).toEqual([
      ['Baseline', 1],
      ['Week 12', 85],
      ['Week 24', 169],
      ['Week 36', 253],
      ['Week 48', 337],
    ]);
    expect(await actions.listScheduleSources()).toEqual([{ name: 'egfr-schedule.csv' }]);
    expect(await actions.loadSchedule('egfr-schedule.csv')).toEqual(loaded);
  });

  it('reports a broken schedule with the cell of each problem', async () => {
    const result = await createWebActions().loadSchedule(
      'bad.csv',
      csv('bad.csv', 'visit,target_day,days_before,days_after\nWeek 1,0,1,1\n'),
    );
    expect(result.ok).toBe(false);
    expect(!result.ok && result.message).toMatch(/^bad!B2: /);
  });

  it('the starter schedule is offered by name once created, and downloaded as a CSV to edit', async () => {
    const actions = createWebActions();
    URL.createObjectURL = () => 'blob:test';
    URL.revokeObjectURL = () => undefined;
    const click = vi.spyOn(HTMLAnchorElement.prototype, 'click').mockImplementation(() => undefined);
    const name = await actions.createStarterSchedule();
    expect(name).toBe(STARTER_NAME);
    expect(await actions.loadSchedule(name)).toEqual({ ok: true, schedule: STARTER_SCHEDULE });
    expect(click).toHaveBeenCalledTimes(1); // the starter is also offered as a CSV download to edit
    click.mockRestore();
  });
});

describe('results on the page', () => {
  const output: Extract<AnalysisOutput, { ok: true }> = {
    ok: true,
    issues: [],
    excluded: [],
    json: {},
    sheets: [
      { name: 'Model', title: 'Mixed model', blocks: [] },
      { name: 'model', title: 'Second', blocks: [] },
    ],
  };

  it('keeps the written sheets under unique names (compared without case, as Excel does)', async () => {
    const actions = createWebActions();
    const written = await actions.writeResults(output);
    expect(written).toEqual([
      { name: 'Model', title: 'Mixed model' },
      { name: 'model (2)', title: 'Second' },
    ]);
    expect(actions.store.get().sheets.map((s) => s.name)).toEqual(['Model', 'model (2)']);
  });

  it('selecting a cell highlights that row and column of the loaded data', async () => {
    const actions = createWebActions();
    await actions.loadData('file', csv('visits.csv', 'USUBJID,AVAL\nK-1,61.5\nK-2,\n'));
    await actions.selectCell('visits!B3');
    expect(actions.store.get().highlight).toEqual({ address: 'visits!B3', rowIndex: 2, colIndex: 1 });
    await actions.selectCell('visits!B9');
    expect(actions.store.get().highlight).toBeNull();
    expect(actions.store.get().notice).toMatch(/outside the loaded data/);
  });
});

describe('address helpers', () => {
  it('splits plain and quoted sheet names from the cell (ECMA-376 Part 1, §18.17.2.3: quotes doubled inside)', () => {
    expect(splitAddress('Visits!C17')).toEqual({ sheet: 'Visits', cell: 'C17' });
    expect(splitAddress("'egfr-visits'!G5")).toEqual({ sheet: 'egfr-visits', cell: 'G5' });
    expect(splitAddress("'Ann''s data'!A1")).toEqual({ sheet: "Ann's data", cell: 'A1' });
    expect(splitAddress('C17')).toBeNull();
  });

  it('names CSV data after the file without folder or extension', () => {
    expect(baseName('C:\\data\\egfr-visits.csv')).toBe('egfr-visits');
    expect(baseName('.csv')).toBe('Data');
  });

  it('lists at most five schedule errors and counts the rest', () => {
    const issues = Array.from({ length: 7 }, (_, i) => ({
      severity: 'error',
      cell: `S!A${i + 2}`,
      message: 'Blank label.',
    }));
    expect(scheduleMessage(issues)).toBe(
      'S!A2: Blank label. S!A3: Blank label. S!A4: Blank label. S!A5: Blank label. S!A6: Blank label. (and 2 more)',
    );
  });
});
