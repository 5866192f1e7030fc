/**
 * Reading a range from the workbook in row blocks that keep each request well under the host's limits: Excel on
 * the web refuses a request or response payload over 5 MB, and any host refuses an operation over 5,000,000 cells
 * (Office Add-ins documentation, "Resource limits and performance optimization", Excel add-ins section).
 */
import type { CellValue, DateSystem } from '../core/intake/types';
import { rangeAddress } from './address';
import { toCellValue } from './cellValue';
import { dateSystemFromProbe, queueDateProbe } from './dateSystem';
import { ExcelAdapterError, errorCode, errorText } from './errors';

/** Which range to read: the selection, the active sheet's used range, or a named sheet's used range. */
export type ReadTarget =
  | { readonly kind: 'selection' }
  | { readonly kind: 'usedRange' }
  | { readonly kind: 'sheet'; readonly name: string };

export interface ReadOptions {
  /** Called after each block with the fraction of rows read (0 to 1). */
  readonly onProgress?: (fraction: number) => void;
  /** Aimed-for bytes per request (default 1,500,000, under a third of the 5 MB limit, leaving room for overhead). */
  readonly targetBytes?: number;
  /** Most cells per request (default 500,000, a tenth of the 5,000,000-cell limit). */
  readonly maxCells?: number;
  /** Cells in the first block, read to estimate the bytes per cell (default 20,000). */
  readonly firstBlockCells?: number;
}

export interface ReadResult {
  readonly sheet: string;
  /** The range's address without the sheet, e.g. "A1:H2401". */
  readonly address: string;
  /** Its first cell, e.g. "A1". */
  readonly topLeft: string;
  readonly dateSystem: DateSystem;
  readonly cells: CellValue[][];
  /** Requests made for the cells (blocks, including retried ones), for tests and diagnostics. */
  readonly blockRequests: number;
}

interface Geometry {
  readonly sheet: string;
  readonly row: number;
  readonly column: number;
  readonly rowCount: number;
  readonly columnCount: number;
  readonly dateSystem: DateSystem;
}

/** Host error codes that mean "this request was too big"; halving the block is the cure. */
const TOO_BIG_CODES = new Set([
  'RequestPayloadSizeLimitExceeded',
  'ResponsePayloadSizeLimitExceeded',
  'PayloadTooLarge',
  'OperationCellsExceedLimit',
  'RangeExceedsLimit',
]);

/** True when the host refused a request for its size (by error code, or by the wording of its message). */
export function isPayloadTooLarge(error: unknown): boolean {
  return TOO_BIG_CODES.has(errorCode(error)) || /payload size|too large|exceeds? (the )?limit/i.test(errorText(error));
}

/** UTF-8 bytes of a value's JSON text: the size it adds to a request or response. O(size). */
export function jsonBytes(value: unknown): number {
  return new TextEncoder().encode(JSON.stringify(value)).length;
}

/**
 * Rows per block so that a block of `columnCount` columns at `bytesPerCell` stays under both budgets; at least 1.
 * Example: blockRows(10, 30, 1_500_000, 500_000) → 5000.
 */
export function blockRows(columnCount: number, bytesPerCell: number, targetBytes: number, maxCells: number): number {
  const cols = Math.max(1, columnCount);
  const byBytes = Math.floor(targetBytes / (Math.max(1, bytesPerCell) * cols));
  const byCells = Math.floor(maxCells / cols);
  return Math.max(1, Math.min(byBytes, byCells));
}

/** Rows of the first block: about `firstBlockCells` cells, at most `maxCells`, at least one row. */
export function firstBlockRows(columnCount: number, firstBlockCells: number, maxCells: number): number {
  const cols = Math.max(1, columnCount);
  return Math.max(1, Math.min(Math.floor(firstBlockCells / cols), Math.floor(maxCells / cols)));
}

/**
 * The blocks (row counts) readRange asks for when every cell costs `bytesPerCell` in the response: the first block
 * of about `firstBlockCells` cells, then blocks sized by blockRows. Pure; for planning and tests. Example:
 * readPlan(1_000_000, 10, 12, 1_500_000, 500_000, 20_000) → [2000, 12500, 12500, …].
 */
export function readPlan(rowCount: number, columnCount: number, bytesPerCell: number, targetBytes = 1_500_000, maxCells = 500_000, firstBlockCells = 20_000): number[] {
  const blocks: number[] = [];
  let rows = firstBlockRows(columnCount, firstBlockCells, maxCells);
  for (let done = 0; done < rowCount; ) {
    const n = Math.min(rows, rowCount - done);
    blocks.push(n);
    done += n;
    rows = blockRows(columnCount, bytesPerCell, targetBytes, maxCells);
  }
  return blocks;
}

/** The range a read target names (before its size is known). */
function targetRange(context: Excel.RequestContext, target: ReadTarget): Excel.Range {
  if (target.kind === 'selection') {
    const selected = context.workbook.getSelectedRange();
    return selected.getIntersectionOrNullObject(selected.worksheet.getUsedRange(true));
  }
  if (target.kind === 'usedRange') return context.workbook.worksheets.getActiveWorksheet().getUsedRange(true);
  return context.workbook.worksheets.getItem(target.name).getUsedRange(true);
}

/**
 * Where the range is, its size and the workbook's date system, in one request. A selection is cut to the sheet's used
 * range (getIntersectionOrNullObject, ExcelApi 1.4), so selecting whole columns reads only the rows that hold values.
 */
async function readGeometry(target: ReadTarget): Promise<Geometry> {
  return Excel.run(async (context) => {
    const range = targetRange(context, target);
    range.load('rowIndex,columnIndex,rowCount,columnCount');
    range.worksheet.load('name');
    const probe = queueDateProbe(context);
    await context.sync();
    if (range.isNullObject) throw new ExcelAdapterError('The selection holds no values: select the header row and the data rows below it.');
    return {
      sheet: range.worksheet.name,
      row: range.rowIndex,
      column: range.columnIndex,
      rowCount: range.rowCount,
      columnCount: range.columnCount,
      dateSystem: dateSystemFromProbe(probe.value),
    };
  });
}

/** One block of rows as cell values, in its own request. */
async function readBlock(sheet: string, row: number, column: number, rowCount: number, columnCount: number): Promise<{ cells: CellValue[][]; bytes: number }> {
  return Excel.run(async (context) => {
    const range = context.workbook.worksheets.getItem(sheet).getRangeByIndexes(row, column, rowCount, columnCount);
    // `values` only: it already tells empty cells ("") and error cells (their text) apart (see toCellValue), and
    // `valueTypes` would about double the response ("String", "Double", "Empty" per cell).
    range.load('values');
    await context.sync();
    const values = range.values;
    const cells = values.map((r) => r.map((v) => toCellValue(v)));
    return { cells, bytes: jsonBytes(values) };
  });
}

/**
 * Reads the target range's cells in row blocks. The first block holds about `firstBlockCells` cells; its size in
 * bytes sets the rows of later blocks (the largest bytes per cell seen so far, against `targetBytes` and
 * `maxCells`). A block the host refuses for its size is retried with half the rows, down to one row. Error cells
 * arrive as their text ("#N/A"), blanks as null (only `values` is read). After a refusal, blocks stay at the smaller size. Each block is its own request, so Excel stays responsive between
 * blocks. Cost: about cells · bytesPerCell / targetBytes requests.
 * Example: 100,000 rows × 8 columns of short values → about 6 requests.
 */
export async function readRange(target: ReadTarget, options: ReadOptions = {}): Promise<ReadResult> {
  const targetBytes = options.targetBytes ?? 1_500_000;
  const maxCells = options.maxCells ?? 500_000;
  const firstBlockCells = options.firstBlockCells ?? 20_000;
  const g = await readGeometry(target);
  const cells: CellValue[][] = [];
  let requests = 0;
  let bytesPerCell = 0;
  let rows = firstBlockRows(g.columnCount, firstBlockCells, maxCells);
  let ceiling = Number.POSITIVE_INFINITY; // after a refusal, blocks never grow back past the size that worked
  let done = 0;
  while (done < g.rowCount) {
    const n = Math.min(rows, g.rowCount - done);
    let block: { cells: CellValue[][]; bytes: number };
    try {
      requests++;
      block = await readBlock(g.sheet, g.row + done, g.column, n, g.columnCount);
    } catch (error) {
      if (isPayloadTooLarge(error) && n > 1) {
        rows = Math.ceil(n / 2);
        ceiling = rows;
        continue;
      }
      throw error;
    }
    if (block.cells.length !== n) {
      throw new ExcelAdapterError(`The workbook returned ${block.cells.length} rows where ${n} were asked for.`);
    }
    for (const r of block.cells) cells.push(r);
    done += n;
    bytesPerCell = Math.max(bytesPerCell, block.bytes / (n * Math.max(1, g.columnCount)));
    rows = Math.min(ceiling, blockRows(g.columnCount, bytesPerCell, targetBytes, maxCells));
    options.onProgress?.(done / g.rowCount);
  }
  const address = rangeAddress(g.row, g.column, g.rowCount, g.columnCount);
  return {
    sheet: g.sheet,
    address,
    topLeft: rangeAddress(g.row, g.column, 1, 1),
    dateSystem: g.dateSystem,
    cells,
    blockRequests: requests,
  };
}
