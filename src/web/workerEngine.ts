/**
 * The page's side of the engine worker: the data file is read there (its bytes handed over once), and so are the
 * runs (runAnalysis) and the report's writing. The page receives the cells packed (for the column choices and "go to
 * cell"), the results cut to what it shows, and the report as a file with its address; a run sends only the settings. Progress (each stage) and cancel work as in the page's own thread: the worker
 * waits at each stage for the page's go-ahead, which says whether the run was cancelled.
 */
import type { CellValue } from '../core/intake/types';
import { detectMapping } from '../core/intake';
import type { AnalysisOutput, AnalysisSettings, RunHooks } from '../core/pipeline/types';
import type { SheetSpec } from '../core/report/types';
import type { PrintStamp } from '../files';
import type { DataSource } from '../taskpane/actions';
import type { PaneEngine } from '../taskpane/engine';
import type { FromEngine, ToEngine } from './engineMessages';
import { unpackCells } from './packedCells';
import type { TableRowCounts } from './pageView';

type Cells = readonly (readonly CellValue[])[];

/** What the client needs of a Worker (a real one in the page; an in-process stand-in in tests). */
export interface WorkerLike {
  postMessage(message: ToEngine, transfer: Transferable[]): void;
  addEventListener(type: 'message', listener: (event: { readonly data: FromEngine }) => void): void;
  addEventListener(type: 'error', listener: (event: { readonly message?: string }) => void): void;
  terminate(): void;
}

interface PendingRun {
  readonly hooks: RunHooks;
  readonly resolve: (output: AnalysisOutput) => void;
  readonly reject: (error: Error) => void;
}

/** A written report: the file, and its blob: address when the worker registered one (release it when done). */
export interface ReportFile {
  readonly blob: Blob;
  readonly url: string | null;
  /** Lets go of `url` (the worker revokes it). */
  readonly release?: () => void;
}

interface PendingWrite {
  readonly resolve: (file: ReportFile) => void;
  readonly reject: (error: Error) => void;
}

interface PendingRead {
  readonly resolve: (source: DataSource) => void;
  readonly reject: (error: Error) => void;
}

/** The browser's worker for the engine, built by webpack as a script of its own beside the page. */
export function startEngineWorker(): WorkerLike {
  return new Worker(new URL('./engine.worker.ts', import.meta.url)) as unknown as WorkerLike;
}

export class WorkerEngine {
  private worker: WorkerLike | null = null;
  private nextId = 1;
  /** Cells the worker holds (read from the same bytes), by identity → the number the worker knows them by. */
  private sources = new WeakMap<object, number>();
  /** Outputs that came from the worker → their run number (the worker keeps the latest run's sheets). */
  private runs = new WeakMap<object, number>();
  /** Outputs that came from the worker → the full row counts of their tables cut for the page (pageView.ts). */
  private readonly tableRows = new WeakMap<object, TableRowCounts>();
  private readonly pendingRuns = new Map<number, PendingRun>();
  private readonly pendingWrites = new Map<number, PendingWrite>();
  private readonly pendingReads = new Map<number, PendingRead>();

  /** The engine the pane calls: mappings are proposed here (cheap), runs happen in the worker. */
  readonly engine: PaneEngine = {
    detectMapping,
    runAnalysis: (cells, settings, hooks) => this.run(cells, settings, hooks),
  };

  constructor(private readonly start: () => WorkerLike = startEngineWorker) {}

  /**
   * Reads a data file in the worker (the bytes are transferred: unusable here afterwards). The worker keeps the
   * cells for runs; the page gets them packed (packedCells.ts), seen as rows built when read, so it holds no object
   * per cell. Rejects with the reader's message when the file cannot be read.
   */
  readSource(bytes: ArrayBuffer, name: string): Promise<DataSource> {
    const id = this.nextId++;
    return new Promise<DataSource>((resolve, reject) => {
      this.pendingReads.set(id, { resolve, reject });
      this.post({ kind: 'load', source: id, name, bytes }, [bytes]);
    });
  }

  /** Lets the worker release a report's blob: address (after the download has started). */
  releaseReport(url: string): void {
    this.worker?.postMessage({ kind: 'release', url }, []);
  }

  /** The report (.xlsx) of a run's output, with its sheets named `names`, written in the worker: from the worker's
   * own copy for a run made there (the page's copy is cut), else from the sheets sent along. */
  writeReport(output: Extract<AnalysisOutput, { ok: true }>, names: readonly string[], stamp: PrintStamp): Promise<ReportFile> {
    const request = this.nextId++;
    const run = this.runs.get(output);
    return new Promise<ReportFile>((resolve, reject) => {
      if (run === undefined && this.tableRows.has(output)) {
        // Made by a worker that has since stopped: the page's copy is cut, so it must not be written.
        reject(new Error('The results of that run are no longer kept: run the analysis again.'));
        return;
      }
      this.pendingWrites.set(request, { resolve, reject });
      const sheets: readonly SheetSpec[] | null = run === undefined ? output.sheets : null;
      this.post({ kind: 'write', request, run: run ?? null, names, sheets, stamp }, []);
    });
  }

  /** For an output from the worker: per sheet and block, the full row count of each table cut for the page. */
  tableRowsOf(output: AnalysisOutput): TableRowCounts | undefined {
    return this.tableRows.get(output);
  }

  /** Stops the worker (a page that goes away); the next call starts a new one. */
  dispose(): void {
    this.fail('The page\'s engine was stopped.');
  }

  private run(cells: Cells, settings: AnalysisSettings, hooks: RunHooks): Promise<AnalysisOutput> {
    const run = this.nextId++;
    const source = this.sources.get(cells);
    return new Promise<AnalysisOutput>((resolve, reject) => {
      this.pendingRuns.set(run, { hooks, resolve, reject });
      // Cells the worker does not hold go with the run, as plain arrays (a packed view cannot be cloned).
      const copy = source === undefined ? Array.from(cells, (row) => [...row]) : null;
      this.post({ kind: 'run', run, source: source ?? null, cells: copy, settings }, []);
    });
  }

  /** Starts the worker now (the page does at load, so its script is ready by the time a file is chosen). */
  warmUp(): void {
    this.ensureWorker();
  }

  private post(message: ToEngine, transfer: Transferable[]): void {
    this.ensureWorker().postMessage(message, transfer);
  }

  private ensureWorker(): WorkerLike {
    if (this.worker === null) {
      const worker = this.start();
      worker.addEventListener('message', (event) => void this.receive(event.data));
      worker.addEventListener('error', (event) =>
        this.fail(`The page's engine stopped${event.message ? `: ${event.message}` : ''}.`),
      );
      this.worker = worker;
    }
    return this.worker;
  }

  private async receive(message: FromEngine): Promise<void> {
    switch (message.kind) {
      case 'read': {
        const pending = this.pendingReads.get(message.source);
        this.pendingReads.delete(message.source);
        const { packed, ...rest } = message.data;
        const cells = unpackCells(packed);
        this.sources.set(cells, message.source);
        pending?.resolve({ ...rest, cells });
        return;
      }
      case 'readFailed': {
        const pending = this.pendingReads.get(message.source);
        this.pendingReads.delete(message.source);
        pending?.reject(new Error(message.message));
        return;
      }
      case 'stage': {
        const pending = this.pendingRuns.get(message.run);
        if (pending === undefined) return;
        pending.hooks.onStage?.(message.stage);
        if (pending.hooks.yieldControl) await pending.hooks.yieldControl();
        this.worker?.postMessage({ kind: 'go', run: message.run, cancel: pending.hooks.signal?.aborted === true }, []);
        return;
      }
      case 'done': {
        const pending = this.pendingRuns.get(message.run);
        this.pendingRuns.delete(message.run);
        if (message.output.ok) {
          this.runs.set(message.output, message.run);
          this.tableRows.set(message.output, message.tableRows);
        }
        pending?.resolve(message.output);
        return;
      }
      case 'failed': {
        const pending = this.pendingRuns.get(message.run);
        this.pendingRuns.delete(message.run);
        pending?.reject(new Error(message.message));
        return;
      }
      case 'written': {
        const pending = this.pendingWrites.get(message.request);
        this.pendingWrites.delete(message.request);
        const url = message.url;
        pending?.resolve(url === null ? { blob: message.blob, url } : { blob: message.blob, url, release: () => this.releaseReport(url) });
        return;
      }
      case 'writeFailed': {
        const pending = this.pendingWrites.get(message.request);
        this.pendingWrites.delete(message.request);
        pending?.reject(new Error(message.message));
        return;
      }
    }
  }

  /** Ends the worker and every request waiting on it; what it held is gone, so later runs send their cells. */
  private fail(reason: string): void {
    this.worker?.terminate();
    this.worker = null;
    this.sources = new WeakMap();
    this.runs = new WeakMap();
    for (const p of this.pendingRuns.values()) p.reject(new Error(reason));
    for (const p of this.pendingWrites.values()) p.reject(new Error(reason));
    for (const p of this.pendingReads.values()) p.reject(new Error(reason));
    this.pendingReads.clear();
    this.pendingRuns.clear();
    this.pendingWrites.clear();
  }
}
