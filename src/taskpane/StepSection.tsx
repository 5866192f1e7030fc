/** One numbered step of the pane: a heading, a one-line state, and its content (or why it is not open yet). */
import type { ReactNode } from 'react';
import { makeStyles, tokens } from '@fluentui/react-components';
import { ScreenReaderText } from './ScreenReaderText';

const useStyles = makeStyles({
  section: {
    borderTop: `1px solid ${tokens.colorNeutralStroke2}`,
    paddingTop: tokens.spacingVerticalM,
    paddingBottom: tokens.spacingVerticalM,
    display: 'flex',
    flexDirection: 'column',
    gap: tokens.spacingVerticalS,
  },
  heading: {
    margin: 0,
    fontSize: tokens.fontSizeBase400,
    fontWeight: tokens.fontWeightSemibold,
    display: 'flex',
    gap: '8px',
    alignItems: 'baseline',
  },
  number: {
    display: 'inline-flex',
    alignItems: 'center',
    justifyContent: 'center',
    width: '22px',
    height: '22px',
    borderRadius: '50%',
    backgroundColor: tokens.colorBrandBackground,
    color: tokens.colorNeutralForegroundOnBrand,
    fontSize: tokens.fontSizeBase200,
    flexShrink: 0,
  },
  numberDone: { backgroundColor: tokens.colorPaletteGreenBackground3 },
  numberLocked: { backgroundColor: tokens.colorNeutralBackground5, color: tokens.colorNeutralForeground3 },
  locked: { color: tokens.colorNeutralForeground3, margin: 0 },
});

export interface StepSectionProps {
  readonly number: number;
  readonly title: string;
  readonly id: string;
  /** 'locked' shows `lockedText` instead of the content. */
  readonly state: 'locked' | 'open' | 'done';
  readonly lockedText?: string;
  readonly children?: ReactNode;
}

export function StepSection({ number, title, id, state, lockedText, children }: StepSectionProps): ReactNode {
  const styles = useStyles();
  const badge =
    state === 'done'
      ? `${styles.number} ${styles.numberDone}`
      : state === 'locked'
        ? `${styles.number} ${styles.numberLocked}`
        : styles.number;
  return (
    <section className={styles.section} aria-labelledby={`${id}-title`} id={id}>
      <h2 className={styles.heading} id={`${id}-title`} tabIndex={-1}>
        <span className={badge} aria-hidden="true">
          {state === 'done' ? '✓' : number}
        </span>
        <span>
          <ScreenReaderText>{`Step ${number}${state === 'done' ? ', done' : ''}: `}</ScreenReaderText>
          {title}
        </span>
      </h2>
      {state === 'locked' ? <p className={styles.locked}>{lockedText}</p> : children}
    </section>
  );
}
