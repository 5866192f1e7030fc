/** The settings the pane edits, their defaults, what is remembered, and the run settings they produce. */
import type { ColumnMapping, DateOrder } from '../core/intake/types';
import type { AnalysisSettings, ModelKind } from '../core/pipeline/types';
import type { ScheduleVisit } from '../core/schedule/types';
import type { DataSource, SavedSettings } from './actions';
import { withoutArm } from './mapping';

/** The run settings the pane edits, taken from the core's AnalysisSettings, with the two optional ones made plain text. */
export interface PaneSettings
  extends Pick<AnalysisSettings, 'mode' | 'timeUnit' | 'dfMethod' | 'method' | 'level' | 'scheduledOnly' | 'perSubject'> {
  /** '' means the first arm in the data. */
  readonly referenceArm: string;
  /** ISO date; '' means the latest date in the data. */
  readonly cutoff: string;
  /** Cut-off as a study day, for data with study days and no dates: whole number text; '' means each participant's
   * own last record. */
  readonly cutoffDay: string;
  /** How dates like 03/04/2025 are read; '' means each date column decides from its values. */
  readonly dateOrder: DateOrder | '';
  /** The main model; the pane offers the models available now. */
  readonly model: PaneModel;
  /** For the yes/no model: yes when the value is below this number (text; '' means a mapped yes/no column). */
  readonly responderBelow: string;
}

/** The models the pane offers. */
export type PaneModel = ModelKind;
export const PANE_MODELS: readonly PaneModel[] = ['intercept', 'slope', 'repeated', 'gee', 'logistic'];

/** Blinded by default (SPEC §2); REML with Kenward–Roger and 95% intervals (SPEC §5). */
export const DEFAULT_SETTINGS: PaneSettings = {
  mode: 'blinded',
  referenceArm: '',
  cutoff: '',
  cutoffDay: '',
  dateOrder: '',
  timeUnit: 'month',
  dfMethod: 'kenward-roger',
  method: 'reml',
  model: 'intercept',
  level: 0.95,
  scheduledOnly: false,
  perSubject: false,
  responderBelow: '',
};

const ISO_DATE = /^\d{4}-\d{2}-\d{2}$/;

/** True when `text` is a real calendar date written YYYY-MM-DD. */
export function isIsoDate(text: string): boolean {
  if (!ISO_DATE.test(text)) return false;
  const d = new Date(`${text}T00:00:00Z`);
  return !Number.isNaN(d.getTime()) && d.toISOString().slice(0, 10) === text;
}

/** True when `text` is a study day usable as a cut-off: a whole number other than 0 (CDISC: there is no day 0). */
export function isCutoffDay(text: string): boolean {
  return /^\s*[+-]?\d{1,5}\s*$/.test(text) && Number(text) !== 0;
}

/** True when `text` is a finite number (the yes/no threshold). */
export function isThreshold(text: string): boolean {
  return text.trim() !== '' && Number.isFinite(Number(text));
}

/** True when `level` is a usable confidence level (strictly between 0.5 and 1). */
export function isLevel(level: number): boolean {
  return Number.isFinite(level) && level > 0.5 && level < 1;
}

/**
 * Restores remembered settings over the defaults. The mode is never restored: every session starts blinded,
 * so nobody sees arms because a colleague looked last time.
 */
export function fromSaved(saved: SavedSettings | null): PaneSettings {
  const s = saved?.settings ?? {};
  return {
    ...DEFAULT_SETTINGS,
    ...(s.referenceArm !== undefined ? { referenceArm: s.referenceArm } : {}),
    ...(s.cutoff !== undefined && isIsoDate(s.cutoff) ? { cutoff: s.cutoff } : {}),
    ...(s.timeUnit !== undefined ? { timeUnit: s.timeUnit } : {}),
    ...(s.dfMethod !== undefined ? { dfMethod: s.dfMethod } : {}),
    ...(s.method !== undefined ? { method: s.method } : {}),
    ...(s.model !== undefined && (PANE_MODELS as readonly string[]).includes(s.model) ? { model: s.model as PaneModel } : {}),
    ...(s.level !== undefined && isLevel(s.level) ? { level: s.level } : {}),
  };
}

/** What the pane asks the host to remember after a run. */
export function toSaved(settings: PaneSettings, mapping: ColumnMapping, scheduleSource: string | null): SavedSettings {
  return {
    mapping,
    ...(scheduleSource !== null ? { scheduleSource } : {}),
    settings: {
      mode: settings.mode,
      timeUnit: settings.timeUnit,
      dfMethod: settings.dfMethod,
      method: settings.method,
      model: settings.model,
      level: settings.level,
      ...(settings.referenceArm !== '' ? { referenceArm: settings.referenceArm } : {}),
      ...(settings.cutoff !== '' ? { cutoff: settings.cutoff } : {}),
    },
  };
}

/** The full settings of one run. In blinded mode the arm column is dropped from the mapping. */
export function toAnalysisSettings(
  source: DataSource,
  mapping: ColumnMapping,
  schedule: readonly ScheduleVisit[],
  settings: PaneSettings,
  runAt: string,
): AnalysisSettings {
  const blinded = settings.mode === 'blinded';
  return {
    sheet: source.sheet,
    topLeft: source.topLeft,
    dateSystem: source.dateSystem,
    mode: settings.mode,
    mapping: blinded ? withoutArm(mapping) : mapping,
    schedule,
    timeUnit: settings.timeUnit,
    dfMethod: settings.dfMethod,
    method: settings.method,
    model: settings.model,
    level: settings.level,
    scheduledOnly: settings.scheduledOnly,
    perSubject: settings.perSubject,
    inputLabel: source.label,
    ...(source.fileNotes !== undefined && source.fileNotes.length > 0 ? { fileNotes: source.fileNotes } : {}),
    runAt,
    ...(source.numericText !== undefined ? { numericText: source.numericText } : {}),
    ...(settings.cutoff !== '' ? { cutoff: settings.cutoff } : {}),
    ...(settings.cutoffDay !== '' && isCutoffDay(settings.cutoffDay) ? { cutoffDay: Number(settings.cutoffDay) } : {}),
    ...(settings.dateOrder !== '' ? { dateOrder: settings.dateOrder } : {}),
    ...(!blinded && settings.referenceArm !== '' ? { referenceArm: settings.referenceArm } : {}),
    ...(settings.model === 'logistic' && isThreshold(settings.responderBelow) ? { responder: { below: Number(settings.responderBelow) } } : {}),
  };
}
