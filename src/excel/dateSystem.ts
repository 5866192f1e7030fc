/** The workbook's date system (1900 or 1904), found by asking the workbook to compute a date. */
import type { DateSystem } from '../core/intake/types';
import { ExcelAdapterError, explain } from './errors';

/**
 * The date system from the workbook's answer to DATE(1904, 1, 1): 0 in the 1904 date system (its day 0 is
 * 1904-01-01) and 1462 in the 1900 date system (serial of 1904-01-01 there; ECMA-376 Part 1, §18.17.4.1).
 * Anything else throws. Example: dateSystemFromProbe(1462) → 1900.
 */
export function dateSystemFromProbe(value: unknown): DateSystem {
  if (value === 0) return 1904;
  if (value === 1462) return 1900;
  throw new ExcelAdapterError(`Could not tell the workbook's date system: DATE(1904,1,1) gave ${JSON.stringify(value)}, not 0 or 1462.`);
}

/**
 * Queues the probe on an open request context; read `.value` after the next sync and pass it to
 * dateSystemFromProbe. The Excel JavaScript API has no released property for the date system, so the workbook is
 * asked to evaluate DATE(1904,1,1) through `workbook.functions` (ExcelApi 1.2), which answers in its own system.
 */
export function queueDateProbe(context: Excel.RequestContext): Excel.FunctionResult<number> {
  const probe = context.workbook.functions.date(1904, 1, 1);
  probe.load('value');
  return probe;
}

/** The active workbook's date system, in one request. See queueDateProbe for how it is found. */
export async function probeDateSystem(): Promise<DateSystem> {
  return explain("Finding the workbook's date system", () =>
    Excel.run(async (context) => {
      const probe = queueDateProbe(context);
      await context.sync();
      return dateSystemFromProbe(probe.value);
    }),
  );
}
