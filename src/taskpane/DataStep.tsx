/** Step 1: bring the visit data in, look at the first rows, and confirm which column plays which role. */
import type { ReactNode } from 'react';
import { Button, MessageBar, MessageBarBody, ProgressBar, Text, makeStyles, tokens } from '@fluentui/react-components';
import type { ColumnMapping, DetectedMapping } from '../core/intake/types';
import type { DataSource } from './actions';
import { blindedConflicts, hiddenWhileBlinded } from './blinding';
import { MappingEditor } from './MappingEditor';
import { MappingSummary } from './MappingSummary';
import { PreviewTable } from './PreviewTable';
import { SourcePicker, type SourceKind } from './SourcePicker';
import { stackStyle, subheadStyle } from './paneStyles';

const useStyles = makeStyles({
  col: stackStyle,
  notes: { margin: 0, paddingLeft: '18px', fontSize: tokens.fontSizeBase200, color: tokens.colorNeutralForeground2 },
  subhead: subheadStyle,
});

export interface DataStepProps {
  readonly kinds: readonly SourceKind[];
  /** Fraction loaded while loading, else null. */
  readonly loading: number | null;
  readonly error: string | null;
  readonly source: DataSource | null;
  readonly headers: readonly string[];
  readonly mapping: ColumnMapping | null;
  readonly reasons: DetectedMapping['reasons'];
  readonly blinded: boolean;
  readonly suggestions: readonly number[];
  /** Plain sentences from detection about columns recognised but not used. */
  readonly notes: readonly string[];
  readonly confirmed: boolean;
  readonly onPick: (kind: SourceKind, file?: File) => void;
  readonly onMappingChange: (mapping: ColumnMapping) => void;
  readonly onConfirm: () => void;
  /** Reopens the confirmed columns for editing. */
  readonly onEdit: () => void;
}

/**
 * What must be mapped before the columns can be confirmed; empty when ready. With `blinded` and the headers, also
 * every arm-like column given a role other than the arm (SPEC §2).
 */
export function mappingGaps(mapping: ColumnMapping, blinded = false, headers: readonly string[] = []): string[] {
  const gaps: string[] = [];
  if (mapping.subject === undefined) gaps.push('Choose the participant column.');
  if (mapping.date === undefined && mapping.studyDay === undefined)
    gaps.push('Choose a visit date or a study day column.');
  if (blinded) gaps.push(...blindedConflicts(mapping, headers));
  return gaps;
}

export function DataStep(props: DataStepProps): ReactNode {
  const styles = useStyles();
  const { source, mapping } = props;
  const rows = source ? Math.max(0, source.cells.length - 1) : 0;
  const gaps = mapping ? mappingGaps(mapping, props.blinded, props.headers) : [];
  const hidden = props.blinded ? hiddenWhileBlinded(props.headers, mapping) : [];
  return (
    <div className={styles.col}>
      <SourcePicker
        kinds={props.kinds}
        busy={props.loading !== null}
        onPick={props.onPick}
        fileShown={source?.label ?? null}
      />
      {props.loading !== null && (
        <ProgressBar
          {...(props.loading > 0 ? { value: props.loading } : {})}
          aria-label="Reading the data"
          thickness="large"
        />
      )}
      {props.error !== null && (
        <MessageBar intent="error">
          <MessageBarBody>{props.error}</MessageBarBody>
        </MessageBar>
      )}
      {source && (
        <Text>
          Read <strong>{source.label}</strong>: {rows.toLocaleString('en-US')} rows, {props.headers.length} columns.
        </Text>
      )}
      {source && mapping && props.confirmed && (
        <>
          <MappingSummary headers={props.headers} mapping={mapping} blinded={props.blinded} />
          <div>
            <Button onClick={props.onEdit}>Change columns</Button>
          </div>
        </>
      )}
      {source && !props.confirmed && (
        <>
          <PreviewTable headers={props.headers} cells={source.cells} hiddenColumns={hidden} />
          {hidden.length > 0 && (
            <Text size={200}>
              Treatment-arm columns are not shown or used while blinded:{' '}
              {hidden.map((c) => props.headers[c] ?? '').join(', ')}.
            </Text>
          )}
        </>
      )}
      {source && mapping && !props.confirmed && (
        <>
          <h3 className={styles.subhead}>Which column is which?</h3>
          <MappingEditor
            headers={props.headers}
            mapping={mapping}
            reasons={props.reasons}
            blinded={props.blinded}
            suggestions={props.suggestions}
            onChange={props.onMappingChange}
          />
          {props.notes.length > 0 && (
            <ul className={styles.notes} aria-label="Notes on other columns">
              {props.notes.map((n) => (
                <li key={n}>{n}</li>
              ))}
            </ul>
          )}
          {gaps.map((g) => (
            <MessageBar key={g} intent="warning">
              <MessageBarBody>{g}</MessageBarBody>
            </MessageBar>
          ))}
          <Button appearance="primary" disabled={gaps.length > 0} onClick={props.onConfirm}>
            Confirm columns
          </Button>
        </>
      )}
    </div>
  );
}
