/** A fake host for the pane tests: records every call, serves a small invented kidney-function data block. */
import { vi } from 'vitest';
import type { CellValue } from '../../src/core/intake/types';
import type { AnalysisOutput } from '../../src/core/pipeline/types';
import type { ScheduleVisit } from '../../src/core/schedule/types';
import type { DataSource, PaneActions, SavedSettings, WrittenSheet } from '../../src/taskpane/actions';

/** Invented rows in the demo's shape (CDISC ADaM names; invented values, no real trial). */
export const CELLS: readonly (readonly CellValue[])[] = [
  ['USUBJID', 'SITEID', 'TRT01P', 'AVISIT', 'ADT', 'RANDDT', 'AVAL'],
  ['K-001', 'S01', 'Placebo', 'Baseline', '2026-01-05', '2026-01-05', '61.2'],
  ['K-001', 'S01', 'Placebo', 'Week 12', '2026-03-30', '2026-01-05', '59.8'],
  ['K-002', 'S02', 'Active', 'Baseline', '2026-01-07', '2026-01-07', '55.0'],
  ['K-002', 'S02', 'Active', 'Week 12', '2026-04-01', '2026-01-07', ''],
];

export const SCHEDULE: readonly ScheduleVisit[] = [
  { label: 'Baseline', targetDay: 1, before: 0, after: 0 },
  { label: 'Week 12', targetDay: 85, before: 7, after: 7 },
];

export const SOURCE: DataSource = {
  label: 'Visits!A1:G5',
  sheet: 'Visits',
  topLeft: 'A1',
  dateSystem: 1900,
  cells: CELLS,
};

export const WRITTEN: readonly WrittenSheet[] = [
  { name: 'Visit timing', title: 'Visit timing against the schedule' },
  { name: 'Model', title: 'Mixed model' },
];

export type FakeActions = PaneActions & { [K in keyof PaneActions]: PaneActions[K] };

export function fakeActions(saved: SavedSettings | null = null): {
  actions: PaneActions;
  spies: {
    loadData: ReturnType<typeof vi.fn>;
    loadSchedule: ReturnType<typeof vi.fn>;
    writeResults: ReturnType<typeof vi.fn>;
    showSheet: ReturnType<typeof vi.fn>;
    selectCell: ReturnType<typeof vi.fn>;
    save: ReturnType<typeof vi.fn>;
  };
} {
  const spies = {
    loadData: vi.fn(async () => SOURCE),
    loadSchedule: vi.fn(async () => ({ ok: true as const, schedule: SCHEDULE })),
    writeResults: vi.fn(async () => WRITTEN),
    showSheet: vi.fn(async () => undefined),
    selectCell: vi.fn(async () => undefined),
    save: vi.fn(async () => undefined),
  };
  const actions: PaneActions = {
    sourceKinds: ['selection', 'usedRange'],
    loadData: spies.loadData,
    listScheduleSources: async () => [{ name: 'Schedule' }],
    loadSchedule: spies.loadSchedule,
    createStarterSchedule: async () => 'Schedule (2)',
    writeResults: spies.writeResults,
    showSheet: spies.showSheet,
    selectCell: spies.selectCell,
    loadSaved: async () => saved,
    save: spies.save,
  };
  return { actions, spies };
}

/** A finished run's output with one warning at a known cell. */
export function okOutput(): Extract<AnalysisOutput, { ok: true }> {
  return {
    ok: true,
    issues: [
      {
        code: 'blank-value',
        severity: 'warning',
        cell: 'Visits!G5',
        row: 5,
        role: 'value',
        value: '',
        use: 'model',
        message: 'The value is blank; the row is left out of the model.',
      },
    ],
    excluded: [{ row: 5, cell: 'Visits!G5', use: 'model', reason: 'blank value' }],
    sheets: [
      { name: 'Visit timing', title: 'Visit timing against the schedule', blocks: [] },
      {
        name: 'Model',
        title: 'Mixed model',
        blocks: [{ kind: 'paragraph', text: 'eGFR fell by 0.4 per month on average.' }],
      },
    ],
    json: {},
  };
}
