/** The page's answer to "go to cell": the data row around the cell, with the cell marked. */
import type { ReactNode } from 'react';
import type { DataSource } from '../taskpane/actions';
import { cellText } from '../taskpane/cells';
import type { HighlightedCell } from './resultStore';

export interface SourceRowViewProps {
  readonly source: DataSource;
  readonly highlight: HighlightedCell;
  /** Only these columns (and the cell's own) are shown; null shows all. A blinded run passes the columns it read. */
  readonly shownHeaders?: readonly string[] | null;
  readonly onClose: () => void;
}

export function SourceRowView({ source, highlight, shownHeaders = null, onClose }: SourceRowViewProps): ReactNode {
  const header = source.cells[0] ?? [];
  const columns = header
    .map((h, c) => ({ h, c }))
    .filter(
      ({ h, c }) => shownHeaders === null || c === highlight.colIndex || shownHeaders.includes(cellText(h).trim()),
    );
  const first = Math.max(1, highlight.rowIndex - 1);
  const last = Math.min(source.cells.length - 1, highlight.rowIndex + 1);
  const rows: number[] = [];
  for (let r = first; r <= last; r++) rows.push(r);
  const sheetRow = (r: number): number =>
    highlight.rowIndex === r ? rowNumber(highlight.address) : rowNumber(highlight.address) + (r - highlight.rowIndex);
  return (
    <section className="source-row" aria-labelledby="source-row-title" tabIndex={-1} id="source-row">
      <h2 id="source-row-title">
        Cell {highlight.address} in {source.label}
      </h2>
      <div className="table-wrap">
        <table className="sheet-table">
          <thead>
            <tr>
              <th scope="col">Row</th>
              {columns.map(({ h, c }) => (
                <th key={c} scope="col" className={c === highlight.colIndex ? 'hit' : undefined}>
                  {cellText(h)}
                </th>
              ))}
            </tr>
          </thead>
          <tbody>
            {rows.map((r) => (
              <tr key={r} className={r === highlight.rowIndex ? 'hit-row' : undefined}>
                <th scope="row">{sheetRow(r)}</th>
                {columns.map(({ c }) => (
                  <td key={c} className={r === highlight.rowIndex && c === highlight.colIndex ? 'hit' : undefined}>
                    {cellText(source.cells[r]?.[c])}
                  </td>
                ))}
              </tr>
            ))}
          </tbody>
        </table>
      </div>
      {columns.length < header.length && (
        <p className="table-note">Only the columns this blinded run read are shown.</p>
      )}
      <button type="button" className="plain-button" onClick={onClose}>
        Close
      </button>
    </section>
  );
}

function rowNumber(address: string): number {
  const m = /(\d+)$/.exec(address);
  return m ? Number(m[1]) : 0;
}
