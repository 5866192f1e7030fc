/** The ways the host offers to bring data in: the selected cells, the whole sheet, or a file on the page. */
import type { ReactNode } from 'react';
import { Button, makeStyles, tokens } from '@fluentui/react-components';
import { FilePick } from './FilePick';

const useStyles = makeStyles({
  row: { display: 'flex', flexWrap: 'wrap', gap: tokens.spacingHorizontalS },
  file: { flexBasis: '100%', minWidth: 0 },
});

export type SourceKind = 'selection' | 'usedRange' | 'file';

export interface SourcePickerProps {
  readonly kinds: readonly SourceKind[];
  readonly busy: boolean;
  readonly onPick: (kind: SourceKind, file?: File) => void;
  /** What the pane has read from a file (its name), shown beside the file picker; null before any. */
  readonly fileShown?: string | null;
}

export function SourcePicker({ kinds, busy, onPick, fileShown = null }: SourcePickerProps): ReactNode {
  const styles = useStyles();
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
          <FilePick
            label="Visit data file (CSV or Excel .xlsx)"
            accept=".csv,.txt,.xlsx"
            disabled={busy}
            shown={fileShown}
            onFile={(file) => onPick('file', file)}
            testId="data-file"
          />
        </div>
      )}
    </div>
  );
}
