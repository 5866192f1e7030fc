// @vitest-environment jsdom
/**
 * Blinded mode in the pane (SPEC §2: in blinded mode no arm column is read), with a fake host whose data carry both a
 * planned (TRT01P) and an actual (TRT01A) arm column, as CDISC ADaM data sets often do. Every read of an arm cell below
 * the header is recorded, so the tests can say that a blinded pane never looked inside one.
 */
import './jsdomSetup';
import { afterEach, describe, expect, it } from 'vitest';
import { cleanup, fireEvent, render, screen, waitFor, within } from '@testing-library/react';
import { detectMapping } from '../../src/core/intake';
import type { CellValue } from '../../src/core/intake/types';
import type { AnalysisSettings } from '../../src/core/pipeline/types';
import { App } from '../../src/taskpane/App';
import type { DataSource, SavedSettings } from '../../src/taskpane/actions';
import { armLikeColumns, blindedConflicts, hiddenWhileBlinded } from '../../src/taskpane/blinding';
import type { PaneEngine } from '../../src/taskpane/engine';
import { fakeActions, okOutput } from './fakes';

afterEach(cleanup);

const HEADERS = ['USUBJID', 'SITEID', 'TRT01P', 'TRT01A', 'AVISIT', 'ADT', 'RANDDT', 'AVAL', 'AGE'];
const TRT01P = 2;
const TRT01A = 3;
const AGE = 8;

/** Invented rows (no real trial). The arm values are distinct words so a leak into the page is easy to spot. */
const ROWS: readonly (readonly CellValue[])[] = [
  ['K-001', 'S01', 'Placebo', 'Placebo-given', 'Baseline', '2026-01-05', '2026-01-05', '61.2', '54'],
  ['K-001', 'S01', 'Placebo', 'Placebo-given', 'Week 12', '2026-03-30', '2026-01-05', '59.8', '54'],
  ['K-002', 'S02', 'Active', 'Active-given', 'Baseline', '2026-01-07', '2026-01-07', '55.0', '61'],
  ['K-002', 'S02', 'Active', 'Active-given', 'Week 12', '2026-04-01', '2026-01-07', '', '61'],
];
const ARM_WORDS = /Placebo|Active/;

/** The data block with a getter on every arm cell below the header that records the read. */
function probedSource(): { source: DataSource; reads: string[] } {
  const reads: string[] = [];
  const rows = ROWS.map((values, r) => {
    const row = [...values];
    for (const c of [TRT01P, TRT01A]) {
      const value = values[c];
      Object.defineProperty(row, c, {
        enumerable: true,
        get: () => {
          reads.push(`${HEADERS[c] ?? ''} row ${r + 2}`);
          return value;
        },
      });
    }
    return row;
  });
  const source: DataSource = {
    label: 'Visits!A1:I5',
    sheet: 'Visits',
    topLeft: 'A1',
    dateSystem: 1900,
    cells: [HEADERS, ...rows],
  };
  return { source, reads };
}

function setup(saved: SavedSettings | null = null): { reads: string[]; calls: AnalysisSettings[] } {
  const { actions, spies } = fakeActions(saved);
  const { source, reads } = probedSource();
  spies.loadData.mockResolvedValue(source);
  const calls: AnalysisSettings[] = [];
  const engine: PaneEngine = {
    detectMapping,
    runAnalysis: async (_cells, settings) => {
      calls.push(settings);
      return okOutput();
    },
  };
  render(<App actions={actions} engine={engine} />);
  return { reads, calls };
}

const select = (label: RegExp): HTMLSelectElement => screen.getByLabelText(label, { selector: 'select' });
const optionTexts = (el: HTMLSelectElement): string[] => [...el.options].map((o) => o.textContent ?? '');
const covariates = (): HTMLElement => screen.getByRole('group', { name: /covariates/ });

async function loadData(): Promise<void> {
  fireEvent.click(screen.getByRole('button', { name: 'Use the selected cells' }));
  await screen.findByText(/Which column is which/);
}

async function unblind(): Promise<void> {
  fireEvent.click(screen.getByRole('radio', { name: /Unblinded/ }));
  fireEvent.click(await screen.findByRole('button', { name: /switch to unblinded/ }));
  await screen.findByLabelText(/Reference arm/, { selector: 'select' });
}

describe('blinding helpers', () => {
  it('armLikeColumns finds both the planned and the actual arm column (CDISC ADaM TRT01P, TRT01A)', () => {
    expect(armLikeColumns(HEADERS)).toEqual([TRT01P, TRT01A]);
  });

  it('hiddenWhileBlinded adds the mapped arm column even when its header does not name an arm', () => {
    expect(hiddenWhileBlinded(['USUBJID', 'Group', 'TRT01A'], { arm: 1, covariates: [] })).toEqual([1, 2]);
    expect(hiddenWhileBlinded(['USUBJID', 'AVAL'], null)).toEqual([]);
  });

  it('blindedConflicts names every arm-like column under a role other than the arm, and only those', () => {
    const mapping = { subject: 0, arm: TRT01P, site: TRT01A, covariates: [TRT01A, AGE] };
    expect(blindedConflicts(mapping, HEADERS)).toEqual([
      '"TRT01A" names a treatment arm, so it cannot be the site column while blinded.',
      '"TRT01A" names a treatment arm, so it cannot be a covariate while blinded.',
    ]);
    expect(blindedConflicts({ subject: 0, arm: TRT01P, covariates: [AGE] }, HEADERS)).toEqual([]);
  });
});

describe('a blinded pane with TRT01P and TRT01A columns', () => {
  it('the preview hides the values of every arm-like column, not only the mapped arm, and says which', async () => {
    setup();
    await loadData();
    const preview = screen.getByRole('region', { name: 'Preview of the first rows' });
    expect(within(preview).queryByText(ARM_WORDS)).toBeNull();
    expect(within(preview).getAllByText('hidden')).toHaveLength(2 * 4); // two arm columns, four rows
    expect(within(preview).getByText('TRT01A')).toBeTruthy(); // headers stay, so the user sees the column is there
    expect(within(preview).getAllByText('S01')).toHaveLength(2); // other columns are shown
    expect(screen.getByText(/not shown or used while blinded: TRT01P, TRT01A\./)).toBeTruthy();
  });

  it('arm-like columns are offered neither as covariates nor for any role but the arm; unblinded, they are', async () => {
    setup();
    await loadData();
    expect(within(covariates()).queryByText(/TRT01/)).toBeNull();
    expect(within(covariates()).getByText('AGE')).toBeTruthy();
    for (const label of [/^Participant$/, /^Visit date$/, /^Study day$/, /^Reference date$/, /^Visit name$/, /^Value$/, /^Site$/]) {
      expect(optionTexts(select(label)).filter((t) => /TRT01/.test(t)), String(label)).toEqual([]);
    }
    expect(optionTexts(select(/^Treatment arm/))).toContain('TRT01A'); // the arm role itself may still name it
    await unblind();
    expect(within(covariates()).getByText('TRT01A')).toBeTruthy();
    expect(optionTexts(select(/^Site$/))).toContain('TRT01A');
  });

  it('reads no arm cell from loading to the run, and unblinded mode does read the arms (the probe works)', async () => {
    const { reads, calls } = setup();
    await loadData();
    fireEvent.click(screen.getByRole('button', { name: 'Confirm columns' }));
    fireEvent.click(await screen.findByRole('button', { name: 'Use this schedule' }));
    await screen.findByRole('region', { name: 'Visit schedule' });
    fireEvent.click(screen.getByRole('button', { name: 'Run the analysis' }));
    await screen.findByText(/Sheets written/);
    expect(calls[0]?.mode).toBe('blinded');
    expect(calls[0]?.mapping?.arm).toBeUndefined();
    expect(reads).toEqual([]);
    expect(screen.queryByText(ARM_WORDS)).toBeNull();
    await unblind();
    expect(reads.length).toBeGreaterThan(0);
    expect(optionTexts(select(/Reference arm/))).toEqual(['Placebo', 'Active']);
  });

  it('an arm-like column remembered for another role is marked and blocks confirming until it is taken off', async () => {
    // The last run gave TRT01A the study-day role (detection leaves that role empty, so the remembered one fills it).
    setup({ mapping: { subject: 0, studyDay: TRT01A, covariates: [] }, settings: { timeUnit: 'week' } });
    await waitFor(() => expect(select(/Time unit/).value).toBe('week')); // the remembered settings have arrived
    await loadData();
    expect(select(/^Study day$/).selectedOptions[0]?.textContent).toBe('TRT01A (names an arm: not allowed while blinded)');
    expect(screen.getByText('"TRT01A" names a treatment arm, so it cannot be the study day column while blinded.')).toBeTruthy();
    expect(screen.getByRole('button', { name: 'Confirm columns' })).toHaveProperty('disabled', true);
    fireEvent.change(select(/^Study day$/), { target: { value: '' } });
    expect(screen.getByRole('button', { name: 'Confirm columns' })).toHaveProperty('disabled', false);
  });

  it('a covariate chosen while unblinded that names an arm blocks a blinded run, with the reason', async () => {
    const { calls } = setup();
    await loadData();
    await unblind();
    fireEvent.click(within(covariates()).getByRole('checkbox', { name: 'TRT01A' }));
    fireEvent.click(screen.getByRole('button', { name: 'Confirm columns' }));
    fireEvent.click(await screen.findByRole('button', { name: 'Use this schedule' }));
    await screen.findByRole('region', { name: 'Visit schedule' });
    fireEvent.click(screen.getByRole('radio', { name: /Blinded/ }));
    expect(
      await screen.findByText(
        '"TRT01A" names a treatment arm, so it cannot be a covariate while blinded. Change the columns (step 1).',
      ),
    ).toBeTruthy();
    expect(screen.getByRole('button', { name: 'Run the analysis' })).toHaveProperty('disabled', true);
    expect(calls).toEqual([]);
  });
});
