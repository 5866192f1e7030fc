import type { NumberFormat } from '../core/report/types';

/**
 * Excel number-format codes per meaning (ECMA-376 Part 1, §18.8.31 numFmt codes). A local copy until the shared
 * map in src/core/report/formats.ts lands; the codes are the usual ones ("@" is the text format, so a cell that
 * holds "=1+1" keeps it as text).
 */
export const FORMAT_CODES: Readonly<Record<NumberFormat, string>> = {
  text: '@',
  integer: '0',
  decimal1: '0.0',
  decimal2: '0.00',
  decimal3: '0.000',
  decimal4: '0.0000',
  decimal6: '0.000000',
  percent1: '0.0%',
  pvalue: '[<0.0001]"<0.0001";0.0000',
  date: 'yyyy-mm-dd',
};

/** The text format code. */
export const TEXT_FORMAT = '@';

/** Excel's general format, for numbers whose meaning the spec does not give (chart data). */
export const GENERAL_FORMAT = 'General';
