/** The problems found in the data, each with its cell address as a link that selects the cell. */
import type { ReactNode } from 'react';
import { useEffect, useId, useRef, useState } from 'react';
import { Button, Link, makeStyles, tokens } from '@fluentui/react-components';
import type { Issue } from '../core/intake/types';

const useStyles = makeStyles({
  list: { listStyleType: 'none', margin: 0, padding: 0, display: 'flex', flexDirection: 'column', gap: '6px' },
  item: {
    fontSize: tokens.fontSizeBase200,
    borderBottom: `1px solid ${tokens.colorNeutralStroke3}`,
    paddingBottom: '4px',
  },
  top: { display: 'flex', gap: '8px', alignItems: 'baseline', flexWrap: 'wrap' },
  tag: { fontWeight: tokens.fontWeightSemibold, borderRadius: tokens.borderRadiusSmall, padding: '0 4px' },
  error: { backgroundColor: tokens.colorPaletteRedBackground2, color: tokens.colorPaletteRedForeground2 },
  warning: { backgroundColor: tokens.colorPaletteYellowBackground2, color: tokens.colorNeutralForeground1 },
  cell: { fontFamily: tokens.fontFamilyMonospace, fontSize: tokens.fontSizeBase200 },
  message: { margin: '2px 0 0 0' },
});

export interface IssueListProps {
  readonly issues: readonly Issue[];
  readonly onSelect: (address: string) => void;
  /** How many to show before "Show all" (default 50). */
  readonly limit?: number;
}

/** The message without a leading copy of the cell address ("Visits!G4: the value…" becomes "The value…"). */
export function messageWithoutCell(issue: Issue): string {
  const prefix = issue.cell === null ? '' : `${issue.cell}: `;
  if (prefix === '' || !issue.message.startsWith(prefix)) return issue.message;
  const rest = issue.message.slice(prefix.length);
  return rest.charAt(0).toUpperCase() + rest.slice(1);
}

/** Words for what an issue does to the row: it stops the run, or leaves the row out of one use. */
function effect(issue: Issue): string {
  if (issue.severity === 'error') return 'Stops the run';
  if (issue.use === 'timing') return 'Left out of visit timing';
  if (issue.use === 'model') return 'Left out of the model';
  return 'Note';
}

export function IssueList({ issues, onSelect, limit = 50 }: IssueListProps): ReactNode {
  const styles = useStyles();
  const [all, setAll] = useState(false);
  const shown = all ? issues : issues.slice(0, limit);
  // "Show all" disappears once pressed: keyboard focus goes to the first problem it revealed.
  const firstNewId = useId();
  const revealed = useRef(false);
  useEffect(() => {
    if (all && revealed.current) document.getElementById(firstNewId)?.focus();
    revealed.current = false;
  }, [all, firstNewId]);
  return (
    <>
      <ul className={styles.list} aria-label="Problems found in the data">
        {shown.map((issue, i) => (
          <li
            key={i}
            className={styles.item}
            {...(all && i === limit ? { id: firstNewId, tabIndex: -1 } : {})}
          >
            <div className={styles.top}>
              <span className={`${styles.tag} ${issue.severity === 'error' ? styles.error : styles.warning}`}>
                {effect(issue)}
              </span>
              {issue.cell !== null && (
                <Link
                  as="button"
                  className={styles.cell}
                  onClick={() => onSelect(issue.cell as string)}
                  aria-label={`Go to cell ${issue.cell}`}
                >
                  {issue.cell}
                </Link>
              )}
            </div>
            <p className={styles.message}>{messageWithoutCell(issue)}</p>
          </li>
        ))}
      </ul>
      {!all && issues.length > limit && (
        <Button
          appearance="subtle"
          size="small"
          onClick={() => {
            revealed.current = true;
            setAll(true);
          }}
        >
          Show all {issues.length} problems
        </Button>
      )}
    </>
  );
}
