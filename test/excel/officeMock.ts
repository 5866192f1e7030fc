/**
 * Helpers for tests of the Office adapter with the platform's mock package (office-addin-mock): a fake Excel global
 * whose objects only hand out values after load() and context.sync(), like the real API, plus a request counter.
 */
import { OfficeMockObject } from 'office-addin-mock';

/** What a test sees of the mock: the Excel object and the number of Excel.run requests made. */
export interface ExcelMock {
  readonly excel: OfficeMockObject;
  readonly runs: () => number;
}

/** Installs `data.context` as the request context of a mock Excel global; `afterRun` may throw to fail a request. */
export function installExcelMock(context: Record<string, unknown>, afterRun?: () => void): ExcelMock {
  let runs = 0;
  const excel = new OfficeMockObject({
    host: 'excel',
    context,
    run: async function (this: { context: unknown }, callback: (ctx: unknown) => Promise<unknown>) {
      runs++;
      const result = await callback(this.context);
      afterRun?.();
      return result;
    },
  } as never);
  Object.assign(globalThis, { Excel: excel });
  return { excel, runs: () => runs };
}

/** Sets a scalar property of a mock object anew (unloaded again), as a new request would see it. */
export function setMockValue(target: unknown, name: string, value: unknown): void {
  (target as { setValue(n: string, v: unknown): void }).setValue(name, value);
}
