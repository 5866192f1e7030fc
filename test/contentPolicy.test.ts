import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';

/** The Content-Security-Policy of an HTML file's meta element, as directive → sources (W3C CSP Level 3 syntax). */
function policy(file: string): Map<string, string[]> {
  const html = readFileSync(join(__dirname, '..', file), 'utf8');
  const m = /http-equiv="Content-Security-Policy"\s+content="([^"]*)"/.exec(html);
  expect(m, file).not.toBeNull();
  return new Map(m![1]!.split(';').map((d) => d.trim().split(/\s+/)).filter((p) => p[0]).map((p) => [p[0]!, p.slice(1)]));
}

describe('Content-Security-Policy (issue item 15)', () => {
  it('the page allows scripts, its engine worker and everything else from itself only, and no connections at all', () => {
    const p = policy('src/web/index.html');
    expect(p.get('default-src')).toEqual(["'self'"]);
    expect(p.get('script-src')).toEqual(["'self'"]);
    expect(p.get('connect-src')).toEqual(["'none'"]);
    expect(p.get('object-src')).toEqual(["'none'"]);
    // The engine runs in a worker (src/web/engine.worker.ts), a script of the page's own origin; nothing else.
    expect(p.get('worker-src')).toEqual(["'self'"]);
    for (const sources of p.values()) for (const s of sources) expect(s).not.toMatch(/^https?:|^\*|'unsafe-eval'/);
  });

  it('the task pane allows scripts from itself and the Office platform\'s script host only', () => {
    const p = policy('src/excel/taskpane.html');
    expect(p.get('default-src')).toEqual(["'self'"]);
    expect(p.get('script-src')).toEqual(["'self'", 'https://appsforoffice.microsoft.com']);
    for (const sources of p.values()) for (const s of sources) expect(s === 'https://appsforoffice.microsoft.com' || !/^https?:|^\*/.test(s)).toBe(true);
  });
});
