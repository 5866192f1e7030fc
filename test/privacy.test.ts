/**
 * SPEC §8: no network request of any kind from the add-in's own code; the Office platform's script is the only
 * outside script. Checked three ways: our sources name no network API; the built bundles in dist/ contain network
 * words only inside library code we can name, each with the reason it never runs for us; the built pages load no
 * script, style or font from elsewhere except office.js in the task pane. `npm test` builds dist/ before this runs.
 */
import { existsSync, readFileSync, readdirSync, statSync } from 'node:fs';
import { createRequire } from 'node:module';
import { join, relative } from 'node:path';
import { describe, expect, it } from 'vitest';

const root = join(import.meta.dirname, '..');
const dist = join(root, 'dist');
const OFFICE_SCRIPT = 'https://appsforoffice.microsoft.com/lib/1/hosted/office.js';

/** Browser APIs that send or fetch something, as they appear in code. */
const NETWORK_WORDS = ['fetch(', 'XMLHttpRequest', 'WebSocket', 'sendBeacon', 'EventSource', 'importScripts', 'createElement("script")', "createElement('script')"];

function files(dir: string, keep: (f: string) => boolean): string[] {
  const out: string[] = [];
  for (const name of readdirSync(dir)) {
    const p = join(dir, name);
    if (statSync(p).isDirectory()) out.push(...files(p, keep));
    else if (keep(p)) out.push(p);
  }
  return out;
}

function requireDist(): void {
  if (!existsSync(join(dist, 'taskpane.html'))) throw new Error('dist/ is missing: run `npm run build` first (npm test does).');
}

/**
 * Library code in the bundles that contains a network word, recognised by the text around it. Each was read in the
 * bundle built from the locked versions (see the report of the add-in build):
 */
const LIBRARY_USES: readonly { readonly word: string; readonly around: RegExp; readonly reason: string }[] = [
  {
    word: 'createElement("script")',
    around: /hoistableScripts|case"script":return/,
    reason: "react-dom's resource hoisting (preinit/preload, or a <script async src> rendered in JSX): runs only if our components render a <script> or call preinit; they do neither (checked in our sources below).",
  },
  {
    word: 'importScripts',
    around: /\.f\.i=\w+=>\{\w+\[\w+\]\|\|importScripts\(\w+\.p\+\w+\.u\(\w+\)\)/,
    reason: "webpack's chunk loader inside the page's engine worker: loads the page's own script chunks from dist/, addressed relative to the worker's script (publicPath ''); the pages' CSP allows scripts from their own origin only.",
  },
  {
    word: 'XMLHttpRequest',
    around: /_readChunk|withCredentials/,
    reason: "papaparse's network streamer, used only with its `download: true` option; our CSV reading passes text, never that option (checked in our sources below).",
  },
];

/** Hosts whose addresses appear in library code as text only (namespace names, links in error messages). */
const TEXT_ONLY_HOSTS: Readonly<Record<string, string>> = {
  'www.w3.org': 'XML, SVG and MathML namespace names (react-dom); namespaces are names, never fetched',
  'schemas.openxmlformats.org': 'ECMA-376 namespace names written into .xlsx files by the report writer (src/files)',
  'purl.org': 'the Dublin Core namespace name in the .xlsx document properties (src/files/xlsxParts.ts)',
  'react.dev': "react's production error messages link to its error decoder; shown as text, not fetched",
  'github.com': "a link in the Fluent UI styling library's (griffel) message asking to report an issue; shown as text, not fetched",
  'aka.ms': "a link in a Fluent UI styling library's message about CSS shorthands; shown as text, not fetched",
};

describe('our own code makes no network request', () => {
  const ours = files(join(root, 'src'), (f) => /\.(ts|tsx|html)$/.test(f));

  it('names no network API, script loader or remote-loading option in src/', () => {
    const found: string[] = [];
    const patterns = [...NETWORK_WORDS.map((w) => new RegExp(w.replace(/[.*+?^${}()|[\]\\]/g, '\\$&'))), /\bpreinit\w*\(|\bpreload\(|\bpreconnect\(|\bprefetchDNS\(/, /download\s*:\s*true/, /<script\b[^>]*\bsrc=/i, /<link\b[^>]*\bhref=["']?https?:/i, /@import\s+url\(/i, /\bnew\s+(Worker|SharedWorker)\(/];
    for (const f of ours) {
      const text = readFileSync(f, 'utf8');
      for (const p of patterns) {
        const m = p.exec(text);
        if (m === null) continue;
        // The task pane page may load the Office platform's own script, and only that.
        if (relative(root, f) === join('src', 'excel', 'taskpane.html') && m[0].startsWith('<script')) continue;
        // The page starts one worker, its engine, from a script of its own built beside it (CSP worker-src 'self').
        if (relative(root, f) === join('src', 'web', 'workerEngine.ts') && m[0].startsWith('new Worker') && text.includes("new Worker(new URL('./engine.worker.ts', import.meta.url))")) continue;
        // The engine worker starts one worker of its own, the report's compressor, from a script built beside it too.
        if (relative(root, f) === join('src', 'web', 'workerCompressor.ts') && m[0].startsWith('new Worker') && text.includes("new Worker(new URL('./compress.worker.ts', import.meta.url))")) continue;
        found.push(`${relative(root, f)}: ${m[0]}`);
      }
    }
    expect(ours.length).toBeGreaterThan(10);
    expect(found).toEqual([]);
  });

  it('the task pane page template loads office.js from the platform address and nothing else from elsewhere', () => {
    const html = readFileSync(join(root, 'src', 'excel', 'taskpane.html'), 'utf8');
    const external = [...html.matchAll(/\b(?:src|href)=["']?(https?:[^"' >]+)/gi)].map((m) => m[1]);
    expect(external).toEqual([OFFICE_SCRIPT]);
  });
});

describe('built bundles in dist/', () => {
  it('contain network words only inside the named library code, for the reasons listed', () => {
    requireDist();
    const unexplained: string[] = [];
    const bundles = files(dist, (f) => f.endsWith('.js'));
    expect(bundles.length).toBeGreaterThanOrEqual(2);
    for (const f of bundles) {
      const text = readFileSync(f, 'utf8');
      for (const word of NETWORK_WORDS) {
        for (let at = text.indexOf(word); at >= 0; at = text.indexOf(word, at + 1)) {
          const around = text.slice(Math.max(0, at - 300), at + 300);
          const known = LIBRARY_USES.some((u) => u.word === word && u.around.test(around));
          if (!known) unexplained.push(`${relative(root, f)} @${at}: ${word} … ${text.slice(Math.max(0, at - 80), at + 80)}`);
        }
      }
    }
    expect(unexplained).toEqual([]);
  });

  it('mention outside addresses only as text from the listed hosts, and carry no source-map link', () => {
    requireDist();
    const hosts = new Set<string>();
    for (const f of files(dist, (p) => p.endsWith('.js'))) {
      const text = readFileSync(f, 'utf8');
      expect(text).not.toMatch(/sourceMappingURL=/);
      for (const m of text.matchAll(/https?:\/\/([a-zA-Z0-9.-]+)/g)) hosts.add(m[1] ?? '');
    }
    const unknown = [...hosts].filter((h) => !(h in TEXT_ONLY_HOSTS));
    expect(unknown).toEqual([]);
  });

  it('taskpane.html loads office.js from the platform address and everything else from its own origin', () => {
    requireDist();
    const html = readFileSync(join(dist, 'taskpane.html'), 'utf8');
    const scripts = [...html.matchAll(/<script\b[^>]*\bsrc=["']?([^"' >]+)/gi)].map((m) => m[1] ?? '');
    expect(scripts.filter((s) => /^(https?:)?\/\//.test(s))).toEqual([OFFICE_SCRIPT]);
    expect(scripts.some((s) => /^taskpane\.[0-9a-f]+\.js$/.test(s))).toBe(true);
    expect([...html.matchAll(/\bhref=["']?((?:https?:)?\/\/[^"' >]+)/gi)]).toEqual([]);
    expect(html).not.toMatch(/@import|url\(\s*["']?(?:https?:)?\/\//i);
  });

  it('index.html (the browser page) loads no script, style or font from anywhere else, office.js included', () => {
    requireDist();
    const html = readFileSync(join(dist, 'index.html'), 'utf8');
    expect([...html.matchAll(/\b(?:src|href)=["']?((?:https?:)?\/\/[^"' >]+)/gi)].map((m) => m[1])).toEqual([]);
    expect(html).not.toMatch(/@import|url\(\s*["']?(?:https?:)?\/\//i);
    expect(html).not.toContain('office.js');
  });
});

describe("the platform tooling's usage-data reporting", () => {
  it('is off: the installed office-addin-usage-data reports nothing and says so', async () => {
    // office-addin-usage-data 3.x (used by office-addin-manifest and office-addin-dev-certs) removed reporting: every
    // report method is a no-op and isUsageDataOn() is false. This pins that; an upgrade that brings reporting back
    // fails here and must be switched off before it lands.
    const req = createRequire(import.meta.url);
    const usage = req('office-addin-usage-data') as {
      OfficeAddinUsageData: new (o: object) => { isUsageDataOn(): boolean; getUsageDataLevel(): string };
    };
    const probe = new usage.OfficeAddinUsageData({ projectName: 'longipane', instrumentationKey: '', promptQuestion: '', raisePrompt: false, usageDataLevel: 'off' });
    expect(probe.isUsageDataOn()).toBe(false);
    expect(probe.getUsageDataLevel()).toBe('off');
    const installed = files(join(root, 'node_modules'), (f) => f.endsWith('package.json') && f.includes('applicationinsights')).length;
    expect(installed).toBe(0);
  });
});
