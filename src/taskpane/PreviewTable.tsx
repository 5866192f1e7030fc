/** The first rows of the loaded data, so the user sees that the right range came in. */
import type { ReactNode } from 'react';
import { makeStyles, tokens } from '@fluentui/react-components';
import type { CellValue } from '../core/intake/types';
import { cellText } from './cells';
import { tableCellStyle, tableFrameStyle, tableHeadStyle } from './paneStyles';

const useStyles = makeStyles({
  wrap: { ...tableFrameStyle, overflowX: 'auto', maxWidth: '100%' },
  table: { borderCollapse: 'collapse', fontSize: tokens.fontSizeBase200, whiteSpace: 'nowrap' },
  th: { ...tableHeadStyle, fontWeight: tokens.fontWeightSemibold },
  hidden: { color: tokens.colorNeutralForeground3, fontStyle: 'italic' },
  td: tableCellStyle,
});

export interface PreviewTableProps {
  readonly headers: readonly string[];
  readonly cells: readonly (readonly CellValue[])[];
  /** How many data rows to show (default 5). */
  readonly rows?: number;
  /** Columns whose values are not shown and not read (every arm-like column while blinded). */
  readonly hiddenColumns?: readonly number[];
}

export function PreviewTable({ headers, cells, rows = 5, hiddenColumns = [] }: PreviewTableProps): ReactNode {
  const styles = useStyles();
  const body = cells.slice(1, 1 + rows);
  const hidden = new Set(hiddenColumns);
  return (
    <div className={styles.wrap} tabIndex={0} role="region" aria-label="Preview of the first rows">
      <table className={styles.table}>
        <thead>
          <tr>
            {headers.map((h, i) => (
              <th key={i} className={styles.th} scope="col">
                {h}
              </th>
            ))}
          </tr>
        </thead>
        <tbody>
          {body.map((row, r) => (
            <tr key={r}>
              {headers.map((_, c) => (
                <td key={c} className={styles.td}>
                  {hidden.has(c) ? <span className={styles.hidden}>hidden</span> : cellText(row[c])}
                </td>
              ))}
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}
