/** Step 2: choose where the visit schedule comes from (a sheet, a file, or a starter), and show it or its problem. */
import type { ReactNode } from 'react';
import { useState } from 'react';
import {
  Button,
  Field,
  MessageBar,
  MessageBarBody,
  Select,
  Spinner,
  Text,
  makeStyles,
  tokens,
} from '@fluentui/react-components';
import type { ScheduleLoad, ScheduleSource } from './actions';
import { FilePick } from './FilePick';
import { ScheduleTable } from './ScheduleTable';
import { stackStyle } from './paneStyles';

const useStyles = makeStyles({
  col: stackStyle,
  row: { display: 'flex', gap: tokens.spacingHorizontalS, alignItems: 'end', flexWrap: 'wrap' },
  grow: { flexGrow: 1, minWidth: '140px' },
  hint: { display: 'block', margin: `${tokens.spacingVerticalXS} 0 0 0`, color: tokens.colorNeutralForeground2 },
});

export interface ScheduleStepProps {
  readonly sources: readonly ScheduleSource[];
  /** The page offers a file picker; Excel offers sheets. */
  readonly allowFile: boolean;
  readonly busy: boolean;
  /** The name of the schedule shown, if any. */
  readonly current: string | null;
  readonly result: ScheduleLoad | null;
  readonly onLoad: (name: string) => void;
  readonly onFile: (file: File) => void;
  readonly onStarter: () => void;
}

export function ScheduleStep(props: ScheduleStepProps): ReactNode {
  const styles = useStyles();
  const [picked, setPicked] = useState<string>('');
  const [fileName, setFileName] = useState<string | null>(null);
  const choice = picked !== '' ? picked : (props.current ?? props.sources[0]?.name ?? '');
  // The picker names the file only while the schedule shown is the one read from it.
  const fileShown = fileName !== null && props.current === fileName && props.result?.ok === true ? fileName : null;
  return (
    <div className={styles.col}>
      <Text>
        The schedule lists each scheduled visit, its target day and how many days it may be held before or after it.
      </Text>
      {/* Excel chooses a sheet of the workbook here; the page has only its file picker below (a list of the files
          already read there only repeated what the picker and the table below it show). */}
      {!props.allowFile && props.sources.length > 0 && (
        <div className={styles.row}>
          <Field label="Schedule sheet" className={styles.grow}>
            <Select value={choice} onChange={(_, d) => setPicked(d.value)}>
              {props.sources.map((s) => (
                <option key={s.name} value={s.name}>
                  {s.name}
                </option>
              ))}
            </Select>
          </Field>
          <Button disabled={props.busy || choice === ''} onClick={() => props.onLoad(choice)}>
            Use this schedule
          </Button>
        </div>
      )}
      {props.allowFile && (
        <FilePick
          label="Schedule file (CSV)"
          accept=".csv,.txt"
          disabled={props.busy}
          shown={fileShown}
          onFile={(file) => {
            setFileName(file.name);
            props.onFile(file);
          }}
          testId="schedule-file"
        />
      )}
      <div>
        {/* The plain (outlined) button: the subtle one had no border and read as text, not as something to press. */}
        <Button disabled={props.busy} onClick={props.onStarter}>
          {props.allowFile ? 'Use the starter schedule' : 'Write a starter schedule sheet'}
        </Button>
        <Text as="p" size={200} className={styles.hint}>
          {props.allowFile
            ? 'A starting point: it is also saved as a CSV file that you can edit and load above.'
            : 'Adds a sheet with a starter schedule that you can edit, then choose it above.'}
        </Text>
      </div>
      {props.busy && <Spinner size="tiny" label="Reading the schedule…" />}
      {props.result && !props.result.ok && (
        <MessageBar intent="error">
          <MessageBarBody>{props.result.message}</MessageBarBody>
        </MessageBar>
      )}
      {props.result?.ok && (
        <>
          <Text>
            Schedule <strong>{props.current}</strong>:
          </Text>
          <ScheduleTable visits={props.result.schedule} />
        </>
      )}
    </div>
  );
}
