/** A TableBlock as an HTML table, cells formatted by the shared formatCell; long tables show their first rows. */
import type { ReactNode } from 'react';
import type { TableBlock } from '../core/report/types';
import { formatCell } from '../core/report/formats';

export interface TableViewProps {
  readonly table: TableBlock;
  /** Rows shown before the note that the full table is in the download (default 200). */
  readonly maxRows?: number;
}

const NUMERIC = new Set(['integer', 'decimal1', 'decimal2', 'decimal3', 'decimal4', 'decimal6', 'percent1', 'pvalue']);

export function TableView({ table, maxRows = 200 }: TableViewProps): ReactNode {
  const rows = table.rows.slice(0, maxRows);
  return (
    <div className="table-wrap" role="region" aria-label={table.caption} tabIndex={0}>
      <table className="sheet-table" data-table-id={table.id}>
        <caption>{table.caption}</caption>
        <thead>
          <tr>
            {table.columns.map((c, i) => (
              <th key={i} scope="col" className={NUMERIC.has(c.format) ? 'num' : undefined}>
                {c.header}
              </th>
            ))}
          </tr>
        </thead>
        <tbody>
          {rows.map((row, r) => (
            <tr key={r}>
              {table.columns.map((c, i) => (
                <td key={i} className={NUMERIC.has(c.format) ? 'num' : undefined}>
                  {formatCell(row[i] ?? null, c.format)}
                </td>
              ))}
            </tr>
          ))}
        </tbody>
      </table>
      {table.rows.length > maxRows && (
        <p className="table-note">
          Showing the first {maxRows.toLocaleString('en-US')} of {table.rows.length.toLocaleString('en-US')} rows. The
          downloaded report has them all.
        </p>
      )}
      {table.rows.length === 0 && <p className="table-note">No rows.</p>}
    </div>
  );
}
