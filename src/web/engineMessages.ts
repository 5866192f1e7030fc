/**
 * The messages between the page and its engine worker (src/web/engine.worker.ts). The page sends the data file's bytes
 * once (transferred, not copied), then runs and report requests that name them; the worker answers each stage of a
 * run and waits for the page's go-ahead (which carries the cancel flag), then sends the results, or the report's
 * bytes (transferred).
 */
import type { AnalysisOutput, AnalysisSettings, Stage } from '../core/pipeline/types';
import type { CellValue } from '../core/intake/types';
import type { PrintStamp } from '../files';
import type { SheetSpec } from '../core/report/types';
import type { DataSource } from '../taskpane/actions';
import type { PackedCells } from './packedCells';
import type { TableRowCounts } from './pageView';

/** A data source as it crosses from the worker: its cells packed. */
export type SourceData = Omit<DataSource, 'cells'> & { readonly packed: PackedCells };

/** Page → worker. */
export type ToEngine =
  /** A data file: the worker reads it (readDataBytes), keeps its cells under `source` until the next file, and
   * sends the page its reading ('read'). */
  | { readonly kind: 'load'; readonly source: number; readonly name: string; readonly bytes: ArrayBuffer }
  /** A run on a loaded file (`source`) or on cells sent with it (`cells`, a copy: for data that came another way). */
  | {
      readonly kind: 'run';
      readonly run: number;
      readonly source: number | null;
      readonly cells: readonly (readonly CellValue[])[] | null;
      readonly settings: AnalysisSettings;
    }
  /** A blob: address of a report the page no longer needs. */
  | { readonly kind: 'release'; readonly url: string }
  /** The answer to a stage: go on, or stop (cancel) before the next stage. */
  | { readonly kind: 'go'; readonly run: number; readonly cancel: boolean }
  /** Write the report of run `run` (its sheets renamed to `names`), or of the sheets sent with the request. */
  | {
      readonly kind: 'write';
      readonly request: number;
      readonly run: number | null;
      readonly names: readonly string[];
      readonly sheets: readonly SheetSpec[] | null;
      readonly stamp: PrintStamp;
    };

/** Worker → page. */
export type FromEngine =
  | { readonly kind: 'stage'; readonly run: number; readonly stage: Stage }
  /** The page's copy of the output (pageView.ts: long tables cut, long JSON lists left out), with the full row
   * counts of the cut tables. */
  | { readonly kind: 'done'; readonly run: number; readonly output: AnalysisOutput; readonly tableRows: TableRowCounts }
  | { readonly kind: 'failed'; readonly run: number; readonly message: string }
  /** A data file read: everything the page keeps of it, its cells packed (packedCells.ts, buffers transferred). */
  | { readonly kind: 'read'; readonly source: number; readonly data: SourceData }
  | { readonly kind: 'readFailed'; readonly source: number; readonly message: string }
  /** The report as a Blob (cloned by reference, not copied) and, where the worker can make one, its blob: address,
   * so the page need not register the file itself. */
  | { readonly kind: 'written'; readonly request: number; readonly blob: Blob; readonly url: string | null }
  | { readonly kind: 'writeFailed'; readonly request: number; readonly message: string };

/** Sends a message, handing over the listed buffers (they become unusable on the sending side). */
export type Post<T> = (message: T, transfer: Transferable[]) => void;
