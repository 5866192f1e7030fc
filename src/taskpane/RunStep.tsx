/** Step 4: start the run, follow it through its stages, and stop it if needed (until the sheets are being written). */
import type { ReactNode } from 'react';
import { Button, MessageBar, MessageBarBody, ProgressBar, Text, makeStyles, tokens } from '@fluentui/react-components';
import type { Stage } from '../core/pipeline/types';
import { stackStyle } from './paneStyles';

const useStyles = makeStyles({
  col: stackStyle,
  row: { display: 'flex', gap: tokens.spacingHorizontalS },
  stages: { listStyleType: 'none', margin: 0, padding: 0, display: 'flex', flexDirection: 'column', gap: '2px' },
  done: { color: tokens.colorPaletteGreenForeground1 },
  now: { fontWeight: tokens.fontWeightSemibold },
  later: { color: tokens.colorNeutralForeground3 },
});

export const STAGES: readonly Stage[] = ['reading', 'windowing', 'fitting', 'writing'];

/** Plain words for each stage, used in the list and in the live region. */
export const STAGE_WORDS: Readonly<Record<Stage, string>> = {
  reading: 'Reading and checking the data',
  windowing: 'Checking visit timing against the schedule',
  fitting: 'Fitting the mixed model',
  writing: 'Writing the result sheets',
};

export interface RunStepProps {
  /** Reasons the run cannot start yet (empty when it can). */
  readonly blockers: readonly string[];
  /** The stage now running, or null when idle. */
  readonly stage: Stage | null;
  /** How far the running stage has got (0 to 1) when the host reports it (writing does), else null. */
  readonly stageFraction?: number | null;
  readonly cancelling: boolean;
  readonly onRun: () => void;
  readonly onCancel: () => void;
}

export function RunStep({ blockers, stage, stageFraction = null, cancelling, onRun, onCancel }: RunStepProps): ReactNode {
  const styles = useStyles();
  const index = stage === null ? -1 : STAGES.indexOf(stage);
  const within = stageFraction === null ? 0.5 : Math.min(1, Math.max(0, stageFraction));
  return (
    <div className={styles.col}>
      {blockers.map((b) => (
        <MessageBar key={b} intent="warning">
          <MessageBarBody>{b}</MessageBarBody>
        </MessageBar>
      ))}
      <div className={styles.row}>
        <Button appearance="primary" disabled={blockers.length > 0 || stage !== null} onClick={onRun}>
          Run the analysis
        </Button>
        {stage !== null && stage !== 'writing' && (
          <Button onClick={onCancel} disabled={cancelling}>
            {cancelling ? 'Stopping…' : 'Cancel'}
          </Button>
        )}
      </div>
      {stage !== null && (
        <>
          <ProgressBar value={(index + within) / STAGES.length} thickness="large" aria-label="Run progress" />
          {stage === 'writing' && (
            <Text size={200}>The result sheets are being written; this last step cannot be stopped part-way.</Text>
          )}
          <ol className={styles.stages} aria-label="Run stages">
            {STAGES.map((s, i) => (
              <li key={s} className={i < index ? styles.done : i === index ? styles.now : styles.later}>
                {i < index ? '✓ ' : i === index ? '▸ ' : '○ '}
                {STAGE_WORDS[s]}
                {i === index ? '…' : ''}
              </li>
            ))}
          </ol>
        </>
      )}
    </div>
  );
}
