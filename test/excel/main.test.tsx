// @vitest-environment jsdom
/** The task pane's entry (src/excel/main.tsx) with a stand-in Office global: which host, which API level. */
import '../taskpane/jsdomSetup';
import { afterEach, describe, expect, it, vi } from 'vitest';
import { act } from '@testing-library/react';

afterEach(() => {
  Reflect.deleteProperty(globalThis, 'Office');
  Reflect.deleteProperty(globalThis, 'Excel');
  document.body.innerHTML = '';
  vi.resetModules();
});

/** Loads the entry as the task pane page would, in a host named `host` that supports ExcelApi up to 1.`highest`. */
async function start(host: string, highest: number): Promise<HTMLElement> {
  document.body.innerHTML = '<div id="root"></div>';
  const isSetSupported = (name: string, version: string): boolean =>
    name === 'ExcelApi' && Number(version.split('.')[1]) <= highest;
  Object.assign(globalThis, {
    Office: {
      HostType: { Excel: 'Excel', Word: 'Word' },
      context: { requirements: { isSetSupported } },
      onReady: (callback: (info: { host: string }) => void) => {
        callback({ host });
        return Promise.resolve({ host });
      },
    },
    // Any workbook request fails: the pane must still show, with the reason in its status line.
    Excel: { run: () => Promise.reject(new Error('no workbook in this test')) },
  });
  await act(async () => {
    await import('../../src/excel/main');
  });
  const root = document.getElementById('root');
  if (root === null) throw new Error('root missing');
  return root;
}

describe('task pane entry', () => {
  it('outside Excel it says where the pane belongs and points to the browser page', async () => {
    const root = await start('Word', 20);
    expect(root.textContent).toMatch(/open it from the Longipane button on Excel's Home tab/);
    expect(root.textContent).toMatch(/index\.html/);
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
