/** The ways the host offers to bring data in: the selected cells, the whole sheet, or a file on the page. */
import type { ChangeEvent, ReactNode } from 'react';
import { useId } from 'react';
import { Button, Label, makeStyles, tokens } from '@fluentui/react-components';

const useStyles = makeStyles({
  row: { display: 'flex', flexWrap: 'wrap', gap: tokens.spacingHorizontalS },
  file: { display: 'flex', flexDirection: 'column', gap: tokens.spacingVerticalXS },
});

export type SourceKind = 'selection' | 'usedRange' | 'file';

export interface SourcePickerProps {
  readonly kinds: readonly SourceKind[];
  readonly busy: boolean;
  readonly onPick: (kind: SourceKind, file?: File) => void;
}

export function SourcePicker({ kinds, busy, onPick }: SourcePickerProps): ReactNode {
  const styles = useStyles();
  const fileId = useId();
  const onFile = (event: ChangeEvent<HTMLInputElement>): void => {
    const file = event.target.files?.[0];
    if (file) onPick('file', file);
    event.target.value = '';
  };
  return (
    <div className={styles.row}>
      {kinds.includes('selection') && (
        <Button appearance="primary" disabled={busy} onClick={() => onPick('selection')}>
          Use the selected cells
        </Button>
      )}
      {kinds.includes('usedRange') && (
        <Button disabled={busy} onClick={() => onPick('usedRange')}>
          Use the whole sheet
        </Button>
      )}
      {kinds.includes('file') && (
        <div className={styles.file}>
          <Label htmlFor={fileId}>Visit data file (CSV or Excel .xlsx)</Label>
          <input
            id={fileId}
            type="file"
            accept=".csv,.txt,.xlsx"
            disabled={busy}
            onChange={onFile}
            data-testid="data-file"
          />
        </div>
      )}
    </div>
  );
}
