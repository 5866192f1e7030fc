/**
 * Number-format codes the adapter writes: the shared map for each NumberFormat (src/core/report/formats.ts,
 * ECMA-376 Part 1, §18.8.31 numFmt codes) plus the text and general codes it needs on its own.
 */
import { EXCEL_FORMAT_CODES } from '../core/report/formats';

export const FORMAT_CODES = EXCEL_FORMAT_CODES;

/** The text format code: a cell with it keeps what is written, "=1+1" included, as text. */
export const TEXT_FORMAT = '@';

/** Excel's general format, for numbers whose meaning the spec does not give (chart data, numbers in text columns). */
export const GENERAL_FORMAT = 'General';
