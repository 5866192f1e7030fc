/**
 * The engine's side of the page's worker: reads data files, runs analyses and writes reports, answering through
 * `post`. Kept apart from the worker's global scope (engine.worker.ts) so tests drive it directly in Node.
 *
 * A run reports each stage and then waits for the page's answer before going on, so the page has drawn the stage
 * before the next one starts and a cancel pressed meanwhile stops the run at that boundary (as runAnalysis checks its
 * signal between stages). The worker keeps the latest data file's cells and the latest finished run's sheets, so a
 * report request carries only the sheet names, never the sheets themselves; the page receives only what it shows
 * (pageView.ts).
 */
import type { CellValue } from '../core/intake/types';
import { runAnalysis } from '../core/pipeline/runAnalysis';
import type { SheetSpec } from '../core/report/types';
import { writeWorkbook, type Compressor } from '../files';
import type { FromEngine, Post, ToEngine } from './engineMessages';
import { packCells, packedBuffers } from './packedCells';
import { pageViewOf } from './pageView';
import { readDataBytes } from './readData';

type Cells = readonly (readonly CellValue[])[];

/** The media type of an .xlsx file (ECMA-376 Part 2 / IANA). */
const XLSX_TYPE = 'application/vnd.openxmlformats-officedocument.spreadsheetml.sheet';

const messageOf = (e: unknown): string => (e instanceof Error ? e.message : String(e));

export interface EngineHost {
  readonly handle: (message: ToEngine) => void;
}

export interface EngineHostOptions {
  /** Compresses the report's parts (default: on the worker's own thread); engine.worker.ts hands in one that works
   * in a worker of its own (workerCompressor.ts), so deflating runs beside the making of the XML. */
  readonly compressor?: Compressor;
}

export function createEngineHost(post: Post<FromEngine>, options: EngineHostOptions = {}): EngineHost {
  /** The latest data file: its number and its cells once read (a failed read rejects). */
  let source: { readonly id: number; readonly cells: Promise<Cells> } | null = null;
  /** The latest finished run's sheets, for the report. */
  let lastRun: { readonly id: number; readonly sheets: readonly SheetSpec[] } | null = null;
  /** Runs waiting for the page's answer to a stage. */
  const waiting = new Map<number, (cancel: boolean) => void>();

  const run = async (message: Extract<ToEngine, { kind: 'run' }>): Promise<void> => {
    const id = message.run;
    const signal = { aborted: false };
    try {
      let cells: Cells;
      if (message.cells !== null) cells = message.cells;
      else if (source !== null && source.id === message.source) cells = await source.cells;
      else throw new Error('The data file is no longer loaded in the page: choose it again.');
      const output = await runAnalysis(cells, message.settings, {
        signal,
        onStage: (stage) => post({ kind: 'stage', run: id, stage }, []),
        yieldControl: () =>
          new Promise<void>((resolve) => {
            waiting.set(id, (cancel) => {
              if (cancel) signal.aborted = true;
              resolve();
            });
          }),
      });
      if (output.ok) lastRun = { id, sheets: output.sheets };
      const view = pageViewOf(output);
      post({ kind: 'done', run: id, output: view.output, tableRows: view.tableRows }, []);
    } catch (e) {
      post({ kind: 'failed', run: id, message: messageOf(e) }, []);
    } finally {
      waiting.delete(id);
    }
  };

  const write = async (message: Extract<ToEngine, { kind: 'write' }>): Promise<void> => {
    try {
      const sheets = message.sheets ?? (lastRun !== null && lastRun.id === message.run ? lastRun.sheets : null);
      if (sheets === null) throw new Error('The results of that run are no longer kept: run the analysis again.');
      const named = sheets.map((s, i) => ({ ...s, name: message.names[i] ?? s.name }));
      const bytes = await writeWorkbook(named, message.stamp, options.compressor !== undefined ? { compressor: options.compressor } : {});
      const blob = new Blob([bytes as Uint8Array<ArrayBuffer>], { type: XLSX_TYPE });
      const url = typeof URL.createObjectURL === 'function' ? URL.createObjectURL(blob) : null;
      post({ kind: 'written', request: message.request, blob, url }, []);
    } catch (e) {
      post({ kind: 'writeFailed', request: message.request, message: messageOf(e) }, []);
    }
  };

  return {
    handle(message) {
      switch (message.kind) {
        case 'load': {
          const id = message.source;
          const read = readDataBytes(new Uint8Array(message.bytes), message.name);
          source = { id, cells: read.then((s) => s.cells) };
          read.then(
            ({ cells, ...rest }) => {
              const packed = packCells(cells);
              post({ kind: 'read', source: id, data: { ...rest, packed } }, packedBuffers(packed));
            },
            (e: unknown) => post({ kind: 'readFailed', source: id, message: messageOf(e) }, []),
          );
          source.cells.catch(() => undefined); // a failed read is reported above, and by a run that needs it
          break;
        }
        case 'release':
          URL.revokeObjectURL(message.url);
          break;
        case 'run':
          void run(message);
          break;
        case 'go':
          waiting.get(message.run)?.(message.cancel);
          waiting.delete(message.run);
          break;
        case 'write':
          void write(message);
          break;
      }
    },
  };
}
