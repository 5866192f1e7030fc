/** The problems found in the data, each with its cell address as a link that selects the cell. */
import type { ReactNode } from 'react';
import { useState } from 'react';
import { Button, Link, makeStyles, tokens } from '@fluentui/react-components';
import type { Issue } from '../core/intake/types';

const useStyles = makeStyles({
  list: { listStyleType: 'none', margin: 0, padding: 0, display: 'flex', flexDirection: 'column', gap: '4px' },
  item: { display: 'flex', gap: '6px', fontSize: tokens.fontSizeBase200, alignItems: 'baseline' },
  tag: { flexShrink: 0, fontWeight: tokens.fontWeightSemibold, borderRadius: tokens.borderRadiusSmall, padding: '0 4px' },
  error: { backgroundColor: tokens.colorPaletteRedBackground2, color: tokens.colorPaletteRedForeground2 },
  warning: { backgroundColor: tokens.colorPaletteYellowBackground2, color: tokens.colorNeutralForeground1 },
  cell: { flexShrink: 0, fontFamily: tokens.fontFamilyMonospace },
});

export interface IssueListProps {
  readonly issues: readonly Issue[];
  readonly onSelect: (address: string) => void;
  /** How many to show before "Show all" (default 50). */
  readonly limit?: number;
}

export function IssueList({ issues, onSelect, limit = 50 }: IssueListProps): ReactNode {
  const styles = useStyles();
  const [all, setAll] = useState(false);
  const shown = all ? issues : issues.slice(0, limit);
  return (
    <>
      <ul className={styles.list} aria-label="Problems found in the data">
        {shown.map((issue, i) => (
          <li key={i} className={styles.item}>
            <span className={`${styles.tag} ${issue.severity === 'error' ? styles.error : styles.warning}`}>
              {issue.severity === 'error' ? 'Stops run' : 'Row left out'}
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
            <span>{issue.message}</span>
          </li>
        ))}
      </ul>
      {!all && issues.length > limit && (
        <Button appearance="subtle" size="small" onClick={() => setAll(true)}>
          Show all {issues.length} problems
        </Button>
      )}
    </>
  );
}
