/**
 * Excel API features newer than the minimum the manifest asks for (ExcelApi 1.7). Each use of one is guarded by
 * `supportsExcelApi` at run time and has a fallback, so the pane still works in an Excel that stops at 1.7;
 * test/excel/apiLevel.test.ts checks that every newer member the adapter uses sits inside such a guard.
 */

/** The requirement set the manifest names as its minimum; everything the adapter uses without a guard is in it. */
export const MINIMUM_EXCEL_API = '1.7';

/**
 * Whether the running Excel supports ExcelApi `version` (Office.context.requirements.isSetSupported, Office common
 * API). False outside an Office host (the page, unit tests), so guarded features simply stay off there.
 * Example: supportsExcelApi('1.8') → true in current Excel on the web, false in Excel 2016 bought outright.
 */
export function supportsExcelApi(version: string): boolean {
  if (typeof Office === 'undefined') return false;
  const requirements = (Office as Partial<typeof Office>).context?.requirements;
  return requirements?.isSetSupported('ExcelApi', version) === true;
}
