/** Step 5: the sheets written (as links), a short headline, the problems with their cells, and the cautions. */
import type { ReactNode } from 'react';
import {
  Link,
  MessageBar,
  MessageBarBody,
  MessageBarTitle,
  Text,
  makeStyles,
} from '@fluentui/react-components';
import { CautionList } from './CautionList';
import { IssueList } from './IssueList';
import { stoppingFirst } from './headline';
import type { RunOutcome } from './outcome';
import { stackStyle, subheadStyle } from './paneStyles';

const useStyles = makeStyles({
  col: stackStyle,
  subhead: subheadStyle,
  sheets: { margin: 0, padding: 0, listStyleType: 'none', display: 'flex', flexDirection: 'column', gap: '4px' },
  headline: { margin: 0, paddingLeft: '18px', display: 'flex', flexDirection: 'column', gap: '2px' },
});

export interface ResultsStepProps {
  readonly outcome: RunOutcome;
  readonly onShowSheet: (name: string) => void;
  readonly onSelectCell: (address: string) => void;
}

export function ResultsStep({ outcome, onShowSheet, onSelectCell }: ResultsStepProps): ReactNode {
  const styles = useStyles();
  if (outcome.kind === 'cancelled') {
    return (
      <MessageBar intent="info">
        <MessageBarBody>The run was stopped. Nothing was written.</MessageBarBody>
      </MessageBar>
    );
  }
  if (outcome.kind === 'failed') {
    return (
      <MessageBar intent="error">
        <MessageBarBody>
          <MessageBarTitle>The run failed.</MessageBarTitle>
          {outcome.message}
        </MessageBarBody>
      </MessageBar>
    );
  }
  if (outcome.kind === 'blocked') {
    return (
      <div className={styles.col}>
        <MessageBar intent="error">
          <MessageBarBody>
            <MessageBarTitle>The data cannot be analysed yet.</MessageBarTitle>
            Fix the problems below, those that stop the run first (select one to go to its cell), and run again.
          </MessageBarBody>
        </MessageBar>
        <IssueList issues={stoppingFirst(outcome.issues)} onSelect={onSelectCell} />
      </div>
    );
  }
  return (
    <div className={styles.col}>
      <h3 className={styles.subhead}>In short</h3>
      <ul className={styles.headline}>
        {outcome.headline.map((line, i) => (
          <li key={i}>
            <Text>{line}</Text>
          </li>
        ))}
      </ul>
      <h3 className={styles.subhead}>Sheets written</h3>
      <ul className={styles.sheets} aria-label="Sheets written">
        {outcome.written.map((s) => (
          <li key={s.name}>
            <Link as="button" onClick={() => onShowSheet(s.name)}>
              {s.title !== '' && s.title !== s.name ? `${s.name}: ${s.title}` : s.name}
            </Link>
          </li>
        ))}
      </ul>
      <CautionList />
      <h3 className={styles.subhead}>
        {outcome.issues.length === 0
          ? 'No problems found in the data'
          : `Problems found in the data (${outcome.issues.length})`}
      </h3>
      {outcome.issues.length > 0 && <IssueList issues={outcome.issues} onSelect={onSelectCell} />}
    </div>
  );
}
