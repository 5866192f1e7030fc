/** The proposed column for each role, one dropdown per role with the reason it was proposed; covariates as check boxes. */
import type { ReactNode } from 'react';
import { Checkbox, Field, Select, makeStyles, tokens } from '@fluentui/react-components';
import type { ColumnMapping, DetectedMapping } from '../core/intake/types';
import { armLikeColumns } from './blinding';
import { ROLES } from './roles';
import { roleOfColumn, setRole, toggleCovariate } from './mapping';
import { stackStyle } from './paneStyles';

const useStyles = makeStyles({
  list: stackStyle,
  fieldset: {
    border: `1px solid ${tokens.colorNeutralStroke2}`,
    borderRadius: tokens.borderRadiusMedium,
    padding: tokens.spacingHorizontalS,
    margin: 0,
  },
  legend: { fontWeight: tokens.fontWeightSemibold, padding: '0 4px' },
  none: { color: tokens.colorNeutralForeground3, margin: 0 },
});

export interface MappingEditorProps {
  readonly headers: readonly string[];
  readonly mapping: ColumnMapping;
  readonly reasons: DetectedMapping['reasons'];
  /**
   * Blinded mode: the arm dropdown is shown but marked as not read, and a column whose header names an arm is offered
   * for no other role (one already given a role stays visible, marked, so it can be taken off).
   */
  readonly blinded: boolean;
  /** Columns detection suggests as covariates (e.g. a baseline value); marked, never ticked for the user. */
  readonly suggestions: readonly number[];
  readonly onChange: (mapping: ColumnMapping) => void;
}

export function MappingEditor({
  headers,
  mapping,
  reasons,
  blinded,
  suggestions,
  onChange,
}: MappingEditorProps): ReactNode {
  const styles = useStyles();
  const armLike = new Set(blinded ? armLikeColumns(headers) : []);
  const free = headers
    .map((_, i) => i)
    .filter((i) => {
      const role = roleOfColumn(mapping, i);
      if (role === 'covariate') return true;
      return role === null && !armLike.has(i);
    });
  /** The label of a column in a list; an arm-like column still chosen while blinded says it must go. */
  const columnLabel = (i: number): string =>
    armLike.has(i) ? `${headers[i] ?? ''} (names an arm: not allowed while blinded)` : (headers[i] ?? '');
  return (
    <div className={styles.list}>
      {ROLES.map(({ role, label, help }) => {
        const chosen = mapping[role];
        const reason = reasons[role];
        const hint =
          chosen === undefined
            ? `Not found. ${help}`
            : reason !== undefined && headers[chosen] !== undefined
              ? reason
              : help;
        return (
          <Field
            key={role}
            label={role === 'arm' && blinded ? `${label} (not read while blinded)` : label}
            hint={hint}
            size="small"
          >
            <Select
              value={chosen === undefined ? '' : String(chosen)}
              onChange={(_, data) => onChange(setRole(mapping, role, data.value === '' ? null : Number(data.value)))}
              data-role={role}
            >
              <option value="">(no column)</option>
              {headers.map((h, i) =>
                role === 'arm' ? (
                  <option key={i} value={String(i)}>
                    {h}
                  </option>
                ) : armLike.has(i) && i !== chosen ? null : (
                  <option key={i} value={String(i)}>
                    {columnLabel(i)}
                  </option>
                ),
              )}
            </Select>
          </Field>
        );
      })}
      <fieldset className={styles.fieldset}>
        <legend className={styles.legend}>Adjust the model for (covariates)</legend>
        {free.length === 0 ? (
          <p className={styles.none}>Every column already has a role.</p>
        ) : (
          free.map((i) => (
            <Checkbox
              key={i}
              label={suggestions.includes(i) ? `${columnLabel(i)} (suggested)` : columnLabel(i)}
              checked={mapping.covariates.includes(i)}
              onChange={(_, data) => onChange(toggleCovariate(mapping, i, data.checked === true))}
            />
          ))
        )}
      </fieldset>
    </div>
  );
}
