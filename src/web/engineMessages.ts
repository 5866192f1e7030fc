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
import type { TableRowCounts } from './pageView';

/** Page → worker. */
export type ToEngine =
  /** A data file: the worker reads it (readDataBytes) and keeps its cells under `source` until the next file. */
  | { readonly kind: 'load'; readonly source: number; readonly name: string; readonly bytes: ArrayBuffer }
  /** A run on a loaded file (`source`) or on cells sent with it (`cells`, a copy: for data that came another way). */
  | {
      readonly kind: 'run';
      readonly run: number;
      readonly source: number | null;
      readonly cells: readonly (readonly CellValue[])[] | null;
      readonly settings: AnalysisSettings;
    }
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
  | { readonly kind: 'written'; readonly request: number; readonly bytes: ArrayBuffer }
  | { readonly kind: 'writeFailed'; readonly request: number; readonly message: string };

/** Sends a message, handing over the listed buffers (they become unusable on the sending side). */
export type Post<T> = (message: T, transfer: Transferable[]) => void;
