/**
 * Internal hyperlinks in a worksheet part written by exceljs: a <hyperlinks> element (ECMA-376 Part 1, §18.3.1.48)
 * whose <hyperlink> children carry a `location` inside the workbook and no relationship id, in its place in the
 * CT_Worksheet sequence (after dataValidations, before printOptions and pageMargins). exceljs 4.4 writes an internal
 * link with an external relationship as well, which Excel reads as a broken address (exceljs issue #3027), so the
 * writer adds the links here instead. Pure string work on one part.
 */
import { xmlText } from '../../../src/files/chartXml';

/** One link: the cell that holds it, the place it leads to, and the text shown. */
export interface PlacedLink {
  /** The cell with the link, e.g. "A2". */
  readonly ref: string;
  /** Where it leads, in the workbook: a sheet name and a cell. */
  readonly sheet: string;
  readonly cell: string;
  readonly display: string;
}

/** A place in the workbook as a hyperlink location, e.g. 'Summary (2)'!A1 (the sheet name quoted, inner quotes doubled). */
export const linkLocation = (sheet: string, cell: string): string => `'${sheet.replace(/'/g, "''")}'!${cell}`;

/** Elements that follow <hyperlinks> in CT_Worksheet (ECMA-376 Part 1, §18.3.1.99). */
const AFTER_HYPERLINKS =
  /<(printOptions|pageMargins|pageSetup|headerFooter|rowBreaks|colBreaks|customProperties|cellWatches|ignoredErrors|smartTags|drawing|legacyDrawing|legacyDrawingHF|drawingHF|picture|oleObjects|controls|webPublishItems|tableParts|extLst)\b/;

/**
 * The sheet XML with `links` as internal hyperlinks: added to an existing <hyperlinks> element, else in a new one
 * before the first element that must follow it (else before </worksheet>). Unchanged when there are no links.
 * Example: withHyperlinks('<worksheet><sheetData/><pageMargins/></worksheet>', [{ ref: 'A2', sheet: 'Summary', cell: 'A1', display: 'x' }])
 * → '<worksheet><sheetData/><hyperlinks><hyperlink ref="A2" location="&apos;Summary&apos;!A1" display="x"/></hyperlinks><pageMargins/></worksheet>'
 */
export function withHyperlinks(sheetXml: string, links: readonly PlacedLink[]): string {
  if (links.length === 0) return sheetXml;
  const elements = links.map((l) => `<hyperlink ref="${xmlText(l.ref)}" location="${xmlText(linkLocation(l.sheet, l.cell))}" display="${xmlText(l.display)}"/>`).join('');
  const open = sheetXml.indexOf('</hyperlinks>');
  if (open >= 0) return sheetXml.slice(0, open) + elements + sheetXml.slice(open);
  const at = sheetXml.search(AFTER_HYPERLINKS);
  const end = at >= 0 ? at : sheetXml.lastIndexOf('</worksheet>');
  return `${sheetXml.slice(0, end)}<hyperlinks>${elements}</hyperlinks>${sheetXml.slice(end)}`;
}
