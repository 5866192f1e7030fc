/** The parsed visit schedule: each visit's target day and the days allowed either side. */
import type { ReactNode } from 'react';
import { makeStyles, tokens } from '@fluentui/react-components';
import type { ScheduleVisit } from '../core/schedule/types';
import { tableCellStyle, tableFrameStyle, tableHeadStyle } from './paneStyles';

const useStyles = makeStyles({
  wrap: { ...tableFrameStyle, maxHeight: '220px', overflowY: 'auto' },
  table: { borderCollapse: 'collapse', width: '100%', fontSize: tokens.fontSizeBase200 },
  th: { ...tableHeadStyle, position: 'sticky', top: 0 },
  num: { ...tableCellStyle, textAlign: 'right' },
  td: tableCellStyle,
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
            <th className={styles.th} scope="col">
              Target day
            </th>
            <th className={styles.th} scope="col">
              Days allowed before
            </th>
            <th className={styles.th} scope="col">
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
