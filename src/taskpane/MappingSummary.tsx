/** The confirmed columns in a few lines: each role that has a column, and the covariates. */
import type { ReactNode } from 'react';
import { makeStyles, tokens } from '@fluentui/react-components';
import type { ColumnMapping } from '../core/intake/types';
import { ROLES } from './roles';

const useStyles = makeStyles({
  list: {
    display: 'grid',
    gridTemplateColumns: 'auto 1fr',
    columnGap: tokens.spacingHorizontalM,
    rowGap: '2px',
    margin: 0,
    fontSize: tokens.fontSizeBase200,
  },
  term: { color: tokens.colorNeutralForeground2 },
  value: { margin: 0, fontWeight: tokens.fontWeightSemibold, overflowWrap: 'anywhere' },
});

export interface MappingSummaryProps {
  readonly headers: readonly string[];
  readonly mapping: ColumnMapping;
  readonly blinded: boolean;
}

export function MappingSummary({ headers, mapping, blinded }: MappingSummaryProps): ReactNode {
  const styles = useStyles();
  const rows = ROLES.filter(({ role }) => mapping[role] !== undefined && !(blinded && role === 'arm')).map(
    ({ role, label }) => [label, headers[mapping[role] as number] ?? ''] as const,
  );
  if (mapping.covariates.length > 0) {
    rows.push(['Covariates', mapping.covariates.map((c) => headers[c] ?? '').join(', ')]);
  }
  return (
    <dl className={styles.list} aria-label="Confirmed columns">
      {rows.map(([label, header]) => (
        <div key={label} style={{ display: 'contents' }}>
          <dt className={styles.term}>{label}</dt>
          <dd className={styles.value}>{header}</dd>
        </div>
      ))}
    </dl>
  );
}
