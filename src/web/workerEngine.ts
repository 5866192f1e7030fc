/**
 * The page's side of the engine worker: a PaneEngine whose runAnalysis happens in the worker, and the report's
 * writing there too. The page keeps its own copy of the cells (for the column choices and "go to cell"); the worker
 * reads the same file's bytes, handed over once when the file is chosen, so a run sends only the settings and the
 * results come back as one message. Progress (each stage) and cancel work as in the page's own thread: the worker
 * waits at each stage for the page's go-ahead, which says whether the run was cancelled.
 */
import type { CellValue } from '../core/intake/types';
import { detectMapping } from '../core/intake';
import type { AnalysisOutput, AnalysisSettings, RunHooks } from '../core/pipeline/types';
import type { SheetSpec } from '../core/report/types';
import type { PrintStamp } from '../files';
import type { PaneEngine } from '../taskpane/engine';
import type { FromEngine, ToEngine } from './engineMessages';
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

interface PendingWrite {
  readonly resolve: (bytes: Uint8Array) => void;
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
  /** Sources sent and not yet matched to the page's cells → the worker generation they were sent to. */
  private readonly sent = new Map<number, number>();
  /** Counts workers that stopped: what a stopped worker held is gone. */
  private generation = 0;
  private readonly pendingRuns = new Map<number, PendingRun>();
  private readonly pendingWrites = new Map<number, PendingWrite>();

  /** The engine the pane calls: mappings are proposed here (cheap), runs happen in the worker. */
  readonly engine: PaneEngine = {
    detectMapping,
    runAnalysis: (cells, settings, hooks) => this.run(cells, settings, hooks),
  };

  constructor(private readonly start: () => WorkerLike = startEngineWorker) {}

  /** Hands a data file's bytes to the worker (transferred: `bytes` is unusable afterwards) and notes that `cells`,
   * the page's own reading of the same bytes, are held there too. */
  /** Hands a data file's bytes to the worker, which starts reading them at once (transferred: `bytes` is unusable
   * afterwards); returns the number to pass to `sourceRead` with the page's own reading of the same bytes. */
  sendSource(bytes: ArrayBuffer, name: string): number {
    const id = this.nextId++;
    this.post({ kind: 'load', source: id, name, bytes }, [bytes]);
    this.sent.set(id, this.generation);
    return id;
  }

  /** Notes that `cells`, the page's own reading of the bytes sent as `source`, are held by the worker too, so runs on
   * them send no cells. */
  sourceRead(source: number, cells: Cells): void {
    if (this.sent.get(source) === this.generation) this.sources.set(cells, source);
    this.sent.delete(source);
  }

  /** The report's .xlsx bytes for a run's output, with its sheets named `names`, written in the worker. */
  writeReport(output: Extract<AnalysisOutput, { ok: true }>, names: readonly string[], stamp: PrintStamp): Promise<Uint8Array> {
    const request = this.nextId++;
    const run = this.runs.get(output);
    return new Promise<Uint8Array>((resolve, reject) => {
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
      this.post({ kind: 'run', run, source: source ?? null, cells: source === undefined ? cells : null, settings }, []);
    });
  }

  private post(message: ToEngine, transfer: Transferable[]): void {
    if (this.worker === null) {
      const worker = this.start();
      worker.addEventListener('message', (event) => void this.receive(event.data));
      worker.addEventListener('error', (event) =>
        this.fail(`The page's engine stopped${event.message ? `: ${event.message}` : ''}.`),
      );
      this.worker = worker;
    }
    this.worker.postMessage(message, transfer);
  }

  private async receive(message: FromEngine): Promise<void> {
    switch (message.kind) {
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
        pending?.resolve(new Uint8Array(message.bytes));
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
    this.generation++;
    this.sources = new WeakMap();
    this.runs = new WeakMap();
    for (const p of this.pendingRuns.values()) p.reject(new Error(reason));
    for (const p of this.pendingWrites.values()) p.reject(new Error(reason));
    this.pendingRuns.clear();
    this.pendingWrites.clear();
  }
}
