/**
 * End to end: the built browser page (dist/) in headless Chromium (chosen by test/support/browser.ts), driven with
 * playwright-core. Loads the invented
 * demo trial, walks the pane with the keyboard, runs unblinded and blinded, checks what the page shows, that it asks
 * nothing of any other address, and saves screenshots.
 *
 * Screenshots always go to test-artifacts/ (ignored by git). The committed pictures in docs/ (pane-demo.png for the
 * README: the whole pane after a run, all five steps, laid out in three columns; page-results.png) are refreshed only when the environment variable LONGIPANE_UPDATE_DOCS=1 is set:
 *   LONGIPANE_UPDATE_DOCS=1 npx vitest run test/e2e
 * so that an ordinary `npm test` (and CI) never changes tracked files.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { copyFileSync, existsSync, mkdirSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { createServer, type Server } from 'node:http';
import type { AddressInfo } from 'node:net';
import { tmpdir } from 'node:os';
import { extname, join, normalize, resolve, sep } from 'node:path';
import ExcelJS from 'exceljs';
import type { BrowserContext, Page } from 'playwright-core';
import { launchChromium } from '../support/browser';

const ROOT = process.cwd();
const DIST = resolve(ROOT, 'dist');
const ARTIFACTS = resolve(ROOT, 'test-artifacts');
const DEMO_VISITS = resolve(ROOT, 'demo/egfr-visits.csv');
const DEMO_SCHEDULE = resolve(ROOT, 'demo/egfr-schedule.csv');
const DOCS = resolve(ROOT, 'docs');
/** Refresh the committed screenshots in docs/ only on request (see the file comment). */
const UPDATE_DOCS = process.env.LONGIPANE_UPDATE_DOCS === '1';

/** Copies a screenshot from test-artifacts/ into docs/ when asked to (LONGIPANE_UPDATE_DOCS=1). */
function publish(artifact: string, docName: string): void {
  if (UPDATE_DOCS) copyFileSync(join(ARTIFACTS, artifact), join(DOCS, docName));
}

const TYPES: Record<string, string> = {
  '.html': 'text/html; charset=utf-8',
  '.js': 'text/javascript; charset=utf-8',
  '.css': 'text/css; charset=utf-8',
  '.png': 'image/png',
  '.svg': 'image/svg+xml',
  '.xml': 'application/xml',
  '.txt': 'text/plain; charset=utf-8',
};

/** A tiny static server for dist/ on 127.0.0.1 at a port the system picks. */
function serve(dir: string): Promise<Server> {
  const server = createServer((req, res) => {
    const path = decodeURIComponent(new URL(req.url ?? '/', 'http://x').pathname);
    const file = normalize(join(dir, path === '/' ? 'index.html' : path));
    if (!file.startsWith(dir + sep) || !existsSync(file)) {
      res.writeHead(404).end('not found');
      return;
    }
    res.writeHead(200, { 'content-type': TYPES[extname(file)] ?? 'application/octet-stream' }).end(readFileSync(file));
  });
  return new Promise((ok) => server.listen(0, '127.0.0.1', () => ok(server)));
}

let server: Server;
let context: BrowserContext;
let page: Page;
let base: string;
let profile: string;
const requests: string[] = [];
const pageErrors: string[] = [];
/** Every message the page wrote to the browser console as an error (a refused script, a failed load, a React error). */
const consoleErrors: string[] = [];
/** Every answer of 400 or more from the local server (regression: the page asked for a favicon that did not exist). */
const failedResponses: string[] = [];

beforeAll(async () => {
  if (!existsSync(join(DIST, 'index.html'))) {
    throw new Error('dist/index.html is missing: build the page first with `npm run build` (this test serves dist/).');
  }
  mkdirSync(ARTIFACTS, { recursive: true });
  server = await serve(DIST);
  base = `http://127.0.0.1:${(server.address() as AddressInfo).port}`;
  profile = mkdtempSync(join(tmpdir(), 'longipane-e2e-'));
  ({ context } = await launchChromium(profile));
  context.on('request', (r) => requests.push(r.url()));
  context.on('response', (r) => {
    if (r.status() >= 400) failedResponses.push(`${r.status()} ${r.url()}`);
  });
  page = context.pages()[0] ?? (await context.newPage());
  page.on('pageerror', (e) => pageErrors.push(e.message));
  page.on('console', (m) => {
    if (m.type() === 'error') consoleErrors.push(`${m.text()} (${m.location().url})`);
  });
  await page.goto(`${base}/index.html`);
});

afterAll(async () => {
  await context?.close();
  await new Promise((ok) => (server ? server.close(ok) : ok(undefined)));
  if (profile) rmSync(profile, { recursive: true, force: true });
});

const pane = (): ReturnType<Page['locator']> => page.locator('.pane');
const results = (): ReturnType<Page['locator']> => page.locator('.results-area');

/** Waits until the run has written its sheets (the results step lists them). */
async function finished(): Promise<void> {
  await pane().getByRole('heading', { name: 'Sheets written' }).waitFor({ timeout: 120_000 });
}

async function run(): Promise<void> {
  await pane().getByRole('button', { name: 'Run the analysis' }).click();
  await finished();
}

/** The element that has keyboard focus: its tag, its name (aria-label, else its label, else its text), disabled. */
async function focused(): Promise<{ tag: string; text: string; disabled: boolean }> {
  return page.evaluate(() => {
    const el = document.activeElement as (HTMLElement & { labels?: NodeListOf<HTMLLabelElement> | null }) | null;
    const label = el?.labels?.[0]?.textContent ?? null;
    return {
      tag: el?.tagName.toLowerCase() ?? '',
      text: (el?.getAttribute('aria-label') ?? label ?? el?.textContent ?? '').trim(),
      disabled: (el as HTMLButtonElement | null)?.disabled === true,
    };
  });
}

/** Starts recording every text the pane's live status region shows (read back with `statusTexts`). */
async function recordStatus(): Promise<void> {
  await page.evaluate(() => {
    const region = document.querySelector('.pane [role="status"]');
    const w = window as unknown as { statusTexts: string[] };
    w.statusTexts = [];
    if (region === null) return;
    new MutationObserver(() => w.statusTexts.push(region.textContent ?? '')).observe(region, {
      childList: true,
      characterData: true,
      subtree: true,
    });
  });
}

/** The pane's width (350 px, as a task pane in Excel) and how wide its content is: equal when nothing runs off sideways. */
const paneWidths = (): Promise<{ client: number; scroll: number }> =>
  pane().evaluate((el) => ({ client: el.clientWidth, scroll: el.scrollWidth }));

/** Lines of an area's accessibility tree (the pane by default) for controls without an accessible name (shown as
 * the role alone). */
async function namelessControls(area: ReturnType<Page['locator']> = pane()): Promise<string[]> {
  const tree = await area.ariaSnapshot();
  return tree
    .split('\n')
    .filter((line) => /^\s*- (button|combobox|textbox|spinbutton|checkbox|radio|link|slider)( \[[^\]]*\])*:?$/.test(line));
}

/**
 * Lays a tall picture of the whole pane out in three columns, cut where a step starts (the cuts that make the tallest
 * column shortest), on a page of its own, and saves that: the README's picture of all five steps at a readable size.
 */
async function paneInColumns(picture: Buffer, stepTops: readonly number[], height: number, path: string): Promise<void> {
  let best: [number, number] = [height, height];
  let tallest = Number.POSITIVE_INFINITY;
  for (const a of stepTops.slice(1))
    for (const b of stepTops.filter((t) => t > a)) {
      const t = Math.max(a, b - a, height - b);
      if (t < tallest) [tallest, best] = [t, [a, b]];
    }
  const spans = [
    [0, best[0]],
    [best[0], best[1]],
    [best[1], height],
  ].filter(([from, to]) => (to ?? 0) > (from ?? 0)) as [number, number][];
  const src = `data:image/png;base64,${picture.toString('base64')}`;
  const sheet = await context.newPage();
  try {
    const gap = 16;
    await sheet.setViewportSize({ width: spans.length * (350 + gap) + gap, height: Math.ceil(tallest) + 2 * gap });
    await sheet.setContent(
      `<body style="margin:0;background:#e6e6e6;display:flex;align-items:flex-start;gap:${gap}px;padding:${gap}px">` +
        spans
          .map(
            ([from, to]) =>
              `<div style="width:350px;height:${to - from}px;overflow:hidden;background:#fff;flex:none">` +
              `<img src="${src}" style="display:block;margin-top:${-from}px" alt=""></div>`,
          )
          .join('') +
        '</body>',
    );
    await sheet.waitForFunction(() => [...document.images].every((i) => i.complete && i.naturalWidth > 0));
    await sheet.screenshot({ path });
  } finally {
    await sheet.close();
  }
}

const statusTexts = (): Promise<string[]> =>
  page.evaluate(() => (window as unknown as { statusTexts?: string[] }).statusTexts ?? []);

describe('the browser page with the invented demo trial', () => {
  it('reads the demo data, proposes the CDISC columns, and reads the demo schedule', async () => {
    await pane().getByLabel('Visit data file (CSV or Excel .xlsx)').setInputFiles(DEMO_VISITS);
    await pane().getByText('Which column is which?').waitFor();
    // The picker names the file it read (regression: the browser's own input kept saying "No file chosen").
    await expect(pane().getByTestId('data-file-name').innerText()).resolves.toBe('egfr-visits.csv');
    expect(await pane().getByRole('combobox', { name: 'Participant', exact: true }).inputValue()).toBe('0'); // USUBJID, first column
    expect(await pane().getByRole('combobox', { name: 'Value', exact: true }).inputValue()).toBe('6'); // AVAL
    await pane().getByRole('button', { name: 'Confirm columns' }).click();
    await pane().getByLabel('Schedule file (CSV)').setInputFiles(DEMO_SCHEDULE);
    await pane().getByRole('region', { name: 'Visit schedule' }).getByText('Week 48').waitFor();
    await expect(pane().getByTestId('schedule-file-name').innerText()).resolves.toBe('egfr-schedule.csv');
    // Every visit of the demo schedule (5) is in view in the preview, each visit name on one line (regression: the
    // preview's height cap showed 4 of 5, and a name wrapped onto two lines). Checked at the page's 350 px and at
    // 280 px, about the narrowest an Excel task pane gets, where the headers wrap onto more lines.
    const preview = pane().getByRole('region', { name: 'Visit schedule', exact: true });
    const visitsShown = (): Promise<{ name: string; inView: boolean; lines: number }[]> =>
      preview.evaluate((region) => {
        const box = region.getBoundingClientRect();
        return [...region.querySelectorAll('tbody tr')].map((tr) => {
          const cell = tr.querySelector('td');
          const r = tr.getBoundingClientRect();
          const range = document.createRange();
          if (cell !== null) range.selectNodeContents(cell);
          // One line box per line of text: the distinct tops of the text's rectangles.
          const lines = new Set([...range.getClientRects()].map((rect) => Math.round(rect.top))).size;
          return { name: cell?.textContent ?? '', inView: r.top >= box.top - 0.5 && r.bottom <= box.bottom + 0.5, lines };
        });
      });
    const setPaneWidth = (width: string): Promise<void> =>
      pane().evaluate((el, w) => {
        (el as HTMLElement).style.width = w;
        (el as HTMLElement).style.flexBasis = w;
      }, width);
    for (const width of ['350px', '280px']) {
      await setPaneWidth(width);
      const shown = await visitsShown();
      expect(shown.map((v) => v.name)).toEqual(['Baseline', 'Week 12', 'Week 24', 'Week 36', 'Week 48']);
      for (const v of shown) expect(v, `${v.name} at ${width}`).toEqual({ name: v.name, inView: true, lines: 1 });
      await preview.screenshot({ path: join(ARTIFACTS, `schedule-preview-${width}.png`) });
    }
    await setPaneWidth('');
    // A longer schedule, generated here: 24 visits with long invented names. Still every visit shown, each name on
    // one line (a too-wide table scrolls across inside its frame, never the pane).
    const names = Array.from({ length: 24 }, (_, i) => `Week ${4 * (i + 1)} follow-up with extra sampling`);
    const csv = ['visit,target_day,days_before,days_after', ...names.map((n, i) => `${n},${28 * (i + 1) + 1},7,7`)].join('\n');
    await pane()
      .getByLabel('Schedule file (CSV)')
      .setInputFiles({ name: 'long-schedule.csv', mimeType: 'text/csv', buffer: Buffer.from(csv) });
    await preview.getByText('24 scheduled visits').waitFor();
    const long = await visitsShown();
    expect(long.map((v) => v.name)).toEqual(names);
    for (const v of long) expect(v, v.name).toEqual({ name: v.name, inView: true, lines: 1 });
    const widths = await paneWidths();
    expect(widths.scroll).toBe(widths.client);
    // Back to the demo schedule for the runs below.
    await pane().getByLabel('Schedule file (CSV)').setInputFiles(DEMO_SCHEDULE);
    await preview.getByText('5 scheduled visits').waitFor();
    // Two schedule files have been read, yet the page offers no second control to pick one of them again
    // (regression: a redundant "schedule already loaded / use this schedule" pair).
    await expect(pane().getByRole('button', { name: 'Use this schedule' }).count()).resolves.toBe(0);
    await expect(pane().getByRole('combobox', { name: /schedule/i }).count()).resolves.toBe(0);
    // The schedule table speaks the glossary's words (README, "Words we use").
    const headers = await pane().getByRole('region', { name: 'Visit schedule' }).getByRole('columnheader').allInnerTexts();
    expect(headers).toEqual(['Visit', 'Target day', 'Days allowed before', 'Days allowed after']);
    // The pane keeps to its task-pane width: wide previews scroll inside their own region, not the pane.
    const { client, scroll } = await paneWidths();
    expect(client).toBeLessThanOrEqual(350);
    expect(scroll).toBe(client);
  });

  it('every control of the pane has an accessible name, and the settings are found by role and name', async () => {
    // The accessibility tree of the pane: a control without a name shows as its role alone ("- combobox").
    await expect(namelessControls()).resolves.toEqual([]);
    const controls: [Parameters<Page['getByRole']>[0], string][] = [
      ['button', 'Visit data file (CSV or Excel .xlsx)'],
      ['button', 'Schedule file (CSV)'],
      ['button', 'Use the starter schedule'],
      ['button', 'Change columns'],
      ['radiogroup', 'Who may see the results'],
      ['radio', 'Blinded: pooled results, no arms (default)'],
      ['radio', 'Unblinded: results by treatment arm'],
      ['textbox', 'Data cut-off date'],
      ['combobox', 'Time unit for slopes'],
      ['combobox', 'Degrees of freedom'],
      ['combobox', 'Model'],
      ['combobox', 'Estimation method'],
      ['spinbutton', 'Confidence level (%)'],
      ['checkbox', 'Use only records matched to a scheduled visit in the model'],
      ['checkbox', "Add a sheet with each participant's estimated intercept"],
      ['button', 'Run the analysis'],
    ];
    for (const [role, name] of controls) {
      await expect(pane().getByRole(role, { name, exact: true }).count(), `${role} "${name}"`).resolves.toBe(1);
    }
    // The starter-schedule control looks like a button: it has a visible outline (regression: a borderless "subtle"
    // button that read as plain text).
    const starter = await pane()
      .getByRole('button', { name: 'Use the starter schedule', exact: true })
      .evaluate((el) => {
        const style = getComputedStyle(el);
        return { width: style.borderTopWidth, colour: style.borderTopColor };
      });
    expect(starter.width).not.toBe('0px');
    expect(starter.colour).not.toMatch(/^(transparent|rgba\(0, 0, 0, 0\))$/);
    // The run's progress and messages are announced politely by a status region.
    await expect(pane().getByRole('status').getAttribute('aria-live')).resolves.toBe('polite');
    // Tab from the first control of the pane reaches every step's controls in reading order, each with a name,
    // and arrives at the run button.
    await pane().getByLabel('Visit data file (CSV or Excel .xlsx)').focus();
    const stops: string[] = [];
    for (let i = 0; i < 80 && stops.at(-1) !== 'Run the analysis'; i++) {
      await page.keyboard.press('Tab');
      stops.push((await focused()).text);
    }
    expect(stops.filter((name) => name === '')).toEqual([]);
    const order = [
      'Change columns',
      'Use the starter schedule',
      'Data cut-off date',
      'Time unit for slopes',
      'Degrees of freedom',
      'Model',
      'Estimation method',
      'Confidence level (%)',
      'Run the analysis',
    ].map((name) => stops.indexOf(name));
    expect(order.every((i) => i >= 0), stops.join(' | ')).toBe(true);
    expect([...order].sort((a, b) => a - b)).toEqual(order);
  });

  it('the cut-off date is plain year-month-day text, not the browser\'s local date widget, and an impossible date is named', async () => {
    const cutoff = pane().getByRole('textbox', { name: 'Data cut-off date', exact: true });
    await expect(cutoff.getAttribute('type')).resolves.toBe('text');
    await expect(cutoff.getAttribute('placeholder')).resolves.toBe('YYYY-MM-DD');
    const problem = pane().getByText(/^Not a calendar date written year-month-day/);
    // 30 February does not exist (Gregorian calendar): said once the field is left.
    await cutoff.fill('2026-02-30');
    await cutoff.blur();
    await problem.waitFor();
    await expect(pane().getByText('The cut-off date is not a valid date (step 3).').count()).resolves.toBe(1);
    await cutoff.fill('2026-03-30');
    await cutoff.blur();
    await problem.waitFor({ state: 'detached' });
    await expect(cutoff.inputValue()).resolves.toBe('2026-03-30');
    // Back to empty: the runs below use the latest visit date in the data.
    await cutoff.fill('');
    await cutoff.blur();
  });

  it('an unblinded run, after confirming, shows visit timing by visit and the treatment difference', async () => {
    // By keyboard: the arrow key on the mode radios asks first; focus starts on the safe answer, Escape keeps the
    // pane blinded and puts focus back on the mode; the second time, Shift+Tab and Enter confirm.
    const blinded = pane().getByRole('radio', { name: /^Blinded/ });
    const dialog = page.getByRole('alertdialog');
    await blinded.focus();
    await page.keyboard.press('ArrowDown');
    await dialog.waitFor();
    await expect(dialog.getByText(/unblinded statistician/).isVisible()).resolves.toBe(true);
    expect((await focused()).text).toBe('Stay blinded');
    await page.keyboard.press('Escape');
    await dialog.waitFor({ state: 'detached' });
    expect(await blinded.isChecked()).toBe(true);
    expect((await focused()).text).toBe('Blinded: pooled results, no arms (default)');
    await page.keyboard.press('ArrowDown');
    await dialog.waitFor();
    await page.keyboard.press('Shift+Tab');
    expect((await focused()).text).toBe('Yes, switch to unblinded');
    await page.keyboard.press('Enter');
    await dialog.waitFor({ state: 'detached' });
    expect(await pane().getByRole('radio', { name: /^Unblinded/ }).isChecked()).toBe(true);
    expect((await focused()).text).toBe('Unblinded: results by treatment arm');
    await pane().getByRole('combobox', { name: 'Reference arm (compared against)' }).selectOption('Placebo');
    // Keyboard only from here: Tab from the reference arm to the run button, then Enter starts the run.
    await pane().getByRole('combobox', { name: 'Reference arm (compared against)' }).focus();
    let tabs = 0;
    for (; tabs < 20 && (await focused()).text !== 'Run the analysis'; tabs++) await page.keyboard.press('Tab');
    expect(await focused()).toEqual({ tag: 'button', text: 'Run the analysis', disabled: false });
    expect(tabs).toBeGreaterThan(1); // the settings below the arm were passed on the way
    await recordStatus();
    await page.keyboard.press('Enter');
    await finished();
    // The live region said each stage in turn, and then that the run was done.
    const said = await statusTexts();
    const stages = [
      'Reading and checking the data',
      'Checking visit timing against the schedule',
      'Fitting the mixed model',
      'Writing the result sheets',
    ];
    const at = stages.map((s) => said.findIndex((t) => t.startsWith(s)));
    expect(at.every((i) => i >= 0), said.join(' | ')).toBe(true);
    expect([...at].sort((a, b) => a - b)).toEqual(at);
    expect(said.at(-1)).toMatch(/^Finished: \d+ result sheets written\.$/);
    // After the run, keyboard focus is on the results heading, so the next Tab lands in the results.
    expect((await focused()).text).toContain('Results');
    // The visit-timing table by visit: a header row and one row per scheduled visit of the demo schedule (5).
    await expect(results().locator('table[data-table-id="ByVisit"] tr').count()).resolves.toBe(1 + 5);
    // The model's treatment difference at the last visit, Active against the chosen reference Placebo.
    const difference = results().locator('table[data-table-id="DifferenceByVisit"] tbody tr', { hasText: 'Week 48' });
    await expect(difference.count()).resolves.toBe(1);
    expect(await difference.innerText()).toContain('Active');
    await expect(
      results()
        .getByText(/Placebo/)
        .count(),
    ).resolves.toBeGreaterThan(0);
    // The pane's short headline states that difference too.
    await pane()
      .getByText(/^At Week 48, Active differed from Placebo by /)
      .waitFor();
    await page.screenshot({ path: join(ARTIFACTS, 'page-unblinded.png'), fullPage: false });
    await results().locator('table[data-table-id="FixedEffects"]').scrollIntoViewIfNeeded();
    await page.screenshot({ path: join(ARTIFACTS, 'page-unblinded-model.png'), fullPage: false });
  }, 180_000);

  it('at 1366 × 768 nothing runs off sideways: the page does not scroll across, and each results table fits its card or scrolls inside it', async () => {
    // 1366 × 768: a common laptop screen (regression: the arm-by-visit table ran over its card's right edge).
    await page.setViewportSize({ width: 1366, height: 768 });
    try {
      const page_ = await page.evaluate(() => ({ scroll: document.documentElement.scrollWidth, inner: window.innerWidth }));
      expect(page_.scroll).toBeLessThanOrEqual(page_.inner);
      const cards = await results()
        .locator('section.sheet')
        .evaluateAll((sections) =>
          sections.map((card) => {
            const box = card.getBoundingClientRect();
            const tables = [...card.querySelectorAll('table')].map((table) => {
              const wrap = table.closest('.table-wrap');
              const t = table.getBoundingClientRect();
              const w = wrap?.getBoundingClientRect();
              const style = wrap === null ? null : getComputedStyle(wrap);
              return {
                id: table.getAttribute('data-table-id') ?? '?',
                // Fits: the table's right edge is inside the card (half a pixel for sub-pixel layout).
                fits: t.right <= box.right + 0.5 && t.left >= box.left - 0.5,
                // Scrolls inside: its frame lies within the card and scrolls across by itself.
                scrollsInside:
                  w !== undefined &&
                  wrap !== null &&
                  w.right <= box.right + 0.5 &&
                  (style?.overflowX === 'auto' || style?.overflowX === 'scroll') &&
                  wrap.scrollWidth > wrap.clientWidth,
              };
            });
            return { id: card.id, overflow: card.scrollWidth - card.clientWidth, tables };
          }),
        );
      expect(cards.length).toBeGreaterThan(0);
      await results().locator('table[data-table-id="ByArmVisit"]').scrollIntoViewIfNeeded();
      for (const card of cards) {
        expect(card.overflow, `card ${card.id} is wider inside than its box`).toBeLessThanOrEqual(0);
        for (const t of card.tables) expect(t.fits || t.scrollsInside, `table ${t.id} in ${card.id}`).toBe(true);
      }
      await page.screenshot({ path: join(ARTIFACTS, 'page-1366.png'), fullPage: false });
    } finally {
      await page.setViewportSize({ width: 1280, height: 900 });
    }
  });

  it('counts show as whole numbers on the page (regression: "Patients 240.0000" in the fit counts)', async () => {
    const counts = results().locator('table[data-table-id="FitCounts"] tbody tr');
    await expect(counts.count()).resolves.toBeGreaterThan(0);
    const patients = counts.filter({ hasText: 'Participants' }).locator('td').nth(1);
    // 240 invented participants in the demo trial (demo/README.md); an integer column shows no decimals.
    await expect(patients.innerText()).resolves.toBe('240');
    for (const text of await counts.locator('td:nth-child(2)').allInnerTexts()) expect(text).toMatch(/^\d+$/);
  });

  it("the analysis record names the program version from package.json (regression: it said 'unknown')", async () => {
    const version = (JSON.parse(readFileSync(resolve(ROOT, 'package.json'), 'utf8')) as { version: string }).version;
    const row = results().locator('table[data-table-id="RunFacts"] tbody tr', { hasText: 'Program version' });
    await expect(row.locator('td').nth(1).innerText()).resolves.toBe(version);
  });

  it('the model sheet shows its tables and the trajectory chart (picture for docs/page-results.png)', async () => {
    const model = results().locator('section.sheet', { has: page.locator('table[data-table-id="FixedEffects"]') });
    const chart = model.locator('figure.chart', { has: page.locator('svg[role="img"]') });
    await expect(chart.count()).resolves.toBe(1);
    // Every chart's legend speaks only of what the chart drew: shaded bands (polygons), whiskers (line groups).
    const legends = await results()
      .locator('figure.chart')
      .evaluateAll((figures) =>
        figures.map((f) => ({
          note: f.querySelector('.chart-legend-note')?.textContent ?? '',
          bands: f.querySelectorAll('svg[role="img"] polygon[opacity="0.15"]').length, // markers are polygons too
          whiskers: f.querySelectorAll('svg[role="img"] g[stroke] line').length,
        })),
      );
    expect(legends.length).toBeGreaterThan(0);
    for (const l of legends) {
      expect(/shaded/i.test(l.note), l.note).toBe(l.bands > 0);
      expect(/whiskers/i.test(l.note), l.note).toBe(l.whiskers > 0);
    }
    // One picture from the sheet's title down to the chart: the viewport is made tall enough to hold all of it.
    const span = await model.evaluate((el) => {
      const fig = el.querySelector('figure.chart');
      return fig === null ? 0 : fig.getBoundingClientRect().bottom - el.getBoundingClientRect().top;
    });
    expect(span).toBeGreaterThan(0);
    await page.setViewportSize({ width: 1280, height: Math.min(4000, Math.ceil(span) + 80) });
    await model.evaluate((el) => el.scrollIntoView({ block: 'start' }));
    const box = await model.boundingBox();
    expect(box).not.toBeNull();
    if (box !== null) {
      await page.screenshot({
        path: join(ARTIFACTS, 'page-results.png'),
        clip: { x: box.x, y: box.y, width: box.width, height: Math.min(box.height, span + 16) },
      });
    }
    await page.setViewportSize({ width: 1280, height: 900 });
    publish('page-results.png', 'page-results.png');
  }, 120_000);

  it('a problem link shows the data row of its cell, and the report downloads as an .xlsx file', async () => {
    const links = pane().getByRole('button', { name: /^Go to cell / });
    // Four cells of the demo data are wrong on purpose (demo/README.md), so there must be problem links to follow.
    await expect(links.count()).resolves.toBeGreaterThan(0);
    const name = (await links.first().getAttribute('aria-label')) ?? '';
    expect(name).toMatch(/^Go to cell .+/);
    await links.first().click();
    await results()
      .getByText(`Cell ${name.replace('Go to cell ', '')} in egfr-visits.csv`)
      .waitFor();
    const [download] = await Promise.all([
      page.waitForEvent('download'),
      results().getByRole('button', { name: 'Download report (.xlsx)' }).click(),
    ]);
    const saved = join(ARTIFACTS, 'demo-report.xlsx');
    await download.saveAs(saved);
    expect(readFileSync(saved).subarray(0, 2).toString('latin1')).toBe('PK'); // an .xlsx is a ZIP (ECMA-376 Part 2)
    // The workbook holds exactly the sheets the pane lists as written, and its counts carry the integer format "0".
    const listed = (await pane().getByRole('list', { name: 'Sheets written' }).getByRole('listitem').allInnerTexts()).map(
      (t) => t.split(':')[0]?.trim() ?? '',
    );
    const book = new ExcelJS.Workbook();
    await book.xlsx.readFile(saved);
    expect(book.worksheets.map((w) => w.name)).toEqual(listed);
    const model = book.getWorksheet('Model results');
    let patients: ExcelJS.Cell | undefined;
    model?.eachRow((row) => {
      if (row.getCell(1).value === 'Participants') patients = row.getCell(2);
    });
    expect(patients?.value).toBe(240); // 240 invented participants in the demo trial (demo/README.md)
    expect(patients?.numFmt).toBe('0');
  }, 120_000);

  it('a blinded run shows no arm anywhere in the results', async () => {
    await pane().getByText('Blinded: pooled results, no arms (default)').click();
    expect(
      await pane()
        .getByRole('radio', { name: /^Blinded/ })
        .isChecked(),
    ).toBe(true);
    await run();
    await expect(results().locator('table[data-table-id="ByVisit"] tr').count()).resolves.toBe(1 + 5);
    await expect(results().locator('table[data-table-id="DifferenceByVisit"]').count()).resolves.toBe(0);
    await pane()
      .getByText(/^Intraclass correlation /)
      .waitFor();
    // Going to a problem's cell shows its data row, but only the columns a blinded run read.
    const link = pane()
      .getByRole('button', { name: /^Go to cell / })
      .first();
    const address = ((await link.getAttribute('aria-label')) ?? '').replace('Go to cell ', '');
    await link.click();
    await results().getByText(`Cell ${address} in egfr-visits.csv`).waitFor();
    const text = await results().innerText();
    for (const arm of ['Placebo', 'Active', 'TRT01P']) expect(text).not.toContain(arm);
    // The results step's links (sheets, problem cells) have accessible names too, and fit the pane's width; so do
    // the controls of the results beside the pane (download, sheet links, "show all rows").
    await expect(namelessControls()).resolves.toEqual([]);
    await expect(namelessControls(results())).resolves.toEqual([]);
    const { client, scroll } = await paneWidths();
    expect(scroll).toBe(client);
    await page.screenshot({ path: join(ARTIFACTS, 'page-blinded.png'), fullPage: false });
    // The pane scrolls inside the page: picture it from the Run step down (what the user sees after a run), and
    // separately at the height of its whole content.
    await pane()
      .locator('#step-run')
      .evaluate((el) => el.scrollIntoView({ block: 'start' }));
    await pane().screenshot({ path: join(ARTIFACTS, 'pane-after-demo-run.png') });
    const height = await pane().evaluate((el) => el.scrollHeight);
    await page.setViewportSize({ width: 1280, height: Math.min(8000, height) });
    const whole = await pane().screenshot({ path: join(ARTIFACTS, 'pane-whole.png') });
    // Where each of the five steps starts in that picture, for the README's picture of all five side by side.
    const stepTops = await pane().evaluate((el) => {
      const top = el.getBoundingClientRect().top;
      return [...el.querySelectorAll('section[id^="step-"]')].map((s) => Math.round(s.getBoundingClientRect().top - top));
    });
    await page.setViewportSize({ width: 1280, height: 900 });
    expect(stepTops).toHaveLength(5);
    await paneInColumns(whole, stepTops, Math.min(8000, height), join(ARTIFACTS, 'pane-steps.png'));
    // The README's picture shows all five steps (regression: it showed only the last two).
    publish('pane-steps.png', 'pane-demo.png');
  }, 180_000);

  it('reads the same visits from an .xlsx workbook in the browser, with numbers kept as numbers', async () => {
    // The demo CSV written into a workbook (exceljs): a header row and 920 data rows, AVAL as numbers.
    const lines = readFileSync(DEMO_VISITS, 'utf8').trim().split(/\r?\n/);
    const book = new ExcelJS.Workbook();
    const sheet = book.addWorksheet('Visits');
    lines.forEach((line, i) =>
      sheet.addRow(line.split(',').map((v, j) => (i > 0 && j === 6 && v !== '' && Number.isFinite(Number(v)) ? Number(v) : v))),
    );
    const path = join(ARTIFACTS, 'egfr-visits.xlsx');
    await book.xlsx.writeFile(path);
    await pane().getByLabel('Visit data file (CSV or Excel .xlsx)').setInputFiles(path);
    await pane()
      .getByText(/^Read egfr-visits\.xlsx \(sheet Visits\): 920 rows\./)
      .waitFor();
    await expect(pane().getByTestId('data-file-name').innerText()).resolves.toBe('egfr-visits.xlsx (sheet Visits)');
    expect(await pane().getByRole('combobox', { name: 'Value', exact: true }).inputValue()).toBe('6');
  });

  it('runs happen in the page\'s engine worker, and a cancel pressed during a run stops it with nothing written', async () => {
    // The engine worker is a script of the page's own origin (CSP worker-src 'self'), and so is the report's
    // compressor worker it starts once a report has been downloaded (workerCompressor.ts): two at most, none other.
    const workers = page.workers().map((w) => w.url());
    expect(workers.length).toBeGreaterThanOrEqual(1);
    expect(workers.length).toBeLessThanOrEqual(2);
    for (const u of workers) expect(u.startsWith(`${base}/`) && u.endsWith('.js'), u).toBe(true);
    // An invented listing large enough that its first stage takes a while: 60,000 participants × 3 visits of the
    // demo schedule's first three, generated here (invented data, for this test only).
    const lines = ['USUBJID,SITEID,TRT01P,AVISIT,ADT,RANDDT,AVAL'];
    const day = (d: number): string => new Date(Date.UTC(2025, 0, 6 + d)).toISOString().slice(0, 10);
    for (let p = 0; p < 60_000; p++) {
      const id = `KFT-${String(p % 12 + 1).padStart(2, '0')}-${String(p).padStart(6, '0')}`;
      const arm = p % 2 === 0 ? 'Placebo' : 'Active';
      const rand = p % 270;
      [['Baseline', 0], ['Week 12', 84], ['Week 24', 168]].forEach(([visit, target]) =>
        lines.push(`${id},Site ${p % 12 + 1},${arm},${visit},${day(rand + Number(target) + (p % 7) - 3)},${day(rand)},${50 + (p % 30)}.5`),
      );
    }
    const big = join(ARTIFACTS, 'cancel-listing.csv');
    writeFileSync(big, `${lines.join('\n')}\n`);
    await pane().getByLabel('Visit data file (CSV or Excel .xlsx)').setInputFiles(big);
    await pane().getByText(/^Read cancel-listing\.csv: 180000 rows\./).waitFor({ timeout: 120_000 });
    await pane().getByRole('button', { name: 'Confirm columns' }).click();
    await recordStatus();
    await pane().getByRole('button', { name: 'Run the analysis' }).click();
    await pane().getByRole('button', { name: 'Cancel' }).click();
    await pane().getByText('The run was stopped. Nothing was written.').first().waitFor({ timeout: 120_000 });
    const said = await statusTexts();
    expect(said).toContain('Stopping the run…');
    expect(said.some((t) => t.startsWith('Writing the result sheets'))).toBe(false);
    await expect(pane().getByRole('heading', { name: 'Sheets written' }).count()).resolves.toBe(0);
  }, 240_000);

  it('the page made no request to any address but the local server, no request failed, and nothing was logged as an error', () => {
    const local = (url: string): boolean =>
      url.startsWith(`${base}/`) || url.startsWith('blob:') || url.startsWith('data:');
    expect(requests.length).toBeGreaterThan(0);
    expect(requests.filter((u) => !local(u))).toEqual([]);
    expect(pageErrors).toEqual([]);
    expect(failedResponses).toEqual([]);
    expect(consoleErrors).toEqual([]);
  });
});
