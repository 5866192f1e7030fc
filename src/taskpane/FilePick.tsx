/**
 * A file picker that says which file was read. The browser's own file input keeps saying "No file chosen" once the
 * pane has cleared it (it is cleared so that the same file, edited, can be picked again), so the input is kept for
 * keyboards, screen readers and tests but drawn off-screen, and a button-like face beside it shows the name of the
 * file the pane has read.
 */
import type { ChangeEvent, ReactNode } from 'react';
import { useId, useRef } from 'react';
import { Label, Text, makeStyles, mergeClasses, tokens } from '@fluentui/react-components';

const useStyles = makeStyles({
  col: { display: 'flex', flexDirection: 'column', gap: tokens.spacingVerticalXS },
  row: {
    display: 'flex',
    alignItems: 'center',
    gap: tokens.spacingHorizontalS,
    minWidth: 0,
    borderRadius: tokens.borderRadiusMedium,
    ':focus-within': { outline: `2px solid ${tokens.colorStrokeFocus2}`, outlineOffset: '2px' },
  },
  // Off-screen but focusable and in the accessibility tree (the usual visually-hidden pattern).
  input: {
    position: 'absolute',
    width: '1px',
    height: '1px',
    margin: '-1px',
    padding: 0,
    overflow: 'hidden',
    clipPath: 'inset(50%)',
    whiteSpace: 'nowrap',
    border: 0,
  },
  face: {
    flexShrink: 0,
    fontFamily: tokens.fontFamilyBase,
    fontSize: tokens.fontSizeBase300,
    fontWeight: tokens.fontWeightSemibold,
    padding: `${tokens.spacingVerticalXS} ${tokens.spacingHorizontalM}`,
    borderRadius: tokens.borderRadiusMedium,
    border: `1px solid ${tokens.colorNeutralStroke1}`,
    backgroundColor: tokens.colorNeutralBackground1,
    color: tokens.colorNeutralForeground1,
    cursor: 'pointer',
    ':hover': { backgroundColor: tokens.colorNeutralBackground1Hover },
  },
  faceDisabled: { cursor: 'default', color: tokens.colorNeutralForegroundDisabled },
  name: { minWidth: 0, overflowWrap: 'anywhere', color: tokens.colorNeutralForeground2 },
  chosen: { color: tokens.colorNeutralForeground1, fontWeight: tokens.fontWeightSemibold },
});

export interface FilePickProps {
  /** The input's accessible name and visible label. */
  readonly label: string;
  readonly accept: string;
  readonly disabled: boolean;
  /** The name of the file the pane has read, or null before any. */
  readonly shown: string | null;
  readonly onFile: (file: File) => void;
  readonly testId: string;
}

export function FilePick(props: FilePickProps): ReactNode {
  const styles = useStyles();
  const id = useId();
  const input = useRef<HTMLInputElement>(null);
  const onChange = (event: ChangeEvent<HTMLInputElement>): void => {
    const file = event.target.files?.[0];
    if (file) props.onFile(file);
    event.target.value = '';
  };
  return (
    <div className={styles.col}>
      <Label htmlFor={id}>{props.label}</Label>
      <div className={styles.row}>
        <input
          ref={input}
          id={id}
          type="file"
          accept={props.accept}
          disabled={props.disabled}
          onChange={onChange}
          className={styles.input}
          data-testid={props.testId}
        />
        {/* The face only repeats the input for the mouse; keyboards and screen readers use the input itself. */}
        <span
          aria-hidden="true"
          className={mergeClasses(styles.face, props.disabled && styles.faceDisabled)}
          onClick={() => {
            if (!props.disabled) input.current?.click();
          }}
        >
          Choose a file…
        </span>
        <Text className={mergeClasses(styles.name, props.shown !== null && styles.chosen)} data-testid={`${props.testId}-name`}>
          {props.shown ?? 'No file read yet'}
        </Text>
      </div>
    </div>
  );
}
