/**
 * The built dist/ as a team would host it: under a path prefix (/teams/trial-ops/longipane/) on an HTTPS server, here
 * 127.0.0.1 with a certificate made at test time by the platform tooling's own generator (office-addin-dev-certs,
 * a dev dependency; no network). The task pane page (with the Office platform's script replaced by a stand-in: no
 * Office host, as in a plain browser) and the browser page load in the browser the other browser tests use
 * (test/support/browser.ts), and must: ask for nothing outside the prefix, get no 404 or other failure, print no
 * console error, and find every script the pages name. The task pane page shows the outside-Excel message and its
 * links lead to the browser page and the manifest under the same prefix.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { existsSync, mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { createServer, type Server } from 'node:https';
import type { AddressInfo } from 'node:net';
import { tmpdir } from 'node:os';
import { extname, join, normalize, resolve, sep } from 'node:path';
import { generateCertificates } from 'office-addin-dev-certs';
import type { BrowserContext, Page } from 'playwright-core';
import { launchChromium } from '../support/browser';

const DIST = resolve(process.cwd(), 'dist');
const PREFIX = '/teams/trial-ops/longipane/';
const OFFICE_SCRIPT = 'https://appsforoffice.microsoft.com/lib/1/hosted/office.js';

/** Stand-ins for office.js: the platform outside any Office host answers with no host; a stalled one never answers. */
const NO_HOST_OFFICE = 'window.Office = { HostType: { Excel: "Excel" }, onReady: function () { return Promise.resolve({ host: null, platform: null }); } };';
const STALLED_OFFICE = 'window.Office = { HostType: { Excel: "Excel" }, onReady: function () { return new Promise(function () {}); } };';

const TYPES: Record<string, string> = {
  '.html': 'text/html; charset=utf-8',
  '.js': 'text/javascript; charset=utf-8',
  '.png': 'image/png',
  '.xml': 'application/xml',
};

/** What the server was asked for: the path and the status it answered. */
interface Served {
  path: string;
  status: number;
}

/** A static HTTPS server for dist/ under PREFIX only; everything else is a 404, and every request is recorded. */
function serve(dir: string, tls: { cert: Buffer; key: Buffer }, log: Served[]): Promise<Server> {
  const server = createServer(tls, (req, res) => {
    const path = decodeURIComponent(new URL(req.url ?? '/', 'https://x').pathname);
    const file = path.startsWith(PREFIX) ? normalize(join(dir, path.slice(PREFIX.length))) : '';
    const found = file.startsWith(dir + sep) && existsSync(file);
    log.push({ path, status: found ? 200 : 404 });
    if (!found) {
      res.writeHead(404).end('not found');
      return;
    }
    res.writeHead(200, { 'content-type': TYPES[extname(file)] ?? 'application/octet-stream' }).end(readFileSync(file));
  });
  return new Promise((ok) => server.listen(0, '127.0.0.1', () => ok(server)));
}

/** The relative script addresses a built page names (webpack writes them relative: publicPath ''). */
function scriptsOf(page: string): string[] {
  const html = readFileSync(join(DIST, page), 'utf8');
  return [...html.matchAll(/<script\b[^>]*\bsrc="([^"]+)"/g)].map((m) => m[1] ?? '').filter((s) => !s.startsWith('https:'));
}

let server: Server;
let context: BrowserContext;
let page: Page;
let origin: string;
let profile: string;
let certDir: string;
let office = NO_HOST_OFFICE;
const served: Served[] = [];
const elsewhere: string[] = [];
const problems: string[] = [];

beforeAll(async () => {
  if (!existsSync(join(DIST, 'taskpane.html'))) throw new Error('dist/ is missing: build it first (npm test does).');
  certDir = mkdtempSync(join(tmpdir(), 'longipane-tls-'));
  const [ca, cert, key] = ['ca.crt', 'server.crt', 'server.key'].map((f) => join(certDir, f)) as [string, string, string];
  await generateCertificates(ca, cert, key, 2, ['127.0.0.1']);
  server = await serve(DIST, { cert: readFileSync(cert), key: readFileSync(key) }, served);
  origin = `https://127.0.0.1:${(server.address() as AddressInfo).port}`;
  profile = mkdtempSync(join(tmpdir(), 'longipane-prefix-'));
  // The certificate is signed by a CA made a moment ago that the browser does not know: accept it, as an
  // organisation's browsers accept its own server's certificate.
  ({ context } = await launchChromium(profile, { ignoreHTTPSErrors: true }));
  await context.route('**/*', async (route) => {
    const url = route.request().url();
    if (url === OFFICE_SCRIPT) {
      await route.fulfill({ status: 200, contentType: 'text/javascript', body: office });
    } else if (url.startsWith(`${origin}/`)) {
      await route.continue();
    } else {
      elsewhere.push(url);
      await route.abort();
    }
  });
  page = context.pages()[0] ?? (await context.newPage());
  page.on('console', (m) => {
    if (m.type() === 'error') problems.push(`console error: ${m.text()}`);
  });
  page.on('pageerror', (e) => problems.push(`page error: ${e.message}`));
  page.on('requestfailed', (r) => problems.push(`request failed: ${r.url()} ${r.failure()?.errorText ?? ''}`));
  page.on('response', (r) => {
    if (r.status() >= 400) problems.push(`HTTP ${r.status()}: ${r.url()}`);
  });
});

afterAll(async () => {
  await context?.close();
  await new Promise((ok) => (server ? server.close(ok) : ok(undefined)));
  for (const dir of [profile, certDir]) if (dir) rmSync(dir, { recursive: true, force: true });
});

/** Clears the records, so each test checks only what its own pages asked for. */
function forget(): void {
  served.length = 0;
  elsewhere.length = 0;
  problems.length = 0;
}

/** Every page request went to the server under the prefix and was found; nothing else was asked for or went wrong. */
function expectClean(pages: string[]): void {
  expect(problems).toEqual([]);
  expect(elsewhere).toEqual([]);
  expect(served.filter((s) => !s.path.startsWith(PREFIX) || s.status !== 200)).toEqual([]);
  const paths = new Set(served.map((s) => s.path));
  for (const p of pages) {
    expect(paths, p).toContain(`${PREFIX}${p}`);
    for (const script of scriptsOf(p)) expect(paths, `${p} → ${script}`).toContain(`${PREFIX}${script}`);
  }
}

describe('dist/ served under a path prefix over HTTPS', () => {
  it('the task pane page outside Excel shows the plain message, loads all its scripts from the prefix, and no error', async () => {
    forget();
    office = NO_HOST_OFFICE;
    const response = await page.goto(`${origin}${PREFIX}taskpane.html`);
    expect(response?.url().startsWith('https://')).toBe(true);
    await page.getByRole('heading', { name: 'Longipane for Excel' }).waitFor({ timeout: 30_000 });
    await expect(page.locator('main').textContent()).resolves.toMatch(/runs only inside Excel/);
    const links = await page.locator('main a').evaluateAll((as) => as.map((a) => (a as HTMLAnchorElement).href));
    expect(links).toEqual([`${origin}${PREFIX}manifest.xml`, `${origin}${PREFIX}index.html`]);
    expectClean(['taskpane.html']);
  });

  it('with an Office script that never answers, the message appears after the wait instead of a blank page', async () => {
    forget();
    office = STALLED_OFFICE;
    await page.goto(`${origin}${PREFIX}taskpane.html`);
    await expect(page.locator('#root').textContent()).resolves.toBe('');
    await page.getByRole('heading', { name: 'Longipane for Excel' }).waitFor({ timeout: 30_000 });
    expectClean(['taskpane.html']);
  });

  it('the message links to the browser page, which loads under the prefix with no error', async () => {
    forget();
    office = NO_HOST_OFFICE;
    await page.goto(`${origin}${PREFIX}taskpane.html`);
    await page.getByRole('link', { name: 'open the browser page' }).click();
    await page.waitForURL(`${origin}${PREFIX}index.html`);
    await page.locator('.pane').getByRole('heading', { name: 'Longipane' }).waitFor({ timeout: 30_000 });
    // The page's engine worker starts with the page, from a script addressed relative to it: under the prefix, and
    // it runs (its message handler is set once its script and the library chunk it imports have loaded).
    await expect.poll(() => page.workers().filter((w) => w.url().startsWith(`${origin}${PREFIX}`)).length).toBe(1);
    const worker = page.workers().find((w) => w.url().startsWith(`${origin}${PREFIX}`));
    await expect.poll(() => worker?.evaluate('typeof self.onmessage')).toBe('function');
    expectClean(['taskpane.html', 'index.html']);
  });

  it('the manifest the message offers is served from the prefix', async () => {
    const response = await context.request.get(`${origin}${PREFIX}manifest.xml`);
    expect(response.status()).toBe(200);
    expect(await response.text()).toBe(readFileSync(join(DIST, 'manifest.xml'), 'utf8'));
  });
});
