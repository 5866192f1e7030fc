/** The workbook date-system probe (src/excel/dateSystem.ts) against office-addin-mock, both ways. */
import { afterEach, describe, expect, it } from 'vitest';
import { dateSystemFromProbe, probeDateSystem } from '../../src/excel/dateSystem';
import { installExcelMock } from './officeMock';

function workbookAnswering(value: unknown): { calls: unknown[][] } {
  const calls: unknown[][] = [];
  installExcelMock({
    workbook: {
      functions: {
        result: { value },
        date: function (this: { result: unknown }, ...args: unknown[]) {
          calls.push(args);
          return this.result;
        },
      },
    },
  });
  return { calls };
}

afterEach(() => {
  Reflect.deleteProperty(globalThis, 'Excel');
});

describe('probeDateSystem', () => {
  it('asks the workbook for DATE(1904,1,1) and reads 1462 as the 1900 system', async () => {
    // 1462 = days from 1899-12-30 to 1904-01-01 (exact identity: 4 · 365 + 1 leap day + 1, ECMA-376 Part 1 §18.17.4.1).
    const wb = workbookAnswering(1462);
    await expect(probeDateSystem()).resolves.toBe(1900);
    expect(wb.calls).toEqual([[1904, 1, 1]]);
  });

  it('reads 0 as the 1904 system, whose day 0 is 1904-01-01 (ECMA-376 Part 1 §18.17.4.1)', async () => {
    workbookAnswering(0);
    await expect(probeDateSystem()).resolves.toBe(1904);
  });

  it('rejects any other answer with a message that names it', async () => {
    workbookAnswering('#VALUE!');
    await expect(probeDateSystem()).rejects.toThrow(/date system.*"#VALUE!"/);
    expect(() => dateSystemFromProbe(1461)).toThrow(/1461/);
  });
});
