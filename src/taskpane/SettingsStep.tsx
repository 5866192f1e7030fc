/** Step 3: cut-off date, blinded or unblinded, reference arm, order of day and month in dates, time unit, degrees of freedom, method, confidence level. */
import type { ReactNode } from 'react';
import { useEffect, useId, useRef, useState } from 'react';
import {
  Checkbox,
  Field,
  Input,
  Radio,
  RadioGroup,
  Select,
  Text,
  makeStyles,
  tokens,
} from '@fluentui/react-components';
import type { DateOrder } from '../core/intake/types';
import { DAYS_PER_UNIT, type DfMethod, type FitMethod, type TimeUnit } from '../core/pipeline/types';
import { isCutoffDay, isIsoDate, isLevel, isThreshold, type PaneModel, type PaneSettings } from './paneSettings';
import { UnblindDialog } from './UnblindDialog';
import { stackStyle } from './paneStyles';

const useStyles = makeStyles({
  col: stackStyle,
  unblinded: { color: tokens.colorPaletteRedForeground1, fontWeight: tokens.fontWeightSemibold },
});

const TIME_UNITS: readonly { value: TimeUnit; label: string }[] = [
  { value: 'month', label: `Months (${DAYS_PER_UNIT.month} days)` },
  { value: 'week', label: 'Weeks' },
  { value: 'day', label: 'Days' },
];
const DATE_ORDERS: readonly { value: DateOrder | ''; label: string }[] = [
  { value: '', label: 'Decide from the data (default)' },
  { value: 'dmy', label: 'Day first: 03/04/2025 is 3 April' },
  { value: 'mdy', label: 'Month first: 03/04/2025 is 4 March' },
];
const DF_METHODS: readonly { value: DfMethod; label: string }[] = [
  { value: 'kenward-roger', label: 'Kenward–Roger (recommended)' },
  { value: 'satterthwaite', label: 'Satterthwaite' },
  { value: 'residual', label: 'Residual (liberal for arm differences)' },
  { value: 'containment', label: 'Between/within (containment)' },
];
const MODELS: readonly { value: PaneModel; label: string }[] = [
  { value: 'intercept', label: 'Random intercept' },
  { value: 'slope', label: 'Random intercept and slope' },
  { value: 'repeated', label: 'Also visit by visit' },
  { value: 'gee', label: 'GEE (marginal)' },
  { value: 'logistic', label: 'Yes/no answer' },
];
const FIT_METHODS: readonly { value: FitMethod; label: string }[] = [
  { value: 'reml', label: 'REML (recommended)' },
  { value: 'ml', label: 'Maximum likelihood (ML)' },
];


export interface SettingsStepProps {
  readonly settings: PaneSettings;
  /** The arms found in the mapped arm column (empty when none is mapped). */
  readonly arms: readonly string[];
  readonly onChange: (settings: PaneSettings) => void;
}

export function SettingsStep({ settings, arms, onChange }: SettingsStepProps): ReactNode {
  const styles = useStyles();
  const [asking, setAsking] = useState(false);
  const [levelText, setLevelText] = useState(String(Math.round(settings.level * 1000) / 10));
  const set = (patch: Partial<PaneSettings>): void => onChange({ ...settings, ...patch });
  // When the unblinding question closes, keyboard focus goes back to the chosen mode instead of the page's top.
  const modesId = useId();
  const wasAsking = useRef(false);
  useEffect(() => {
    if (wasAsking.current && !asking) {
      document.getElementById(modesId)?.querySelector<HTMLInputElement>('input:checked')?.focus();
    }
    wasAsking.current = asking;
  }, [asking, settings.mode, modesId]);
  const levelNumber = Number(levelText) / 100;
  const cutoffOk = settings.cutoff === '' || isIsoDate(settings.cutoff);
  // While the cut-off is being typed, a half-written date is not called wrong; once it is ten characters long or
  // the field is left, it is.
  const [typingCutoff, setTypingCutoff] = useState(false);
  const showCutoffError = !cutoffOk && (!typingCutoff || settings.cutoff.length >= 10);
  const cutoffDayOk = settings.cutoffDay === '' || isCutoffDay(settings.cutoffDay);
  return (
    <div className={styles.col}>
      <Field label="Who may see the results">
        <RadioGroup
          id={modesId}
          value={settings.mode}
          onChange={(_, data) => {
            if (data.value === 'unblinded') setAsking(true);
            else set({ mode: 'blinded' });
          }}
        >
          <Radio value="blinded" label="Blinded: pooled results, no arms (default)" />
          <Radio value="unblinded" label="Unblinded: results by treatment arm" />
        </RadioGroup>
      </Field>
      {settings.mode === 'unblinded' && (
        <Text className={styles.unblinded}>Unblinded mode is on. Results show treatment arms.</Text>
      )}
      <UnblindDialog
        open={asking}
        onConfirm={() => {
          setAsking(false);
          set({ mode: 'unblinded' });
        }}
        onCancel={() => setAsking(false)}
      />
      {settings.mode === 'unblinded' && (
        <Field
          label="Reference arm (compared against)"
          {...(arms.length === 0
            ? { hint: 'Choose the treatment-arm column in step 1 first.', validationState: 'error' as const }
            : {})}
        >
          <Select
            value={
              settings.referenceArm !== '' && arms.includes(settings.referenceArm)
                ? settings.referenceArm
                : (arms[0] ?? '')
            }
            onChange={(_, d) => set({ referenceArm: d.value })}
          >
            {arms.map((a) => (
              <option key={a} value={a}>
                {a}
              </option>
            ))}
          </Select>
        </Field>
      )}
      {/* Plain text written year-month-day (ISO 8601), like every other date the pane shows; the browser's date
          widget would show the date in the computer's local order instead. */}
      <Field
        label="Data cut-off date"
        hint="Written year-month-day, like 2026-06-30. Leave empty to use the latest visit date in the data."
        {...(showCutoffError
          ? { validationState: 'error' as const, validationMessage: 'Not a calendar date written year-month-day: use a date like 2026-06-30.' }
          : {})}
      >
        <Input
          type="text"
          placeholder="YYYY-MM-DD"
          maxLength={10}
          autoComplete="off"
          spellCheck={false}
          value={settings.cutoff}
          onFocus={() => setTypingCutoff(true)}
          onBlur={() => setTypingCutoff(false)}
          onChange={(_, d) => set({ cutoff: d.value.trim() })}
        />
      </Field>
      <Field
        label="Data cut-off study day"
        hint="Only for data with study days and no dates. Leave empty to use each participant's own last record."
        {...(cutoffDayOk ? {} : { validationState: 'error' as const, validationMessage: 'Use a whole study day such as 365 (there is no day 0).' })}
      >
        <Input inputMode="numeric" value={settings.cutoffDay} onChange={(_, d) => set({ cutoffDay: d.value })} />
      </Field>
      <Field
        label="Order of day and month"
        hint="For dates written like 03/04/2025. By default each date column decides from values that can be read only one way, such as 13/04/2025."
      >
        <Select value={settings.dateOrder} onChange={(_, d) => set({ dateOrder: d.value as DateOrder | '' })}>
          {DATE_ORDERS.map((o) => (
            <option key={o.value} value={o.value}>
              {o.label}
            </option>
          ))}
        </Select>
      </Field>
      <Field label="Time unit for slopes">
        <Select value={settings.timeUnit} onChange={(_, d) => set({ timeUnit: d.value as TimeUnit })}>
          {TIME_UNITS.map((o) => (
            <option key={o.value} value={o.value}>
              {o.label}
            </option>
          ))}
        </Select>
      </Field>
      <Field label="Degrees of freedom">
        <Select value={settings.dfMethod} onChange={(_, d) => set({ dfMethod: d.value as DfMethod })}>
          {DF_METHODS.map((o) => (
            <option key={o.value} value={o.value}>
              {o.label}
            </option>
          ))}
        </Select>
      </Field>
      <Field label="Model" hint="With a random slope, participants may differ in their rate of change as well as their level; the random-intercept and the slope model are both fitted and compared, the chosen one is reported in full. Visit by visit: each visit has its own mean and any correlation between visits. GEE: the average change, robust to the correlation. Yes/no: the chance of a yes answer.">
        <Select value={settings.model} onChange={(_, d) => set({ model: d.value as PaneModel })}>
          {MODELS.map((o) => (
            <option key={o.value} value={o.value}>
              {o.label}
            </option>
          ))}
        </Select>
      </Field>
      <Field label="Estimation method">
        <Select
          value={settings.method}
          // The usual degrees of freedom follow the method: Kenward–Roger with REML, Satterthwaite with ML.
          onChange={(_, d) => set({ method: d.value as FitMethod, dfMethod: d.value === 'ml' ? 'satterthwaite' : 'kenward-roger' })}
        >
          {FIT_METHODS.map((o) => (
            <option key={o.value} value={o.value}>
              {o.label}
            </option>
          ))}
        </Select>
      </Field>
      <Field
        label="Confidence level (%)"
        {...(isLevel(levelNumber)
          ? {}
          : { validationState: 'error' as const, validationMessage: 'Give a number between 50 and 100, e.g. 95.' })}
      >
        <Input
          type="number"
          min={50}
          max={99.9}
          step={0.5}
          value={levelText}
          onChange={(_, d) => {
            setLevelText(d.value);
            set({ level: d.value.trim() === '' ? Number.NaN : Number(d.value) / 100 });
          }}
        />
      </Field>
      {settings.model === 'logistic' && (
        <Field
          label="Yes when the value is below"
          hint="Empty: a 0/1 yes/no column."
          {...(settings.responderBelow.trim() === '' || isThreshold(settings.responderBelow)
            ? {}
            : { validationState: 'error' as const, validationMessage: 'Give a number, e.g. 45.' })}
        >
          <Input value={settings.responderBelow} onChange={(_, d) => set({ responderBelow: d.value })} />
        </Field>
      )}
      <Checkbox
        label="Use only records matched to a scheduled visit in the model"
        checked={settings.scheduledOnly}
        onChange={(_, d) => set({ scheduledOnly: d.checked === true })}
      />
      <Checkbox
        label="Add a sheet with each participant's estimated intercept"
        checked={settings.perSubject}
        onChange={(_, d) => set({ perSubject: d.checked === true })}
      />
    </div>
  );
}
