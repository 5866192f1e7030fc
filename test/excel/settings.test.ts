/** Settings kept in the workbook (src/excel/settings.ts) against office-addin-mock. */
import { afterEach, describe, expect, it } from 'vitest';
import { loadSavedSettings, parseSaved, saveSettings, SETTINGS_KEY } from '../../src/excel/settings';
import { installExcelMock } from './officeMock';

function workbookWith(stored: string | null): { added: [string, unknown][] } {
  const added: [string, unknown][] = [];
  const mock = installExcelMock({
    workbook: {
      settings: {
        item: { value: stored ?? '' },
        getItemOrNullObject: function (this: { item: unknown }, key: string) {
          expect(key).toBe(SETTINGS_KEY);
          return this.item;
        },
        add: (key: string, value: unknown) => {
          added.push([key, value]);
        },
      },
    },
  });
  // In Excel, isNullObject needs no load(); office-addin-mock treats every property as loadable, so it is set on the
  // mocked item directly (a small stand-in for what the mock cannot express).
  const item = (mock.excel as unknown as { context: { workbook: { settings: { item: object } } } }).context.workbook.settings.item;
  Object.defineProperty(item, 'isNullObject', { value: stored === null });
  return { added };
}

afterEach(() => {
  Reflect.deleteProperty(globalThis, 'Excel');
});

describe('workbook settings', () => {
  it('loadSaved gives null when the workbook holds no Longipane settings', async () => {
    workbookWith(null);
    await expect(loadSavedSettings()).resolves.toBeNull();
  });

  it('save stores one JSON string under one key, and load gives the same object back', async () => {
    const saved = { scheduleSource: 'Visit schedule', mapping: { subject: 0, date: 1, value: 3, covariates: [] }, settings: { mode: 'blinded' as const, level: 0.95 } };
    const wb = workbookWith(null);
    await saveSettings(saved);
    expect(wb.added).toEqual([[SETTINGS_KEY, JSON.stringify(saved)]]);
    workbookWith(JSON.stringify(saved));
    await expect(loadSavedSettings()).resolves.toEqual(saved);
  });

  it('unreadable stored settings reject with a plain message instead of being ignored', async () => {
    workbookWith('{not json');
    await expect(loadSavedSettings()).rejects.toThrow(/not readable/);
    expect(() => parseSaved('[1,2]')).toThrow(/not readable/);
  });
});
