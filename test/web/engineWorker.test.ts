/**
 * The page's engine worker, driven in process: the page's side (WorkerEngine) and the worker's side (createEngineHost)
 * joined by a stand-in that delivers each message asynchronously as a structured clone, handing over transferred
 * buffers as a real worker does (HTML Standard, "structured clone" and "transfer"). Checks that a run through the
 * worker gives the page what a run on its own thread gives (cut to what the page shows), that stages arrive in order,
 * that a cancel stops the run at the next stage, that the report is written there with the page's sheet names, and
 * that a worker that stops fails the waiting requests and a new one takes over.
 */
import { describe, expect, it } from 'vitest';
import { readFileSync } from 'node:fs';
import { resolve } from 'node:path';
import ExcelJS from 'exceljs';
import { detectMapping } from '../../src/core/intake';
import { runAnalysis } from '../../src/core/pipeline/runAnalysis';
import type { AnalysisOutput, Stage } from '../../src/core/pipeline/types';
import { parseSchedule } from '../../src/core/schedule';
import { readCsvFile } from '../../src/files';
import { fromSaved, toAnalysisSettings } from '../../src/taskpane/paneSettings';
import { createEngineHost } from '../../src/web/engineHost';
import type { FromEngine, ToEngine } from '../../src/web/engineMessages';
import { PAGE_LIST_LIMIT, PAGE_TABLE_ROWS, pageViewOf } from '../../src/web/pageView';
import { packCells, packedBuffers, unpackCells } from '../../src/web/packedCells';
import fc from 'fast-check';
import { readDataBytes } from '../../src/web/readData';
import { WorkerEngine, type WorkerLike } from '../../src/web/workerEngine';

const DEMO = resolve(process.cwd(), 'demo');
const demoBytes = (): Uint8Array => new Uint8Array(readFileSync(resolve(DEMO, 'egfr-visits.csv')));

/** An in-process worker: messages cross as structured clones on later tasks, transferred buffers are handed over. */
class InProcessWorker implements WorkerLike {
  readonly sent: ToEngine[] = [];
  private readonly onMessage: ((event: { data: FromEngine }) => void)[] = [];
  private readonly onError: ((event: { message?: string }) => void)[] = [];
  terminated = false;
  private readonly host = createEngineHost((message, transfer) => {
    const copy = structuredClone(message, { transfer });
    setTimeout(() => {
      if (!this.terminated) for (const l of this.onMessage) l({ data: copy });
    }, 0);
  });

  postMessage(message: ToEngine, transfer: Transferable[]): void {
    if (this.terminated) throw new Error('posted to a stopped worker');
    const copy = structuredClone(message, { transfer });
    this.sent.push(copy);
    setTimeout(() => !this.terminated && this.host.handle(copy), 0);
  }

  addEventListener(type: 'message' | 'error', listener: (event: never) => void): void {
    if (type === 'message') this.onMessage.push(listener as (event: { data: FromEngine }) => void);
    else this.onError.push(listener as (event: { message?: string }) => void);
  }

  terminate(): void {
    this.terminated = true;
  }

  crash(message: string): void {
    for (const l of this.onError) l({ message });
  }
}

async function demoRun() {
  const source = await readDataBytes(demoBytes(), 'egfr-visits.csv');
  const scheduleCells = readCsvFile(new Uint8Array(readFileSync(resolve(DEMO, 'egfr-schedule.csv'))), 'egfr-schedule.csv', 'egfr-schedule').cells;
  const schedule = parseSchedule(scheduleCells, 'egfr-schedule', 'A1');
  if (!schedule.ok) throw new Error('the demo schedule did not read');
  const mapping = detectMapping(source.cells[0]!.map(String), 'unblinded').mapping;
  const settings = toAnalysisSettings(
    source,
    mapping,
    schedule.schedule,
    { ...fromSaved(null), mode: 'unblinded', referenceArm: 'Placebo' },
    '2026-12-02T10:00:00.000Z',
  );
  return { source, settings };
}

function engineWith(): { engine: WorkerEngine; workers: InProcessWorker[] } {
  const workers: InProcessWorker[] = [];
  const engine = new WorkerEngine(() => {
    const w = new InProcessWorker();
    workers.push(w);
    return w;
  });
  return { engine, workers };
}

describe('the page engine in a worker', () => {
  it('a run on a file sent to the worker gives the page what a run on its own thread gives, with every stage in order, and sends no cells', async () => {
    const { source, settings } = await demoRun();
    const { engine, workers } = engineWith();
    const read = await engine.readSource(demoBytes().buffer as ArrayBuffer, 'egfr-visits.csv');
    // The page's reading, from the worker, is the reading on its own thread: the same label, places and cells.
    const { cells: packedView, ...rest } = read;
    const { cells: own, ...ownRest } = source;
    expect(rest).toEqual(ownRest);
    expect(packedView.length).toBe(own.length);
    expect([...packedView]).toEqual(own);
    const stages: Stage[] = [];
    const output = await engine.engine.runAnalysis(read.cells, settings, { onStage: (s) => stages.push(s) });
    const direct = await runAnalysis(source.cells, settings);
    expect(stages).toEqual(['reading', 'windowing', 'fitting', 'writing']);
    expect(output).toEqual(pageViewOf(direct).output);
    expect(output.ok).toBe(true);
    const run = workers[0]!.sent.find((m) => m.kind === 'run');
    expect(run).toMatchObject({ kind: 'run', source: expect.any(Number), cells: null });
    // Four "go" answers, one per stage, none cancelling.
    expect(workers[0]!.sent.filter((m) => m.kind === 'go')).toEqual(
      [1, 2, 3, 4].map(() => expect.objectContaining({ kind: 'go', cancel: false })),
    );
  });

  it('a cancel pressed during a stage stops the run before the next stage and nothing is written', async () => {
    const { settings } = await demoRun();
    const { engine } = engineWith();
    const read = await engine.readSource(demoBytes().buffer as ArrayBuffer, 'egfr-visits.csv');
    const controller = new AbortController();
    const stages: Stage[] = [];
    const output = await engine.engine.runAnalysis(read.cells, settings, {
      signal: controller.signal,
      onStage: (s) => {
        stages.push(s);
        controller.abort(); // pressed while the first stage is shown
      },
    });
    expect(stages).toEqual(['reading']);
    expect(output).toEqual({ ok: false, issues: [], cancelled: true });
  });

  it('cells the worker does not hold are sent with the run, and give the same results', async () => {
    const { source, settings } = await demoRun();
    const { engine, workers } = engineWith();
    const output = await engine.engine.runAnalysis(source.cells, settings, {});
    expect(output).toEqual(pageViewOf(await runAnalysis(source.cells, settings)).output);
    expect(workers[0]!.sent.find((m) => m.kind === 'run')).toMatchObject({ source: null, cells: source.cells });
  });

  it('the report is written in the worker from its own copy of the run, under the names the page gave the sheets', async () => {
    const { settings } = await demoRun();
    const { engine, workers } = engineWith();
    const read = await engine.readSource(demoBytes().buffer as ArrayBuffer, 'egfr-visits.csv');
    const output = (await engine.engine.runAnalysis(read.cells, settings, {})) as Extract<AnalysisOutput, { ok: true }>;
    const names = output.sheets.map((s, i) => (i === 0 ? 'Front page' : s.name));
    const file = await engine.writeReport(output, names, { runAt: '2026-12-02T10:00:00.000Z' });
    expect(file.blob.type).toBe('application/vnd.openxmlformats-officedocument.spreadsheetml.sheet');
    expect(file.url).toMatch(/^blob:/);
    file.release?.();
    const bytes = new Uint8Array(await file.blob.arrayBuffer());
    expect(Buffer.from(bytes.subarray(0, 2)).toString('latin1')).toBe('PK'); // an .xlsx is a ZIP (ECMA-376 Part 2)
    const book = new ExcelJS.Workbook();
    await book.xlsx.load(Buffer.from(bytes) as unknown as ArrayBuffer);
    expect(book.worksheets.map((w) => w.name)).toEqual(names);
    // The request named the run, not its sheets.
    expect(workers[0]!.sent.find((m) => m.kind === 'write')).toMatchObject({ run: expect.any(Number), sheets: null });
  });

  it('a run the engine refuses fails with its message; a worker that stops fails what waits on it, and a new one takes over', async () => {
    const { source, settings } = await demoRun();
    const { engine, workers } = engineWith();
    await expect(engine.engine.runAnalysis(source.cells, { ...settings, schedule: [] }, {})).rejects.toThrow(/the schedule has no visits/);
    const read = await engine.readSource(demoBytes().buffer as ArrayBuffer, 'egfr-visits.csv');
    const first = await engine.engine.runAnalysis(read.cells, settings, {});
    expect(first.ok).toBe(true);
    const waiting = engine.engine.runAnalysis(read.cells, settings, {
      onStage: () => workers[0]!.crash('out of memory'),
    });
    await expect(waiting).rejects.toThrow("The page's engine stopped: out of memory.");
    expect(workers[0]!.terminated).toBe(true);
    // A run made by the stopped worker reached the page cut to what it shows: its report is refused, not written cut.
    await expect(engine.writeReport(first as Extract<AnalysisOutput, { ok: true }>, [], {})).rejects.toThrow(/no longer kept/);
    // The new worker does not hold the file, so the cells go with the run (copied out of the packed view).
    const again = await engine.engine.runAnalysis(read.cells, settings, {});
    expect(again.ok).toBe(true);
    expect(workers).toHaveLength(2);
    expect(workers[1]!.sent.find((m) => m.kind === 'run')).toMatchObject({ source: null, cells: source.cells });
    // A file the reader refuses: the page gets the reader's own message.
    await expect(readDataBytes(new Uint8Array(0), 'empty.csv')).rejects.toThrow();
    const direct = await readDataBytes(new Uint8Array(0), 'empty.csv').catch((e: unknown) => (e as Error).message);
    await expect(engine.readSource(new ArrayBuffer(0), 'empty.csv')).rejects.toThrow(direct);
  });
});

describe("the page's copy of a run (pageViewOf)", () => {
  it('cuts long tables to the rows the page shows, keeping their full count, and leaves out long JSON lists only', () => {
    const rows = Array.from({ length: PAGE_TABLE_ROWS + 5 }, (_, i) => [i]);
    const output: AnalysisOutput = {
      ok: true,
      issues: [],
      sheets: [
        {
          name: 'A',
          title: 'A',
          blocks: [
            { kind: 'paragraph', text: 'x', style: 'normal' },
            { kind: 'table', id: 'Long', caption: 'c', columns: [{ header: 'n', format: 'integer' }], rows },
            { kind: 'table', id: 'Short', caption: 'c', columns: [{ header: 'n', format: 'integer' }], rows: rows.slice(0, 3) },
          ],
        },
      ],
      json: {
        input: { subjects: 3 },
        visits: { counts: { onTime: 1 }, deviations: Array(PAGE_LIST_LIMIT + 1).fill(0), byVisit: [1, 2] },
        issues: Array(PAGE_LIST_LIMIT + 1).fill(0),
        notes: ['n'],
      },
    } as unknown as AnalysisOutput;
    const view = pageViewOf(output);
    expect(view.tableRows).toEqual([[null, PAGE_TABLE_ROWS + 5, null]]);
    const sheet = view.output.ok ? view.output.sheets[0]! : null;
    expect(sheet?.blocks.map((b) => (b.kind === 'table' ? b.rows.length : -1))).toEqual([-1, PAGE_TABLE_ROWS, 3]);
    expect(view.output.ok && view.output.json).toEqual({
      input: { subjects: 3 },
      visits: { counts: { onTime: 1 }, byVisit: [1, 2] },
      notes: ['n'],
    });
    // The output itself is untouched (the worker writes the report from it).
    expect(output.ok && output.sheets[0]!.blocks[1]!.kind === 'table' && output.sheets[0]!.blocks[1]!.rows.length).toBe(PAGE_TABLE_ROWS + 5);
  });
});

describe('packed cells (packedCells.ts)', () => {
  it('round-trip: any rows of text, numbers (−0 included), booleans and blanks, of any lengths, read back the same after crossing as a clone', () => {
    const cell = fc.oneof(fc.string(), fc.double(), fc.constant(-0), fc.boolean(), fc.constant(null), fc.constantFrom('1', 1, ''));
    fc.assert(
      fc.property(fc.array(fc.array(cell, { maxLength: 6 }), { maxLength: 30 }), (rows) => {
        const packed = packCells(rows);
        const view = unpackCells(structuredClone(packed, { transfer: packedBuffers(packed) }));
        expect(view.length).toBe(rows.length);
        const back = Array.from(view, (r) => [...r]);
        expect(back).toEqual(rows);
        back.forEach((r, i) => r.forEach((v, j) => expect(Object.is(v, rows[i]![j])).toBe(true)));
        expect(view[rows.length]).toBeUndefined();
      }),
    );
  });

  it('holds each distinct value of a column once', () => {
    const packed = packCells([['USUBJID', 'AVAL'], ['K-1', '61.5'], ['K-1', '61.5'], ['K-2', '61.5']]);
    expect(packed.columns.map((c) => c.values)).toEqual([['USUBJID', 'K-1', 'K-2'], ['AVAL', '61.5']]);
    expect(packed.lengths).toBeNull();
  });
});
