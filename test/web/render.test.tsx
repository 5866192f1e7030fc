// @vitest-environment jsdom
import { afterEach, describe, expect, it } from 'vitest';
import { act, cleanup, fireEvent, render, screen, waitFor } from '@testing-library/react';
import type { ChartSpec, TableBlock } from '../../src/core/report/types';
import { ChartView, colourGroup } from '../../src/web/ChartView';
import { yAxisOf } from '../../src/web/SheetView';
import { INVENTED_DATA_NOTE } from '../../src/core/report/cautions';
import { isDemoSource } from '../../src/web/demoData';
import { ResultsView } from '../../src/web/ResultsView';
import { blindedHeaders, ResultStore } from '../../src/web/resultStore';
import { SourceRowView } from '../../src/web/SourceRowView';
import { TableView } from '../../src/web/TableView';

afterEach(cleanup);

const trajectory: ChartSpec = {
  kind: 'line',
  id: 'Trajectory',
  title: 'Mean eGFR over time (invented data)',
  xLabel: 'Months since randomisation',
  yLabel: 'eGFR',
  series: [
    { name: 'Placebo', x: [0, 3, 6, 9], y: [60, 58, null, 55], lower: [58, 56, null, 52], upper: [62, 60, null, 58] },
    { name: 'Observed', x: [0, 3, 6, 9], y: [61, 57, 56, 54], style: 'points' },
  ],
};

describe('ChartView', () => {
  it('draws a line per unbroken run, a marker per point, a band for the interval, and names the chart for screen readers', () => {
    const { container } = render(<ChartView chart={trajectory} />);
    // Placebo: a null at x = 6 splits the line into two runs; 'points' draws no line.
    expect(container.querySelectorAll('polyline')).toHaveLength(2);
    // 3 finite Placebo points + 4 observed markers (circles for the first series, squares for the second).
    expect(container.querySelectorAll('circle')).toHaveLength(3); // the legend shows a line for a line series
    expect(container.querySelectorAll('svg[role="img"] rect')).toHaveLength(4);
    expect(container.querySelectorAll('polygon[opacity="0.15"]')).toHaveLength(1);
    expect(screen.getByRole('img').getAttribute('aria-label')).toContain('Mean eGFR over time (invented data)');
    expect(screen.getByText('Months since randomisation')).toBeTruthy();
    // The legend names what was drawn: a band, no whiskers.
    expect(screen.getByText('Shaded bands show the interval or range described with the table above.')).toBeTruthy();
    expect(screen.queryByText(/whiskers/i)).toBeNull();
  });

  it('draws bars from zero for categories, with whiskers for intervals', () => {
    const bars: ChartSpec = {
      kind: 'bar',
      id: 'OnTime',
      title: 'On-time rate by site',
      xLabel: 'Site',
      yLabel: 'On time',
      series: [
        {
          name: 'On-time rate',
          x: ['S01', 'S02', 'S03'],
          y: [0.9, 0.75, null],
          lower: [0.8, 0.6, null],
          upper: [0.95, 0.85, null],
        },
      ],
    };
    const { container } = render(<ChartView chart={bars} />);
    const rects = [...container.querySelectorAll('svg[role="img"] rect')];
    expect(rects).toHaveLength(2);
    const bottoms = rects.map((r) => Number(r.getAttribute('y')) + Number(r.getAttribute('height')));
    expect(bottoms[0]).toBeCloseTo(bottoms[1] ?? NaN, 9); // both bars stand on the zero line (exact identity)
    expect(container.querySelectorAll('svg[role="img"] g[stroke] line')).toHaveLength(2 * 3);
    expect(screen.getByText('S03')).toBeTruthy();
    // The legend names what was drawn: whiskers, no shaded band (regression: it spoke of bands here too).
    expect(screen.getByText('Whiskers show the interval or range described with the table above.')).toBeTruthy();
    expect(screen.queryByText(/shaded/i)).toBeNull();
  });

  it('a chart whose interval columns hold no finite limits draws none and says nothing about intervals', () => {
    const chart: ChartSpec = {
      kind: 'line',
      id: 'NoLimits',
      title: 'Mean over time',
      xLabel: 'Months',
      yLabel: 'Value',
      series: [{ name: 'All', x: [0, 3], y: [1, 2], lower: [null, null], upper: [null, null] }],
    };
    const { container } = render(<ChartView chart={chart} />);
    expect(container.querySelectorAll('polygon')).toHaveLength(0);
    expect(container.querySelector('.chart-legend-note')).toBeNull();
  });
});

describe('chart helpers', () => {
  it('series named "<group>: <part>" share a colour group, so an arm keeps one colour for model and observed', () => {
    expect(['Active: model', 'Active: observed mean', 'Median deviation'].map(colourGroup)).toEqual([
      'Active',
      'Active',
      'Median deviation',
    ]);
  });

  it('a chart of a percentage column gets percentage ticks (0.8 is written 80%)', () => {
    const chart: ChartSpec = {
      kind: 'bar',
      id: 'C',
      title: 'On-time rate by site',
      xLabel: 'Site',
      yLabel: 'On-time rate',
      sourceTable: 'BySite',
      series: [{ name: 'On-time rate', x: ['S01'], y: [0.8] }],
    };
    const sheet = {
      name: 'S',
      title: 'S',
      blocks: [
        {
          kind: 'table' as const,
          id: 'BySite',
          caption: 'By site',
          columns: [
            { header: 'Site', format: 'text' as const },
            { header: 'On-time rate', format: 'percent1' as const },
          ],
          rows: [['S01', 0.8]],
        },
      ],
    };
    expect(yAxisOf(chart, sheet)).toBe('percent');
    expect(yAxisOf({ ...chart, sourceTable: 'Other' }, sheet)).toBe('plain');
    render(<ChartView chart={chart} yAxis="percent" />);
    expect(screen.getByText('80%')).toBeTruthy();
  });
});

describe('TableView', () => {
  const table: TableBlock = {
    kind: 'table',
    id: 'ByVisit',
    caption: 'Visit timing by visit',
    columns: [
      { header: 'Visit', format: 'text' },
      { header: 'On-time rate', format: 'percent1' },
      { header: 'p', format: 'pvalue' },
    ],
    rows: [
      ['Week 12', 0.9167, 0.00002],
      ['=1+1', null, 0.5],
    ],
  };

  it('formats cells with the shared number formats and shows text as written, never as a formula', () => {
    render(<TableView table={table} />);
    expect(screen.getByText('91.7%')).toBeTruthy();
    expect(screen.getByText('<0.0001')).toBeTruthy();
    expect(screen.getByText('=1+1')).toBeTruthy();
    expect(screen.getByRole('table', { name: 'Visit timing by visit' })).toBeTruthy();
  });

  it("shows an 'integer' column without decimals, right-aligned (regression: 'Patients 240.0000')", () => {
    const counts: TableBlock = {
      kind: 'table',
      id: 'FitCounts',
      caption: 'Data used and work done',
      columns: [
        { header: 'Item', format: 'text' },
        { header: 'Count', format: 'integer' },
      ],
      rows: [
        ['Participants', 240],
        ['Measurements', 916],
      ],
    };
    const { container } = render(<TableView table={counts} />);
    const cells = [...container.querySelectorAll('tbody td.num')].map((td) => td.textContent);
    expect(cells).toEqual(['240', '916']);
    expect(screen.queryByText(/240\./)).toBeNull();
  });

  it('wraps the cells of a wide text column (width 40 or more) and leaves narrow ones and numbers on one line', () => {
    const notes: TableBlock = {
      kind: 'table',
      id: 'ModelFit',
      caption: 'How well the model fits',
      columns: [
        { header: 'Item', format: 'text', width: 24 },
        { header: 'Value', format: 'decimal3' },
        { header: 'Note', format: 'text', width: 60 },
      ],
      rows: [['Verdict', null, 'Converged. A sentence long enough to need more than one line on a narrow page.']],
    };
    const { container } = render(<TableView table={notes} />);
    expect([...container.querySelectorAll('tbody td')].map((td) => td.className)).toEqual(['', 'num', 'wrap']);
  });

  it('shows a long table folded to its first rows, with a button that shows them all and leaves focus on the table', () => {
    const rows = Array.from({ length: 30 }, (_, i) => [`V${i + 1}`, 0.5, 0.5]);
    render(<TableView table={{ ...table, rows }} />);
    expect(screen.getAllByRole('row')).toHaveLength(1 + 12);
    fireEvent.click(screen.getByRole('button', { name: 'Show all 30 rows' }));
    expect(screen.getAllByRole('row')).toHaveLength(1 + 30);
    // The button is gone; keyboard focus is on the table's region instead of falling to the page's top.
    expect(document.activeElement).toBe(screen.getByRole('region', { name: 'Visit timing by visit' }));
  });

  it('shows at most maxRows rows and says the download has them all', () => {
    render(<TableView table={table} maxRows={1} />);
    expect(screen.queryByText('=1+1')).toBeNull();
    expect(screen.getByText(/Showing the first 1 of 2 rows/)).toBeTruthy();
  });
});

describe('ResultsView', () => {
  it('shows the sheets kept by the store, and the data row of a selected cell with the cell marked', () => {
    const store = new ResultStore();
    render(<ResultsView store={store} />);
    expect(screen.getByText(/The result sheets appear here/)).toBeTruthy();
    expect(screen.queryByRole('button', { name: /Download report/ })).toBeNull();
    act(() =>
      store.update({
        sheets: [
          {
            name: 'Model',
            spec: {
              name: 'Model',
              title: 'Mixed model',
              blocks: [{ kind: 'paragraph', text: 'Careful.', style: 'caution' }],
            },
          },
        ],
        source: {
          label: 'visits.csv',
          sheet: 'visits',
          topLeft: 'A1',
          dateSystem: 1900,
          cells: [
            ['USUBJID', 'AVAL'],
            ['K-1', '61'],
            ['K-2', ''],
          ],
        },
        highlight: { address: 'visits!B3', rowIndex: 2, colIndex: 1 },
      }),
    );
    expect(screen.getByRole('heading', { name: /Mixed model/ })).toBeTruthy();
    expect(screen.getByRole('button', { name: 'Download report (.xlsx)' })).toBeTruthy();
    expect(screen.getByText('Cell visits!B3 in visits.csv')).toBeTruthy();
    const marked = document.querySelector('td.hit');
    expect(marked?.parentElement?.querySelector('th')?.textContent).toBe('3');
    fireEvent.click(screen.getByRole('button', { name: 'Close' }));
    expect(screen.queryByText('Cell visits!B3 in visits.csv')).toBeNull();
  });
});

describe('the invented-data note', () => {
  const sourceNamed = (label: string): Parameters<typeof isDemoSource>[0] => ({
    label,
    sheet: 'Visits',
    topLeft: 'A1',
    dateSystem: 1900,
    cells: [['USUBJID']],
  });

  it('isDemoSource recognises the bundled demo file as CSV or as a workbook, and nothing else', () => {
    expect(isDemoSource(sourceNamed('egfr-visits.csv'))).toBe(true);
    expect(isDemoSource(sourceNamed('egfr-visits.xlsx (sheet Visits)'))).toBe(true);
    expect(isDemoSource(sourceNamed('visits.csv'))).toBe(false);
    expect(isDemoSource(sourceNamed('my-egfr-visits.csv'))).toBe(false);
    expect(isDemoSource(null)).toBe(false);
  });

  it('is shown only while the loaded data are the bundled demo, not before a file is loaded or for the user\'s own file', () => {
    const store = new ResultStore();
    render(<ResultsView store={store} />);
    expect(screen.queryByText(INVENTED_DATA_NOTE)).toBeNull();
    act(() => store.update({ source: sourceNamed('trial-visits.csv') }));
    expect(screen.queryByText(INVENTED_DATA_NOTE)).toBeNull();
    act(() => store.update({ source: sourceNamed('egfr-visits.csv') }));
    expect(screen.getByText(INVENTED_DATA_NOTE)).toBeTruthy();
  });
});

describe('go to cell after a blinded run', () => {
  const source = {
    label: 'visits.csv',
    sheet: 'visits',
    topLeft: 'A1',
    dateSystem: 1900 as const,
    cells: [
      ['USUBJID', 'TRT01P', 'AVAL'],
      ['K-1', 'Active', 'pending'],
    ],
  };

  it('blindedHeaders lists the columns a blinded run read, and nothing limits an unblinded run', () => {
    const mapping = { subject: 'USUBJID', value: 'AVAL', covariates: ['BASE'] };
    expect(blindedHeaders({ settings: { mode: 'blinded', mapping } })).toEqual(['USUBJID', 'AVAL', 'BASE']);
    expect(blindedHeaders({ settings: { mode: 'unblinded', mapping } })).toBeNull();
    expect(blindedHeaders({})).toBeNull();
  });

  it('shows only the columns the run read, so no arm appears beside a blinded result', () => {
    render(
      <SourceRowView
        source={source}
        highlight={{ address: 'visits!C2', rowIndex: 1, colIndex: 2 }}
        shownHeaders={['USUBJID', 'AVAL']}
        onClose={() => undefined}
      />,
    );
    expect(screen.getByText('pending')).toBeTruthy();
    expect(screen.queryByText('Active')).toBeNull();
    expect(screen.queryByText('TRT01P')).toBeNull();
    expect(screen.getByText(/Only the columns this blinded run read are shown/)).toBeTruthy();
  });
});

describe('the sheets drawn one per task', () => {
  const sheet = (k: number): { name: string; spec: { name: string; title: string; blocks: { kind: 'paragraph'; text: string }[] } } => ({
    name: `S${k}`,
    spec: { name: `S${k}`, title: `Invented sheet ${k}`, blocks: [{ kind: 'paragraph', text: `Body of sheet ${k}.` }] },
  });

  it('shows every title at once and the bodies in turn, one per task; drawn() reports the fraction and ends with the last', async () => {
    const store = new ResultStore();
    render(<ResultsView store={store} />);
    const sheets = [sheet(1), sheet(2), sheet(3)];
    const fractions: number[] = [];
    let finished = false;
    act(() => store.update({ sheets }));
    const drawn = store.drawn((f) => fractions.push(f)).then(() => (finished = true));
    // Every sheet's section and title are there from the start (the contents line's links work); only the first body.
    for (const k of [1, 2, 3]) expect(screen.getByRole('heading', { name: new RegExp(`Invented sheet ${k}`) })).toBeTruthy();
    expect(screen.getByText('Body of sheet 1.')).toBeTruthy();
    expect(screen.queryByText('Body of sheet 3.')).toBeNull();
    expect(finished).toBe(false);
    await waitFor(() => expect(finished).toBe(true));
    await drawn;
    for (const k of [1, 2, 3]) expect(screen.getByText(`Body of sheet ${k}.`)).toBeTruthy();
    expect(screen.queryByText('Drawing this sheet…')).toBeNull();
    expect(fractions.at(-1)).toBe(1);
    expect([...fractions].sort((a, b) => a - b)).toEqual(fractions);
  });

  it('drawn() ends at once when no view draws the sheets, and when the sheets it waited for are replaced', async () => {
    const alone = new ResultStore();
    alone.update({ sheets: [sheet(1), sheet(2)] });
    await expect(alone.drawn()).resolves.toBeUndefined();
    const store = new ResultStore();
    const stop = store.addDrawer();
    store.update({ sheets: [sheet(1), sheet(2)] });
    const waiting = store.drawn();
    store.update({ sheets: [] });
    await expect(waiting).resolves.toBeUndefined();
    store.update({ sheets: [sheet(3)] });
    const last = store.drawn();
    stop(); // the view went away
    await expect(last).resolves.toBeUndefined();
  });
});
