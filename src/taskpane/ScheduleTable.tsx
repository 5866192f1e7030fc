/** The parsed visit schedule: each visit's target day and the days allowed either side. */
import type { ReactNode } from 'react';
import { makeStyles, tokens } from '@fluentui/react-components';
import type { ScheduleVisit } from '../core/schedule/types';
import { tableCellStyle, tableFrameStyle, tableHeadStyle } from './paneStyles';

// Every visit is shown (no height cap: a cap hid the last visit of a five-visit schedule) and a visit name stays on
// one line; a schedule too wide for the pane scrolls across inside its own frame.
const useStyles = makeStyles({
  wrap: { ...tableFrameStyle, overflowX: 'auto' },
  table: { borderCollapse: 'collapse', width: '100%', fontSize: tokens.fontSizeBase200 },
  th: { ...tableHeadStyle, verticalAlign: 'bottom' },
  thNum: { ...tableHeadStyle, verticalAlign: 'bottom', textAlign: 'right' },
  num: { ...tableCellStyle, textAlign: 'right', whiteSpace: 'nowrap' },
  td: { ...tableCellStyle, whiteSpace: 'nowrap' },
});

export function ScheduleTable({ visits }: { readonly visits: readonly ScheduleVisit[] }): ReactNode {
  const styles = useStyles();
  return (
    <div className={styles.wrap} tabIndex={0} role="region" aria-label="Visit schedule">
      <table className={styles.table}>
        <caption style={{ textAlign: 'left', padding: '2px 6px' }}>{visits.length} scheduled visits</caption>
        <thead>
          <tr>
            <th className={styles.th} scope="col">
              Visit
            </th>
            <th className={styles.thNum} scope="col">
              Target day
            </th>
            <th className={styles.thNum} scope="col">
              Days allowed before
            </th>
            <th className={styles.thNum} scope="col">
              Days allowed after
            </th>
          </tr>
        </thead>
        <tbody>
          {visits.map((v, i) => (
            <tr key={i}>
              <td className={styles.td}>{v.label}</td>
              <td className={styles.num}>{v.targetDay}</td>
              <td className={styles.num}>{v.before}</td>
              <td className={styles.num}>{v.after}</td>
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}
