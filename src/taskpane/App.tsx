/**
 * The task pane: five steps from data to results. It holds the pane's state and calls the host only through
 * `actions`; every step is a separate component that takes data and callbacks.
 */
import type { ReactNode } from 'react';
import { useCallback, useEffect, useMemo, useRef, useState } from 'react';
import {
  FluentProvider,
  MessageBar,
  MessageBarBody,
  Text,
  makeStyles,
  tokens,
  webLightTheme,
} from '@fluentui/react-components';
import type { ColumnMapping, DetectedMapping } from '../core/intake/types';
import type { Stage } from '../core/pipeline/types';
import type { DataSource, PaneActions, SavedSettings, ScheduleLoad, ScheduleSource } from './actions';
import { blindedConflicts } from './blinding';
import { distinctValues, headersOf } from './cells';
import { DataStep, mappingGaps } from './DataStep';
import { CORE_ENGINE, type PaneEngine } from './engine';
import { headlineOf, stoppedStatus } from './headline';
import { fillGaps } from './mapping';
import type { RunOutcome } from './outcome';
import { fromSaved, isCutoffDay, isIsoDate, isLevel, toAnalysisSettings, toSaved, type PaneSettings } from './paneSettings';
import { ResultsStep } from './ResultsStep';
import { RunStep, STAGE_WORDS } from './RunStep';
import { ScheduleStep } from './ScheduleStep';
import { SettingsStep } from './SettingsStep';
import type { SourceKind } from './SourcePicker';
import { StepSection } from './StepSection';
import { PANE_VERSION } from './version';
import { isoWithOffset } from '../core/report/runTime';

/** The run time as ISO 8601 with the browser's UTC offset at that moment (results JSON settings.runAt). */
const localRunAt = (d: Date): string => isoWithOffset(d.getTime(), Math.round(-d.getTimezoneOffset()));

const useStyles = makeStyles({
  root: {
    padding: `${tokens.spacingVerticalM} ${tokens.spacingHorizontalM}`,
    boxSizing: 'border-box',
    width: '100%',
    minHeight: '100%',
  },
  title: { margin: 0, fontSize: tokens.fontSizeBase500, fontWeight: tokens.fontWeightSemibold },
  status: { margin: 0, minHeight: '1.2em', fontSize: tokens.fontSizeBase200, color: tokens.colorBrandForeground1 },
  intro: {
    margin: `${tokens.spacingVerticalXS} 0 ${tokens.spacingVerticalS} 0`,
    color: tokens.colorNeutralForeground2,
  },
});

export interface AppProps {
  readonly actions: PaneActions;
  /** The core functions; tests may pass stand-ins. */
  readonly engine?: PaneEngine;
}

const messageOf = (e: unknown): string => (e instanceof Error ? e.message : String(e));
/**
 * Lets React render the stage just announced (so the status region says it) before the next stage starts: the next
 * painted frame, then a macrotask. A bare setTimeout(0) let React fold two quick stages into one render, so a stage
 * was never announced. A hidden pane paints no frames, hence the 50 ms fallback.
 */
const nextTick = (): Promise<void> =>
  new Promise((resolve) => {
    let done = false;
    const finish = (): void => {
      if (done) return;
      done = true;
      setTimeout(resolve, 0);
    };
    if (typeof requestAnimationFrame === 'function') requestAnimationFrame(finish);
    setTimeout(finish, 50);
  });

export function App({ actions, engine = CORE_ENGINE }: AppProps): ReactNode {
  const styles = useStyles();
  const [saved, setSaved] = useState<SavedSettings | null>(null);
  const [settings, setSettings] = useState<PaneSettings>(() => fromSaved(null));
  const [status, setStatus] = useState('');

  const [loading, setLoading] = useState<number | null>(null);
  const [dataError, setDataError] = useState<string | null>(null);
  const [source, setSource] = useState<DataSource | null>(null);
  const [headers, setHeaders] = useState<readonly string[]>([]);
  const [reasons, setReasons] = useState<DetectedMapping['reasons']>({});
  const [suggestions, setSuggestions] = useState<readonly number[]>([]);
  const [notes, setNotes] = useState<readonly string[]>([]);
  const [mapping, setMapping] = useState<ColumnMapping | null>(null);
  const [confirmed, setConfirmed] = useState(false);

  const [scheduleSources, setScheduleSources] = useState<readonly ScheduleSource[]>([]);
  const [scheduleBusy, setScheduleBusy] = useState(false);
  const [scheduleName, setScheduleName] = useState<string | null>(null);
  const [scheduleResult, setScheduleResult] = useState<ScheduleLoad | null>(null);

  const [stage, setStage] = useState<Stage | null>(null);
  const [cancelling, setCancelling] = useState(false);
  /** How far the writing stage has got (0 to 1), from the host's progress reports. */
  const [writeFraction, setWriteFraction] = useState(0);
  const [outcome, setOutcome] = useState<RunOutcome | null>(null);
  /** What the shown results were computed from, to say when the choices have changed since. */
  const [ranWith, setRanWith] = useState<string | null>(null);
  const controller = useRef<AbortController | null>(null);

  const refreshSources = useCallback(async (): Promise<void> => {
    try {
      setScheduleSources(await actions.listScheduleSources());
    } catch (e) {
      setStatus(`Could not list the schedules: ${messageOf(e)}`);
    }
  }, [actions]);

  useEffect(() => {
    let live = true;
    actions
      .loadSaved()
      .then((s) => {
        if (!live) return;
        setSaved(s);
        setSettings(fromSaved(s));
        if (s?.scheduleSource !== undefined) setScheduleName(s.scheduleSource);
      })
      .catch((e: unknown) => live && setStatus(`Remembered settings could not be read: ${messageOf(e)}`));
    void refreshSources();
    return () => {
      live = false;
    };
  }, [actions, refreshSources]);

  const onPick = async (kind: SourceKind, file?: File): Promise<void> => {
    setLoading(0);
    setDataError(null);
    setStatus('Reading the data…');
    try {
      const src = await actions.loadData(kind, file, (f) => setLoading(f));
      const hs = headersOf(src.cells);
      const detected = engine.detectMapping(hs, 'unblinded');
      setSource(src);
      setHeaders(hs);
      setReasons(detected.reasons);
      setSuggestions(detected.covariateSuggestions ?? []);
      setNotes(detected.notes ?? []);
      setMapping(fillGaps(detected.mapping, saved?.mapping, hs.length));
      setConfirmed(false);
      setOutcome(null);
      setStatus(
        `Read ${src.label}: ${Math.max(0, src.cells.length - 1)} rows. Check the proposed columns and confirm them.`,
      );
    } catch (e) {
      setDataError(`The data could not be read: ${messageOf(e)}`);
      setStatus('The data could not be read.');
    } finally {
      setLoading(null);
    }
  };

  const loadSchedule = async (name: string, file?: File): Promise<void> => {
    setScheduleBusy(true);
    try {
      const result = await actions.loadSchedule(name, file);
      setScheduleName(name);
      setScheduleResult(result);
      setStatus(
        result.ok
          ? `Schedule ${name}: ${result.schedule.length} scheduled visits.`
          : `Schedule ${name} has a problem: ${result.message}`,
      );
    } catch (e) {
      setScheduleName(name);
      setScheduleResult({ ok: false, message: `The schedule could not be read: ${messageOf(e)}` });
    } finally {
      setScheduleBusy(false);
    }
    await refreshSources();
  };

  const onStarter = async (): Promise<void> => {
    setScheduleBusy(true);
    let name: string;
    try {
      name = await actions.createStarterSchedule();
    } catch (e) {
      setScheduleResult({ ok: false, message: `The starter schedule could not be written: ${messageOf(e)}` });
      setScheduleBusy(false);
      return;
    }
    setScheduleBusy(false);
    await loadSchedule(name);
  };

  const blinded = settings.mode === 'blinded';
  // The arm values are read only in unblinded mode (SPEC §2): a blinded pane never looks inside an arm column.
  const arms = useMemo(
    () => (!blinded && source && mapping?.arm !== undefined ? distinctValues(source.cells, mapping.arm) : []),
    [blinded, source, mapping],
  );

  const blockers: string[] = [];
  if (!source || !mapping) blockers.push('Read the visit data first (step 1).');
  else if (!confirmed) blockers.push('Confirm the columns (step 1).');
  else if (blinded) blockers.push(...blindedConflicts(mapping, headers).map((c) => `${c} Change the columns (step 1).`));
  if (!scheduleResult?.ok) blockers.push('Choose a visit schedule (step 2).');
  if (settings.cutoff !== '' && !isIsoDate(settings.cutoff))
    blockers.push('The cut-off date is not a valid date (step 3).');
  if (settings.cutoffDay !== '' && !isCutoffDay(settings.cutoffDay))
    blockers.push('The cut-off study day must be a whole number other than 0 (step 3).');
  if (!isLevel(settings.level)) blockers.push('The confidence level must lie between 50% and 100% (step 3).');
  if (settings.mode === 'unblinded' && mapping && mapping.arm === undefined) {
    blockers.push('Unblinded mode needs the treatment-arm column (step 1), or switch back to blinded.');
  }

  const runKey = (): string => JSON.stringify([source?.label, mapping, scheduleName, scheduleResult, settings]);

  const onRun = async (): Promise<void> => {
    if (!source || !mapping || !scheduleResult?.ok || blockers.length > 0) return;
    const ctl = new AbortController();
    controller.current = ctl;
    setOutcome(null);
    setCancelling(false);
    setStage('reading');
    setStatus(`${STAGE_WORDS.reading}…`);
    const onStage = (s: Stage): void => {
      setStage(s);
      setStatus(`${STAGE_WORDS[s]}…`);
    };
    const ranKey = runKey();
    const effective: PaneSettings =
      settings.mode === 'unblinded' && !arms.includes(settings.referenceArm)
        ? { ...settings, referenceArm: arms[0] ?? '' }
        : settings;
    try {
      const run = {
        ...toAnalysisSettings(source, mapping, scheduleResult.schedule, effective, localRunAt(new Date())),
        toolVersion: PANE_VERSION,
      };
      const output = await engine.runAnalysis(source.cells, run, {
        onStage,
        signal: ctl.signal,
        yieldControl: nextTick,
      });
      if (ctl.signal.aborted || (!output.ok && output.cancelled === true)) {
        setOutcome({ kind: 'cancelled' });
        setStatus('The run was stopped. Nothing was written.');
      } else if (!output.ok) {
        setOutcome({ kind: 'blocked', issues: output.issues });
        setStatus(stoppedStatus(output.issues));
      } else {
        onStage('writing');
        setWriteFraction(0);
        const written = await actions.writeResults(output, (f) => setWriteFraction(f));
        setOutcome({
          kind: 'done',
          written,
          headline: headlineOf(output, Math.max(0, source.cells.length - 1)),
          issues: output.issues,
        });
        setStatus(`Finished: ${written.length} result sheets written.`);
        setRanWith(ranKey);
        actions.save(toSaved(effective, mapping, scheduleName)).catch((e: unknown) => {
          setStatus(`Finished, but the settings could not be remembered: ${messageOf(e)}`);
        });
      }
    } catch (e) {
      setOutcome({ kind: 'failed', message: messageOf(e) });
      setStatus(`The run failed: ${messageOf(e)}`);
    } finally {
      controller.current = null;
      setStage(null);
      setCancelling(false);
    }
  };

  // Confirming the columns removes the button that had focus, and so does "Change columns": send keyboard focus on
  // to the next step's heading, or to the first column choice, instead of letting it fall to the top of the page.
  const focusAfterConfirm = useRef<'next' | 'columns' | null>(null);
  useEffect(() => {
    const target = focusAfterConfirm.current;
    focusAfterConfirm.current = null;
    if (target === 'next') document.getElementById('step-schedule-title')?.focus();
    if (target === 'columns') document.querySelector<HTMLElement>('#step-data select')?.focus();
  }, [confirmed]);

  // When a run ends, take keyboard focus to the results so the next Tab lands on them.
  useEffect(() => {
    if (outcome !== null) document.getElementById('step-results-title')?.focus();
  }, [outcome]);

  const onCancel = (): void => {
    controller.current?.abort();
    setCancelling(true);
    setStatus('Stopping the run…');
  };

  const report = (p: Promise<void>, what: string): void => {
    p.catch((e: unknown) => setStatus(`Could not ${what}: ${messageOf(e)}`));
  };

  return (
    <FluentProvider theme={webLightTheme} className={styles.root}>
      <main aria-label="Longipane">
        <h1 className={styles.title}>Longipane</h1>
        <Text as="p" className={styles.intro}>
          Check visit timing against the schedule and look at the trend over time with a mixed model. Everything stays
          on this computer.
        </Text>
        <p role="status" aria-live="polite" className={styles.status}>
          {status}
        </p>
        <StepSection number={1} id="step-data" title="Visit data" state={confirmed ? 'done' : 'open'}>
          <DataStep
            kinds={actions.sourceKinds}
            loading={loading}
            error={dataError}
            source={source}
            headers={headers}
            mapping={mapping}
            reasons={reasons}
            blinded={blinded}
            suggestions={suggestions}
            notes={notes}
            confirmed={confirmed}
            onPick={(kind, file) => void onPick(kind, file)}
            onMappingChange={(m) => {
              setMapping(m);
              setConfirmed(false);
            }}
            onEdit={() => {
              focusAfterConfirm.current = 'columns';
              setConfirmed(false);
            }}
            onConfirm={() => {
              if (mapping && mappingGaps(mapping, blinded, headers).length === 0) {
                focusAfterConfirm.current = 'next';
                setConfirmed(true);
                setStatus('Columns confirmed.');
              }
            }}
          />
        </StepSection>
        <StepSection number={2} id="step-schedule" title="Visit schedule" state={scheduleResult?.ok ? 'done' : 'open'}>
          <ScheduleStep
            sources={scheduleSources}
            allowFile={actions.sourceKinds.includes('file')}
            busy={scheduleBusy}
            current={scheduleName}
            result={scheduleResult}
            onLoad={(name) => void loadSchedule(name)}
            onFile={(file) => void loadSchedule(file.name, file)}
            onStarter={() => void onStarter()}
          />
        </StepSection>
        <StepSection number={3} id="step-settings" title="Settings" state="open">
          <SettingsStep settings={settings} arms={arms} onChange={setSettings} />
        </StepSection>
        <StepSection number={4} id="step-run" title="Run" state={outcome?.kind === 'done' ? 'done' : 'open'}>
          <RunStep
            blockers={blockers}
            stage={stage}
            stageFraction={stage === 'writing' ? writeFraction : null}
            cancelling={cancelling}
            onRun={() => void onRun()}
            onCancel={onCancel}
          />
        </StepSection>
        <StepSection
          number={5}
          id="step-results"
          title="Results"
          state={outcome === null ? 'locked' : 'open'}
          lockedText="Results appear here after a run."
        >
          {outcome?.kind === 'done' && ranWith !== null && ranWith !== runKey() && (
            <MessageBar intent="warning">
              <MessageBarBody>
                The choices above have changed since this run. Run again to update the results.
              </MessageBarBody>
            </MessageBar>
          )}
          {outcome && (
            <ResultsStep
              outcome={outcome}
              onShowSheet={(name) => report(actions.showSheet(name), `show the sheet ${name}`)}
              onSelectCell={(address) => report(actions.selectCell(address), `go to ${address}`)}
            />
          )}
        </StepSection>
      </main>
    </FluentProvider>
  );
}
