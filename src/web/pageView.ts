/**
 * What of a run's output the page's own thread receives from the engine worker: everything it shows, and no more.
 * Long tables are cut to the rows the page shows (their full row count travels beside them), and the results JSON
 * leaves out its long lists (the page shows none of them). The worker keeps the whole output, and writes the
 * downloaded report from it. This keeps the message, and the page's work to take it in, small at any size: at
 * 300,000 rows the whole output is some 24 MB of JSON lists and 70,000 table rows.
 */
import type { AnalysisOutput } from '../core/pipeline/types';
import type { Block, SheetSpec } from '../core/report/types';

/** Rows of a table the page shows at most (TableView's limit; the download has them all). */
export const PAGE_TABLE_ROWS = 200;
/** Lists of the results JSON longer than this are left out of the page's copy. */
export const PAGE_LIST_LIMIT = 1000;

/** Per sheet, per block: the table's full row count when the page's copy was cut, else null. */
export type TableRowCounts = readonly (readonly (number | null)[])[];

export interface PageView {
  readonly output: AnalysisOutput;
  readonly tableRows: TableRowCounts;
}

/** An object without its arrays longer than `limit` (one level; other values as they are). */
function withoutLongLists(value: unknown, limit: number): unknown {
  if (typeof value !== 'object' || value === null || Array.isArray(value)) return value;
  return Object.fromEntries(Object.entries(value).filter(([, v]) => !(Array.isArray(v) && v.length > limit)));
}

/**
 * The page's copy of `output`. Example: a sheet with a 36,898-row table → that table with its first 200 rows and
 * tableRows 36,898 at its place; json.visits without its deviations list of 36,898 entries. Cost O(kept cells).
 */
export function pageViewOf(output: AnalysisOutput, rows = PAGE_TABLE_ROWS, limit = PAGE_LIST_LIMIT): PageView {
  if (!output.ok) return { output, tableRows: [] };
  const tableRows = output.sheets.map((sheet) =>
    sheet.blocks.map((b) => (b.kind === 'table' && b.rows.length > rows ? b.rows.length : null)),
  );
  const sheets = output.sheets.map(
    (sheet): SheetSpec => ({
      ...sheet,
      blocks: sheet.blocks.map((b): Block => (b.kind === 'table' && b.rows.length > rows ? { ...b, rows: b.rows.slice(0, rows) } : b)),
    }),
  );
  const json = Object.fromEntries(
    Object.entries(output.json)
      .filter(([, v]) => !(Array.isArray(v) && v.length > limit))
      .map(([k, v]) => [k, withoutLongLists(v, limit)]),
  );
  return { output: { ...output, sheets, json }, tableRows };
}
