import JSZip from 'jszip';
import type { DateSystem } from '../core/intake/types';

/** The workbook part that holds the date-system flag; exceljs reads the workbook from this same fixed path. */
const WORKBOOK_PART = 'xl/workbook.xml';

/**
 * Whether an xsd:boolean attribute value is true. The workbookPr date1904 attribute is typed xsd:boolean in the
 * ECMA-376 schema, and W3C XML Schema Part 2 (§3.2.2 boolean, section number from memory) gives it four legal
 * spellings, "true", "false", "1" and "0", with surrounding white space collapsed.
 * Example: xsdBoolean(' true ') → true; xsdBoolean('0') → false
 */
export function xsdBoolean(value: string): boolean {
  const v = value.trim();
  return v === '1' || v === 'true';
}

/**
 * The date system a workbook declares: 1904 when the workbookPr element of xl/workbook.xml has date1904 set to a
 * true xsd:boolean ("1" or "true"), else 1900 (ECMA-376 Part 1, workbookPr element, default false). Reads only
 * that one part of the zip. Cost O(size of workbook.xml).
 *
 * Example: a workbook written by a program that spells the flag date1904="true" → 1904
 * Returns 1900 when the part is missing or holds no flag (the caller has already checked that the bytes are a workbook).
 */
export async function workbookDateSystem(zip: JSZip): Promise<DateSystem> {
  const part = zip.file(WORKBOOK_PART);
  if (part === null) return 1900;
  const xml = await part.async('string');
  const pr = /<(?:[A-Za-z_][\w.-]*:)?workbookPr\b([^>]*)>/.exec(xml);
  if (pr === null) return 1900;
  const flag = /\bdate1904\s*=\s*(?:"([^"]*)"|'([^']*)')/.exec(pr[1]!);
  if (flag === null) return 1900;
  return xsdBoolean(flag[1] ?? flag[2] ?? '') ? 1904 : 1900;
}
