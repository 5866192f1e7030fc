/**
 * End to end: the built browser page (dist/) in Debian's Chromium, driven with playwright-core. Loads the invented
 * demo trial, runs unblinded and blinded, checks what the page shows, that it asks nothing of any other address, and
 * saves screenshots (test-artifacts/, and docs/pane-demo.png for the README).
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { execFileSync } from 'node:child_process';
import { copyFileSync, existsSync, mkdirSync, mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { createServer, type Server } from 'node:http';
import type { AddressInfo } from 'node:net';
import { tmpdir } from 'node:os';
import { extname, join, normalize, resolve, sep } from 'node:path';
import { chromium, type BrowserContext, type Page } from 'playwright-core';

const ROOT = process.cwd();
const DIST = resolve(ROOT, 'dist');
const ARTIFACTS = resolve(ROOT, 'test-artifacts');
const DEMO_VISITS = resolve(ROOT, 'demo/egfr-visits.csv');
const DEMO_SCHEDULE = resolve(ROOT, 'demo/egfr-schedule.csv');

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

function chromiumPath(): string {
  if (process.env.CHROMIUM_PATH) return process.env.CHROMIUM_PATH;
  try {
    return execFileSync('which', ['chromium'], { encoding: 'utf8' }).trim();
  } catch {
    return '/usr/bin/chromium';
  }
}

let server: Server;
let context: BrowserContext;
let page: Page;
let base: string;
let profile: string;
const requests: string[] = [];
const pageErrors: string[] = [];

beforeAll(async () => {
  if (!existsSync(join(DIST, 'index.html'))) {
    throw new Error('dist/index.html is missing: build the page first with `npm run build` (this test serves dist/).');
  }
  const executablePath = chromiumPath();
  if (!existsSync(executablePath)) {
    throw new Error(
      `Chromium not found at ${executablePath}: install it with \`apt-get install -y --no-install-recommends chromium\`.`,
    );
  }
  mkdirSync(ARTIFACTS, { recursive: true });
  server = await serve(DIST);
  base = `http://127.0.0.1:${(server.address() as AddressInfo).port}`;
  profile = mkdtempSync(join(tmpdir(), 'longipane-e2e-'));
  context = await chromium.launchPersistentContext(profile, {
    executablePath,
    headless: true,
    acceptDownloads: true,
    viewport: { width: 1280, height: 900 },
    args: [
      '--headless',
      '--no-sandbox',
      '--disable-gpu',
      '--disable-background-networking',
      '--disable-quic',
      '--no-first-run',
      '--disable-component-update',
      '--disable-sync',
    ],
  });
  context.on('request', (r) => requests.push(r.url()));
  page = context.pages()[0] ?? (await context.newPage());
  page.on('pageerror', (e) => pageErrors.push(e.message));
  await page.goto(`${base}/index.html`);
});

afterAll(async () => {
  await context?.close();
  await new Promise((ok) => (server ? server.close(ok) : ok(undefined)));
  if (profile) rmSync(profile, { recursive: true, force: true });
});

const pane = (): ReturnType<Page['locator']> => page.locator('.pane');
const results = (): ReturnType<Page['locator']> => page.locator('.results-area');

async function run(): Promise<void> {
  await pane().getByRole('button', { name: 'Run the analysis' }).click();
  await pane().getByRole('heading', { name: 'Sheets written' }).waitFor({ timeout: 120_000 });
}

describe('the browser page with the invented demo trial', () => {
  it('reads the demo data, proposes the CDISC columns, and reads the demo schedule', async () => {
    await pane().getByLabel('Visit data file (CSV or Excel .xlsx)').setInputFiles(DEMO_VISITS);
    await pane().getByText('Which column is which?').waitFor();
    expect(await pane().getByLabel('Patient', { exact: true }).inputValue()).toBe('0'); // USUBJID, first column
    expect(await pane().getByLabel('Measured value', { exact: true }).inputValue()).toBe('6'); // AVAL
    await pane().getByRole('button', { name: 'Confirm columns' }).click();
    await pane().getByLabel('Schedule file (CSV)').setInputFiles(DEMO_SCHEDULE);
    await pane().getByRole('region', { name: 'Visit schedule' }).getByText('Week 48').waitFor();
  });

  it('an unblinded run, after confirming, shows visit timing by visit and the treatment difference', async () => {
    await pane().getByText('Unblinded: results by treatment arm').click();
    const dialog = page.getByRole('alertdialog');
    await expect(dialog.getByText(/unblinded statistician/).isVisible()).resolves.toBe(true);
    await dialog.getByRole('button', { name: /switch to unblinded/ }).click();
    await pane().getByLabel('Reference arm (compared against)').selectOption('Placebo');
    await run();
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

  it('a problem link shows the data row of its cell, and the report downloads as an .xlsx file', async () => {
    const links = pane().getByRole('button', { name: /^Go to cell / });
    if ((await links.count()) > 0) {
      const name = (await links.first().getAttribute('aria-label')) ?? '';
      await links.first().click();
      await results()
        .getByText(`Cell ${name.replace('Go to cell ', '')} in egfr-visits.csv`)
        .waitFor();
    }
    const [download] = await Promise.all([
      page.waitForEvent('download'),
      results().getByRole('button', { name: 'Download report (.xlsx)' }).click(),
    ]);
    const saved = join(ARTIFACTS, 'demo-report.xlsx');
    await download.saveAs(saved);
    expect(readFileSync(saved).subarray(0, 2).toString('latin1')).toBe('PK'); // an .xlsx is a ZIP (ECMA-376 Part 2)
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
    await page.screenshot({ path: join(ARTIFACTS, 'page-blinded.png'), fullPage: false });
    // The pane scrolls inside the page: picture it from the Run step down (what the user sees after a run), and
    // separately at the height of its whole content.
    await pane()
      .locator('#step-run')
      .evaluate((el) => el.scrollIntoView({ block: 'start' }));
    await pane().screenshot({ path: join(ARTIFACTS, 'pane-after-demo-run.png') });
    const height = await pane().evaluate((el) => el.scrollHeight);
    await page.setViewportSize({ width: 1280, height: Math.min(8000, height) });
    await pane().screenshot({ path: join(ARTIFACTS, 'pane-whole.png') });
    await page.setViewportSize({ width: 1280, height: 900 });
    copyFileSync(join(ARTIFACTS, 'pane-after-demo-run.png'), resolve(ROOT, 'docs/pane-demo.png'));
  }, 180_000);

  it('the page made no request to any address but the local server, and raised no script error', () => {
    const local = (url: string): boolean =>
      url.startsWith(`${base}/`) || url.startsWith('blob:') || url.startsWith('data:');
    expect(requests.length).toBeGreaterThan(0);
    expect(requests.filter((u) => !local(u))).toEqual([]);
    expect(pageErrors).toEqual([]);
  });
});
