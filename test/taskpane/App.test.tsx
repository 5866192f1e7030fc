// @vitest-environment jsdom
import './jsdomSetup';
import { afterEach, describe, expect, it, vi } from 'vitest';
import { act, cleanup, fireEvent, render, screen, waitFor, within } from '@testing-library/react';
import { detectMapping } from '../../src/core/intake';
import type { AnalysisSettings, RunHooks } from '../../src/core/pipeline/types';
import { UNBLINDED_CAUTION } from '../../src/core/report/cautions';
import { App } from '../../src/taskpane/App';
import type { PaneEngine } from '../../src/taskpane/engine';
import { runAnalysis as realRun } from '../../src/core/pipeline';
import { CELLS, fakeActions, okOutput, SOURCE } from './fakes';

afterEach(cleanup);

/** An engine with the real column detection and a run that returns `okOutput()` and records its settings. */
function engineWith(run?: PaneEngine['runAnalysis']): { engine: PaneEngine; calls: AnalysisSettings[] } {
  const calls: AnalysisSettings[] = [];
  const runAnalysis: PaneEngine['runAnalysis'] =
    run ??
    (async (_cells, settings, hooks) => {
      calls.push(settings);
      hooks.onStage?.('reading');
      hooks.onStage?.('windowing');
      hooks.onStage?.('fitting');
      return okOutput();
    });
  return { engine: { detectMapping, runAnalysis }, calls };
}

const results = (): HTMLElement => screen.getByRole('region', { name: /Results/ });
const select = (label: RegExp | string): HTMLSelectElement => screen.getByLabelText(label, { selector: 'select' });

async function loadAndConfirm(): Promise<void> {
  fireEvent.click(screen.getByRole('button', { name: 'Use the selected cells' }));
  await screen.findByText(/Which column is which/);
  fireEvent.click(screen.getByRole('button', { name: 'Confirm columns' }));
  fireEvent.click(await screen.findByRole('button', { name: 'Use this schedule' }));
  await screen.findByRole('region', { name: 'Visit schedule' });
}

describe('data step', () => {
  it('shows one dropdown per role set to the detected column, with the reason beside it', async () => {
    const { actions } = fakeActions();
    render(<App actions={actions} engine={engineWith().engine} />);
    fireEvent.click(screen.getByRole('button', { name: 'Use the selected cells' }));
    await screen.findByText(/Which column is which/);
    const expected: Record<string, string> = {
      Participant: 'USUBJID',
      'Visit date': 'ADT',
      'Reference date': 'RANDDT',
      'Visit name': 'AVISIT',
      Value: 'AVAL',
      Site: 'SITEID',
    };
    for (const [label, header] of Object.entries(expected)) {
      expect(select(new RegExp(`^${label}$`)).selectedOptions[0]?.textContent).toBe(header);
    }
    expect(select(/^Treatment arm/).selectedOptions[0]?.textContent).toBe('TRT01P');
    expect(select(/^Study day$/).value).toBe('');
    expect(screen.getByText(/Column "USUBJID"/)).toBeTruthy();
  });

  it('confirmed columns fold into a summary; changing one asks for confirmation again, and the run uses them', async () => {
    const { actions } = fakeActions();
    const { engine, calls } = engineWith();
    render(<App actions={actions} engine={engine} />);
    await loadAndConfirm();
    expect(screen.queryByRole('button', { name: 'Confirm columns' })).toBeNull();
    const summary = screen.getByLabelText('Confirmed columns');
    expect(within(summary).getByText('USUBJID')).toBeTruthy();
    expect(within(summary).queryByText('TRT01P')).toBeNull(); // blinded: the arm column is not listed
    fireEvent.click(screen.getByRole('button', { name: 'Change columns' }));
    fireEvent.change(select(/^Site$/), { target: { value: '' } });
    expect(screen.getByRole('button', { name: 'Confirm columns' })).toBeTruthy();
    fireEvent.click(screen.getByRole('button', { name: 'Confirm columns' }));
    fireEvent.click(screen.getByRole('button', { name: 'Run the analysis' }));
    await screen.findByText(/Sheets written/);
    expect(calls[0]?.mapping).toEqual({ subject: 0, date: 4, reference: 5, visit: 3, value: 6, covariates: [] });
  });

  it('keyboard focus moves on when the columns are confirmed, and back to the first column choice on "Change columns"', async () => {
    const { actions } = fakeActions();
    render(<App actions={actions} engine={engineWith().engine} />);
    fireEvent.click(screen.getByRole('button', { name: 'Use the selected cells' }));
    await screen.findByText(/Which column is which/);
    fireEvent.click(screen.getByRole('button', { name: 'Confirm columns' }));
    expect(document.activeElement).toBe(screen.getByRole('heading', { name: /Visit schedule/ }));
    fireEvent.click(screen.getByRole('button', { name: 'Change columns' }));
    expect(document.activeElement).toBe(select('Participant'));
  });

  it('a host that fails to read shows the reason instead of crashing', async () => {
    const { actions, spies } = fakeActions();
    spies.loadData.mockRejectedValueOnce(new Error('The selection is a single cell.'));
    render(<App actions={actions} engine={engineWith().engine} />);
    fireEvent.click(screen.getByRole('button', { name: 'Use the selected cells' }));
    expect(await screen.findByText(/The selection is a single cell\./)).toBeTruthy();
  });
});

describe('mode', () => {
  it('unblinded mode takes effect only after the confirmation that states who may use it', async () => {
    const { actions } = fakeActions();
    const { engine, calls } = engineWith();
    render(<App actions={actions} engine={engine} />);
    await loadAndConfirm();
    const unblinded = screen.getByRole('radio', { name: /Unblinded/ });
    fireEvent.click(unblinded);
    const dialog = await screen.findByRole('alertdialog');
    expect(within(dialog).getByText(UNBLINDED_CAUTION)).toBeTruthy();
    fireEvent.click(within(dialog).getByRole('button', { name: 'Stay blinded' }));
    await waitFor(() => expect(screen.queryByRole('alertdialog')).toBeNull());
    expect((screen.getByRole('radio', { name: /Blinded/ }) as HTMLInputElement).checked).toBe(true);
    expect(screen.queryByLabelText(/Reference arm/)).toBeNull();

    fireEvent.click(screen.getByRole('radio', { name: /Unblinded/ }));
    fireEvent.click(await screen.findByRole('button', { name: /switch to unblinded/ }));
    const reference = await screen.findByLabelText(/Reference arm/, { selector: 'select' });
    expect([...(reference as HTMLSelectElement).options].map((o) => o.value)).toEqual(['Placebo', 'Active']);
    fireEvent.click(screen.getByRole('button', { name: 'Run the analysis' }));
    await screen.findByText(/Sheets written/);
    expect(calls[0]?.mode).toBe('unblinded');
    expect(calls[0]?.mapping?.arm).toBe(2);
    expect(calls[0]?.referenceArm).toBe('Placebo');
  });

  it('results say so when the choices change after the run', async () => {
    const { actions } = fakeActions();
    render(<App actions={actions} engine={engineWith().engine} />);
    await loadAndConfirm();
    fireEvent.click(screen.getByRole('button', { name: 'Run the analysis' }));
    await screen.findByText(/Sheets written/);
    expect(screen.queryByText(/have changed since this run/)).toBeNull();
    fireEvent.change(select(/Time unit/), { target: { value: 'week' } });
    expect(screen.getByText(/have changed since this run/)).toBeTruthy();
  });

  it('a blinded run reads no arm column even though one was detected', async () => {
    const { actions } = fakeActions();
    const { engine, calls } = engineWith();
    render(<App actions={actions} engine={engine} />);
    await loadAndConfirm();
    fireEvent.click(screen.getByRole('button', { name: 'Run the analysis' }));
    await screen.findByText(/Sheets written/);
    expect(calls[0]?.mode).toBe('blinded');
    expect(calls[0]?.mapping?.arm).toBeUndefined();
    expect(calls[0]?.referenceArm).toBeUndefined();
  });

  it('remembered settings come back, but every session starts blinded', async () => {
    const { actions } = fakeActions({ settings: { mode: 'unblinded', level: 0.9, timeUnit: 'week' } });
    const { engine, calls } = engineWith();
    render(<App actions={actions} engine={engine} />);
    await waitFor(() => expect(select(/Time unit/).value).toBe('week'));
    expect((screen.getByRole('radio', { name: /Blinded/ }) as HTMLInputElement).checked).toBe(true);
    await loadAndConfirm();
    fireEvent.click(screen.getByRole('button', { name: 'Run the analysis' }));
    await screen.findByText(/Sheets written/);
    expect(calls[0]).toMatchObject({ mode: 'blinded', level: 0.9, timeUnit: 'week' });
  });
});

describe('results', () => {
  it('each problem is a link that selects its cell in the host, and each sheet a link that shows it', async () => {
    const { actions, spies } = fakeActions();
    render(<App actions={actions} engine={engineWith().engine} />);
    await loadAndConfirm();
    fireEvent.click(screen.getByRole('button', { name: 'Run the analysis' }));
    fireEvent.click(await screen.findByRole('button', { name: 'Go to cell Visits!G5' }));
    expect(spies.selectCell).toHaveBeenCalledWith('Visits!G5');
    fireEvent.click(screen.getByRole('button', { name: /^Model/ }));
    expect(spies.showSheet).toHaveBeenCalledWith('Model');
    expect(screen.getByText('eGFR fell by 0.4 per month on average.')).toBeTruthy();
    expect(screen.getByText(/interim look, not a final analysis/)).toBeTruthy();
    await waitFor(() => expect(spies.save).toHaveBeenCalledTimes(1));
  });

  it('errors that stop the run are listed with clickable cells and nothing is written', async () => {
    const { actions, spies } = fakeActions();
    const { engine } = engineWith(async () => ({
      ok: false,
      issues: [
        {
          code: 'subject-in-two-arms',
          severity: 'error',
          cell: 'Visits!C4',
          row: 4,
          role: 'arm',
          value: 'Active',
          use: null,
          message: 'Subject K-002 appears in two arms.',
        },
      ],
    }));
    render(<App actions={actions} engine={engine} />);
    await loadAndConfirm();
    fireEvent.click(screen.getByRole('button', { name: 'Run the analysis' }));
    expect(await screen.findByText('Subject K-002 appears in two arms.')).toBeTruthy();
    fireEvent.click(screen.getByRole('button', { name: 'Go to cell Visits!C4' }));
    expect(spies.selectCell).toHaveBeenCalledWith('Visits!C4');
    expect(spies.writeResults).not.toHaveBeenCalled();
  });
});

describe('a run stopped by its data', () => {
  it('lists the problem that stops the run above every warning, and the status line says why (never "stopped at 1 problems")', async () => {
    const { actions } = fakeActions();
    const warning = { code: 'blank-value', severity: 'warning', cell: 'Visits!G5', row: 5, role: 'value', value: '', use: 'model', message: 'Visits!G5: the value is blank, so the row is left out of the model.' } as const;
    const error = { code: 'too-few-arms', severity: 'error', cell: null, row: null, role: 'arm', value: '', use: null, message: 'Unblinded mode needs at least two arms; the usable rows have 1.' } as const;
    const { engine } = engineWith(async () => ({ ok: false, issues: [warning, error] }));
    render(<App actions={actions} engine={engine} />);
    await loadAndConfirm();
    fireEvent.click(screen.getByRole('button', { name: 'Run the analysis' }));
    const list = await screen.findByRole('list', { name: 'Problems found in the data' });
    const items = within(list).getAllByRole('listitem');
    expect(items[0]?.textContent).toMatch(/Stops the run.*needs at least two arms/);
    expect(items[1]?.textContent).toMatch(/Left out of the model/);
    expect(screen.getByRole('status').textContent).toBe('The run stopped: Unblinded mode needs at least two arms; the usable rows have 1.');
  });

  it('dates like 05/01/2026 whose order cannot be decided stop the run with the column named; "Day first" in the settings then runs it', async () => {
    const { actions, spies } = fakeActions();
    // The invented block with every date rewritten day first and every day at most 12, so no value decides the order.
    const dates = ['05/01/2026', '02/03/2026', '07/01/2026', '01/04/2026'];
    const refs = ['05/01/2026', '05/01/2026', '07/01/2026', '07/01/2026'];
    const cells = CELLS.map((row, i) => (i === 0 ? row : row.map((c, k) => (k === 4 ? dates[i - 1]! : k === 5 ? refs[i - 1]! : c))));
    spies.loadData.mockResolvedValue({ ...SOURCE, cells, numericText: 'accept' });
    const calls: AnalysisSettings[] = [];
    const engine: PaneEngine = { detectMapping, runAnalysis: async (c, settings, hooks) => (calls.push(settings), realRun(c, settings, hooks)) };
    render(<App actions={actions} engine={engine} />);
    await loadAndConfirm();
    fireEvent.click(screen.getByRole('button', { name: 'Run the analysis' }));
    await within(results()).findByText(/cannot be analysed yet/);
    expect(screen.getByRole('status').textContent).toMatch(
      /^The run stopped: Visits!E1: Column "ADT" \(visit date\) writes the day and month as numbers.*\(and 1 more problem that stops it\)\.$/,
    );
    expect(spies.writeResults).not.toHaveBeenCalled();
    fireEvent.change(select(/Order of day and month/), { target: { value: 'dmy' } });
    fireEvent.click(screen.getByRole('button', { name: 'Run the analysis' }));
    await screen.findByText(/Sheets written/);
    expect(calls.map((c) => c.dateOrder)).toEqual([undefined, 'dmy']);
  });
});

describe('cancel', () => {
  /** A run that waits at a gate between stages and honours the signal, as RunHooks describes. */
  function gatedRun(): { run: PaneEngine['runAnalysis']; open: () => void; seen: RunHooks[] } {
    let release: () => void = () => undefined;
    const gate = new Promise<void>((resolve) => (release = resolve));
    const seen: RunHooks[] = [];
    const run: PaneEngine['runAnalysis'] = async (_cells, _settings, hooks) => {
      seen.push(hooks);
      hooks.onStage?.('reading');
      await gate;
      if (hooks.signal?.aborted) return { ok: false, issues: [], cancelled: true };
      hooks.onStage?.('windowing');
      return okOutput();
    };
    return { run, open: () => release(), seen };
  }

  it('Cancel stops a run: the signal is raised, nothing is written, and the pane says so', async () => {
    const { actions, spies } = fakeActions();
    const gated = gatedRun();
    render(<App actions={actions} engine={engineWith(gated.run).engine} />);
    await loadAndConfirm();
    fireEvent.click(screen.getByRole('button', { name: 'Run the analysis' }));
    const stages = await screen.findByRole('list', { name: 'Run stages' });
    expect(within(stages).getByText(/Reading and checking the data/)).toBeTruthy();
    fireEvent.click(screen.getByRole('button', { name: 'Cancel' }));
    expect(gated.seen[0]?.signal?.aborted).toBe(true);
    gated.open();
    expect(await within(results()).findByText('The run was stopped. Nothing was written.')).toBeTruthy();
    expect(spies.writeResults).not.toHaveBeenCalled();
    expect(screen.getByRole('button', { name: 'Run the analysis' })).toHaveProperty('disabled', false);
  });

  it('a result that arrives after Cancel is still not written (regression: a run that ignores the signal)', async () => {
    const { actions, spies } = fakeActions();
    let release: () => void = () => undefined;
    const gate = new Promise<void>((resolve) => (release = resolve));
    const stubborn: PaneEngine['runAnalysis'] = async () => {
      await gate;
      return okOutput();
    };
    render(<App actions={actions} engine={engineWith(stubborn).engine} />);
    await loadAndConfirm();
    fireEvent.click(screen.getByRole('button', { name: 'Run the analysis' }));
    fireEvent.click(await screen.findByRole('button', { name: 'Cancel' }));
    release();
    expect(await within(results()).findByText('The run was stopped. Nothing was written.')).toBeTruthy();
    expect(spies.writeResults).not.toHaveBeenCalled();
  });
});

describe('schedule step', () => {
  it('a schedule with problems shows the host message and keeps the run closed', async () => {
    const { actions, spies } = fakeActions();
    spies.loadSchedule.mockResolvedValueOnce({
      ok: false,
      message: 'Schedule!B3: the target day must be a whole number.',
    });
    render(<App actions={actions} engine={engineWith().engine} />);
    fireEvent.click(await screen.findByRole('button', { name: 'Use this schedule' }));
    expect(await screen.findByText('Schedule!B3: the target day must be a whole number.')).toBeTruthy();
    expect(screen.getByText('Choose a visit schedule (step 2).')).toBeTruthy();
  });

  it('the starter schedule is written by the host and then read back under the name it returns', async () => {
    const { actions, spies } = fakeActions();
    render(<App actions={actions} engine={engineWith().engine} />);
    fireEvent.click(screen.getByRole('button', { name: 'Write a starter schedule sheet' }));
    await screen.findByRole('region', { name: 'Visit schedule' });
    expect(spies.loadSchedule).toHaveBeenCalledWith('Schedule (2)', undefined);
  });
});

describe('run step', () => {
  it('a confidence level outside 50–100% blocks the run and says which setting to fix', async () => {
    const { actions } = fakeActions();
    render(<App actions={actions} engine={engineWith().engine} />);
    await loadAndConfirm();
    fireEvent.change(screen.getByLabelText(/Confidence level/), { target: { value: '100' } });
    expect(await screen.findByText('The confidence level must lie between 50% and 100% (step 3).')).toBeTruthy();
    expect(screen.getByRole('button', { name: 'Run the analysis' })).toHaveProperty('disabled', true);
    fireEvent.change(screen.getByLabelText(/Confidence level/), { target: { value: '90' } });
    expect(screen.getByRole('button', { name: 'Run the analysis' })).toHaveProperty('disabled', false);
  });

  it('the run button stays disabled and says why until data, columns and schedule are in place', () => {
    const { actions } = fakeActions();
    render(<App actions={actions} engine={engineWith().engine} />);
    expect(screen.getByRole('button', { name: 'Run the analysis' })).toHaveProperty('disabled', true);
    expect(screen.getByText('Read the visit data first (step 1).')).toBeTruthy();
    expect(screen.getByText('Choose a visit schedule (step 2).')).toBeTruthy();
  });

  it('the run settings name the program version, so the analysis record says which build made it', async () => {
    const { actions } = fakeActions();
    const { engine, calls } = engineWith();
    render(<App actions={actions} engine={engine} />);
    await loadAndConfirm();
    fireEvent.click(screen.getByRole('button', { name: 'Run the analysis' }));
    await screen.findByText(/Sheets written/);
    // Without the webpack build no version is defined; the record then says so instead of "unknown".
    expect(calls[0]?.toolVersion).toBe('development build');
  });

  it('the progress bar follows the host through the writing stage, where Cancel is no longer offered', async () => {
    const { actions, spies } = fakeActions();
    let report: (f: number) => void = () => undefined;
    let finish: () => void = () => undefined;
    spies.writeResults.mockImplementation(
      (_output: unknown, onProgress?: (f: number) => void) =>
        new Promise((resolve) => {
          report = onProgress ?? report;
          finish = () => resolve([{ name: 'Model', title: 'Mixed model' }]);
        }),
    );
    render(<App actions={actions} engine={engineWith().engine} />);
    await loadAndConfirm();
    fireEvent.click(screen.getByRole('button', { name: 'Run the analysis' }));
    const bar = await screen.findByRole('progressbar', { name: 'Run progress' });
    await waitFor(() => expect(spies.writeResults).toHaveBeenCalledTimes(1));
    // Writing is the last of four stages: half of it written puts the bar at (3 + 0.5) / 4 (exact arithmetic).
    // Sheets half written cannot be taken back, so the pane stops offering Cancel and says why.
    expect(screen.queryByRole('button', { name: 'Cancel' })).toBeNull();
    expect(screen.getByText(/cannot be stopped part-way/)).toBeTruthy();
    act(() => report(0.5));
    // 12 digits: the value passes through an attribute string and back, so only the parse's rounding remains.
    expect(Number(bar.getAttribute('aria-valuenow'))).toBeCloseTo(3.5 / 4, 12);
    act(() => report(1));
    expect(Number(bar.getAttribute('aria-valuenow'))).toBeCloseTo(1, 12);
    act(() => finish());
    await screen.findByText(/Sheets written/);
  });

  it('progress is announced in a live region', async () => {
    const { actions } = fakeActions();
    render(<App actions={actions} engine={engineWith().engine} />);
    await loadAndConfirm();
    fireEvent.click(screen.getByRole('button', { name: 'Run the analysis' }));
    await screen.findByText(/Sheets written/);
    expect(screen.getByRole('status').textContent).toBe('Finished: 2 result sheets written.');
  });
});

vi.setConfig({ testTimeout: 30_000 });
