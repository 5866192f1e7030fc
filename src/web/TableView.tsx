/** A TableBlock as an HTML table, cells formatted by the shared formatCell; long tables show their first rows. */
import type { ReactNode } from 'react';
import { useEffect, useId, useRef, useState } from 'react';
import type { TableBlock } from '../core/report/types';
import { formatCell } from '../core/report/formats';
import { PAGE_TABLE_ROWS } from './pageView';

export interface TableViewProps {
  readonly table: TableBlock;
  /** Rows shown at most, with a note that the download has them all (default 200). */
  readonly maxRows?: number;
  /** Rows shown at first when the table is long (more than twice this); a button shows the rest (default 12). */
  readonly previewRows?: number;
  /** The table's full row count when `table` holds only its first rows (the page's copy, pageView.ts). */
  readonly totalRows?: number;
}

const NUMERIC = new Set(['integer', 'decimal1', 'decimal2', 'decimal3', 'decimal4', 'decimal6', 'significant', 'percent1', 'pvalue']);

/** Text columns at least this wide (in characters, TableColumn.width) wrap their cells instead of running off. */
const WRAP_FROM_WIDTH = 40;

/** The class of a column's cells: numbers right-aligned, wide text wrapped, the rest as they are. */
function cellClass(column: TableBlock['columns'][number]): string | undefined {
  if (NUMERIC.has(column.format)) return 'num';
  if (column.format === 'text' && (column.width ?? 0) >= WRAP_FROM_WIDTH) return 'wrap';
  return undefined;
}

export function TableView({ table, maxRows = PAGE_TABLE_ROWS, previewRows = 12, totalRows }: TableViewProps): ReactNode {
  const total = Math.max(totalRows ?? 0, table.rows.length);
  const long = total > 2 * previewRows;
  const [open, setOpen] = useState(!long);
  // "Show all" disappears once pressed: keyboard focus goes to the table's scrolling region, not the page's top.
  const regionId = useId();
  const opened = useRef(false);
  useEffect(() => {
    if (open && opened.current) document.getElementById(regionId)?.focus();
    opened.current = false;
  }, [open, regionId]);
  const limit = open ? maxRows : Math.min(previewRows, maxRows);
  const rows = table.rows.slice(0, limit);
  return (
    <div className="table-wrap" role="region" aria-label={table.caption} tabIndex={0} id={regionId}>
      <table className="sheet-table" data-table-id={table.id}>
        <caption>{table.caption}</caption>
        <thead>
          <tr>
            {table.columns.map((c, i) => (
              <th key={i} scope="col" className={cellClass(c)}>
                {c.header}
              </th>
            ))}
          </tr>
        </thead>
        <tbody>
          {rows.map((row, r) => (
            <tr key={r}>
              {table.columns.map((c, i) => (
                <td key={i} className={cellClass(c)}>
                  {formatCell(row[i] ?? null, c.format)}
                </td>
              ))}
            </tr>
          ))}
        </tbody>
      </table>
      {!open && (
        <button
          type="button"
          className="plain-button"
          onClick={() => {
            opened.current = true;
            setOpen(true);
          }}
        >
          Show all {total.toLocaleString('en-US')} rows
        </button>
      )}
      {open && total > maxRows && (
        <p className="table-note">
          Showing the first {maxRows.toLocaleString('en-US')} of {total.toLocaleString('en-US')} rows. The
          downloaded report has them all.
        </p>
      )}
      {table.rows.length === 0 && <p className="table-note">No rows.</p>}
    </div>
  );
}
