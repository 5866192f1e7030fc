// @vitest-environment jsdom
/**
 * The task pane's entry (src/excel/main.tsx) with a stand-in Office global: which host, which API level, and what
 * the page shows when there is no Office host at all (opened on its own in a browser).
 */
import '../taskpane/jsdomSetup';
import { afterEach, describe, expect, it, vi } from 'vitest';
import { act } from '@testing-library/react';

afterEach(() => {
  Reflect.deleteProperty(globalThis, 'Office');
  Reflect.deleteProperty(globalThis, 'Excel');
  document.body.innerHTML = '';
  vi.useRealTimers();
  vi.resetModules();
});

/** A stand-in Office global whose onReady promise settles with `ready` (or never, for a page with no host). */
function stubOffice(ready: Promise<{ host: string | null }>, highest = 20): void {
  const isSetSupported = (name: string, version: string): boolean =>
    name === 'ExcelApi' && Number(version.split('.')[1]) <= highest;
  Object.assign(globalThis, {
    Office: {
      HostType: { Excel: 'Excel', Word: 'Word' },
      context: { requirements: { isSetSupported } },
      onReady: () => ready,
    },
    // Any workbook request fails: the pane must still show, with the reason in its status line.
    Excel: { run: () => Promise.reject(new Error('no workbook in this test')) },
  });
}

/** Loads the entry as the task pane page would and returns the page's root element. */
async function load(): Promise<HTMLElement> {
  document.body.innerHTML = '<div id="root"></div>';
  await act(async () => {
    await import('../../src/excel/main');
  });
  const root = document.getElementById('root');
  if (root === null) throw new Error('root missing');
  return root;
}

/** Loads the entry in a host named `host` that supports ExcelApi up to 1.`highest`. */
async function start(host: string, highest: number): Promise<HTMLElement> {
  stubOffice(Promise.resolve({ host }), highest);
  return load();
}

/** The outside-Excel message's parts: what it is, where it runs, how to add it, the link to the browser page. */
function expectOutsideMessage(root: HTMLElement): void {
  expect(root.querySelector('h1')?.textContent).toBe('Longipane for Excel');
  expect(root.textContent).toMatch(/checks visit timing against the protocol's visit windows/);
  expect(root.textContent).toMatch(/runs only inside Excel/);
  expect(root.textContent).toMatch(/open it from the Longipane button on Excel's Home tab/);
  expect(root.textContent).toMatch(/Upload My Add-in/);
  const links = Array.from(root.querySelectorAll('a')).map((a) => [a.getAttribute('href'), a.textContent]);
  // Relative links only: they work under whatever address the files are served from.
  expect(links).toEqual([
    ['manifest.xml', 'download manifest.xml'],
    ['index.html', 'open the browser page'],
  ]);
}

describe('task pane entry', () => {
  it('in another Office application it says the pane runs inside Excel, names that application and links to the browser page', async () => {
    const root = await start('Word', 20);
    expectOutsideMessage(root);
    expect(root.textContent).toMatch(/runs only inside Excel, not in Word\./);
  });

  it('when the platform reports no host (a plain browser) it shows the outside-Excel message', async () => {
    stubOffice(Promise.resolve({ host: null }));
    const root = await load();
    expectOutsideMessage(root);
    expect(root.textContent).toMatch(/opened on its own, as here, it has no workbook to work on/);
  });

  it('when the Office script did not load at all it shows the outside-Excel message at once', async () => {
    const root = await load();
    expectOutsideMessage(root);
  });

  it('when no host answers it stays empty for OFFICE_WAIT_MS, then shows the outside-Excel message', async () => {
    vi.useFakeTimers();
    stubOffice(new Promise(() => undefined));
    const root = await load();
    const { OFFICE_WAIT_MS } = await import('../../src/excel/main');
    expect(OFFICE_WAIT_MS).toBeLessThanOrEqual(5000); // "a few seconds" (the issue); longer looks like a blank page
    await act(async () => {
      await vi.advanceTimersByTimeAsync(OFFICE_WAIT_MS - 1);
    });
    expect(root.textContent).toBe('');
    await act(async () => {
      await vi.advanceTimersByTimeAsync(1);
    });
    expectOutsideMessage(root);
  });

  it('an Excel host that answers after the wait replaces the message with the pane', async () => {
    vi.useFakeTimers();
    let answer: (info: { host: string }) => void = () => undefined;
    stubOffice(new Promise((ok) => (answer = ok)));
    const root = await load();
    await act(async () => {
      await vi.advanceTimersByTimeAsync(10_000);
    });
    expectOutsideMessage(root);
    vi.useRealTimers();
    await act(async () => {
      answer({ host: 'Excel' });
      await Promise.resolve();
    });
    expect(root.querySelector('h1')?.textContent).toBe('Longipane');
    expect(root.textContent).toContain('Use the selected cells');
  });

  it('when onReady fails it shows the outside-Excel message rather than a blank page', async () => {
    stubOffice(Promise.reject(new Error('host refused')));
    const root = await load();
    expectOutsideMessage(root);
  });

  it('in an Excel older than ExcelApi 1.7 it says a newer Excel is needed instead of failing later', async () => {
    const root = await start('Excel', 6);
    expect(root.textContent).toBe(
      'Longipane needs a newer version of Excel (one that supports the Excel JavaScript API 1.7 or later).',
    );
  });

  it('in Excel with ExcelApi 1.7 it mounts the pane with its five steps', async () => {
    const root = await start('Excel', 7);
    expect(root.querySelector('h1')?.textContent).toBe('Longipane');
    expect(root.querySelectorAll('section h2')).toHaveLength(5);
    expect(root.textContent).toContain('Use the selected cells');
  });
});
