/**
 * A one-sheet .xlsx workbook written from rows of cells, for the .xlsx reader's tests and its bench
 * (bench/xlsx-bench.ts): text as shared strings (ECMA-376 Part 1, §18.4, as spreadsheet programs store typed text) or
 * as inline strings (§18.3.1.53 is, from memory), numbers, booleans (t="b"), error values (t="e"), formula text
 * (t="str") and dates as serials under a date style (built-in number format 14, §18.8.30, from memory). Parts go
 * through the project's own zip writer (src/files/zipWriter.ts), each part compressed as it is written, so a
 * 1,048,576-row sheet never exists as one string. Cells may be written with or without their r="A1" reference.
 */
import { ZipWriter } from '../../src/files/zipWriter';
import { cellText, needsPreserve, numberText } from '../../src/files/xlsxText';
import { columnLetters } from '../../src/core/intake/cellAddress';

/** One cell to write; null or undefined writes nothing. */
export type SheetCell = number | string | boolean | { readonly error: string } | { readonly date: number } | { readonly formulaText: string } | null | undefined;

/** One row: its 1-based row number and its cells from column `firstCol` (1-based, default 1). */
export interface SheetRow {
  readonly row: number;
  readonly cells: readonly SheetCell[];
  readonly firstCol?: number;
}

export interface SheetWorkbookOptions {
  /** 'shared' (default): text in the shared-string table; 'inline': inline strings; 'mixed': alternate by cell. */
  readonly strings?: 'shared' | 'inline' | 'mixed';
  readonly sheetName?: string;
  readonly date1904?: boolean;
  /** Leave out a cell's r attribute (its column then follows the previous cell), when this says so. */
  readonly omitRef?: (row: number, col: number) => boolean;
  /** Called per finished part with its inflated size in bytes (e.g. the sheet XML's size for the bench). */
  readonly onPart?: (name: string, bytes: number) => void;
}

const NS = 'http://schemas.openxmlformats.org/spreadsheetml/2006/main';
const RNS = 'http://schemas.openxmlformats.org/officeDocument/2006/relationships';
const PKG = 'http://schemas.openxmlformats.org/package/2006/relationships';
const HEAD = '<?xml version="1.0" encoding="UTF-8" standalone="yes"?>\n';
const ML = 'application/vnd.openxmlformats-officedocument.spreadsheetml';

const tText = (s: string): string => `<t${needsPreserve(s) ? ' xml:space="preserve"' : ''}>${cellText(s)}</t>`;

/**
 * Writes the workbook. `rows` is called twice (once to collect the shared strings, once to write the sheet), so it
 * must give the same rows both times. Returns the archive's bytes.
 */
export async function sheetWorkbook(rows: () => Iterable<SheetRow>, o: SheetWorkbookOptions = {}): Promise<Uint8Array> {
  const mode = o.strings ?? 'shared';
  const shared = new Map<string, number>();
  const sharedList: string[] = [];
  let flip = 0;
  const useShared = (): boolean => mode === 'shared' || (mode === 'mixed' && (flip++ & 1) === 0);
  // Pass 1: the shared strings in the order first met, as a spreadsheet program numbers them.
  let sharedUses = 0;
  if (mode !== 'inline') {
    for (const r of rows()) {
      for (const c of r.cells) {
        if (typeof c !== 'string') continue;
        if (!useShared()) continue;
        sharedUses++;
        if (!shared.has(c)) {
          shared.set(c, sharedList.length);
          sharedList.push(c);
        }
      }
    }
  }
  flip = 0;
  const zip = new ZipWriter();
  const small = async (name: string, text: string): Promise<void> => {
    await zip.text(name, text);
    o.onPart?.(name, new TextEncoder().encode(text).length);
  };
  const hasShared = sharedList.length > 0;
  await small(
    '[Content_Types].xml',
    `${HEAD}<Types xmlns="http://schemas.openxmlformats.org/package/2006/content-types"><Default Extension="rels" ContentType="application/vnd.openxmlformats-package.relationships+xml"/><Default Extension="xml" ContentType="application/xml"/>` +
      `<Override PartName="/xl/workbook.xml" ContentType="${ML}.sheet.main+xml"/><Override PartName="/xl/worksheets/sheet1.xml" ContentType="${ML}.worksheet+xml"/>` +
      `<Override PartName="/xl/styles.xml" ContentType="${ML}.styles+xml"/>` +
      (hasShared ? `<Override PartName="/xl/sharedStrings.xml" ContentType="${ML}.sharedStrings+xml"/>` : '') +
      '</Types>',
  );
  await small('_rels/.rels', `${HEAD}<Relationships xmlns="${PKG}"><Relationship Id="rId1" Type="${RNS}/officeDocument" Target="xl/workbook.xml"/></Relationships>`);
  await small(
    'xl/workbook.xml',
    `${HEAD}<workbook xmlns="${NS}" xmlns:r="${RNS}">${o.date1904 === true ? '<workbookPr date1904="1"/>' : '<workbookPr/>'}<sheets><sheet name="${cellText(o.sheetName ?? 'Visits')}" sheetId="1" r:id="rId1"/></sheets></workbook>`,
  );
  await small(
    'xl/_rels/workbook.xml.rels',
    `${HEAD}<Relationships xmlns="${PKG}"><Relationship Id="rId1" Type="${RNS}/worksheet" Target="worksheets/sheet1.xml"/><Relationship Id="rId2" Type="${RNS}/styles" Target="styles.xml"/>` +
      (hasShared ? `<Relationship Id="rId3" Type="${RNS}/sharedStrings" Target="sharedStrings.xml"/>` : '') +
      '</Relationships>',
  );
  await small(
    'xl/styles.xml',
    `${HEAD}<styleSheet xmlns="${NS}"><fonts count="1"><font><sz val="11"/><name val="Calibri"/></font></fonts><fills count="1"><fill><patternFill patternType="none"/></fill></fills>` +
      '<borders count="1"><border/></borders><cellStyleXfs count="1"><xf numFmtId="0" fontId="0" fillId="0" borderId="0"/></cellStyleXfs>' +
      '<cellXfs count="2"><xf numFmtId="0" fontId="0" fillId="0" borderId="0" xfId="0"/><xf numFmtId="14" fontId="0" fillId="0" borderId="0" xfId="0" applyNumberFormat="1"/></cellXfs></styleSheet>',
  );
  if (hasShared) {
    const p = zip.part('xl/sharedStrings.xml');
    let bytes = 0;
    const put = async (s: string): Promise<void> => {
      bytes += Buffer.byteLength(s);
      await p.write(s);
    };
    await put(`${HEAD}<sst xmlns="${NS}" count="${sharedUses}" uniqueCount="${sharedList.length}">`);
    let piece = '';
    for (const s of sharedList) {
      piece += `<si>${tText(s)}</si>`;
      if (piece.length > 1 << 16) {
        await put(piece);
        piece = '';
      }
    }
    await put(`${piece}</sst>`);
    await p.end();
    o.onPart?.('xl/sharedStrings.xml', bytes);
  }
  const sheet = zip.part('xl/worksheets/sheet1.xml');
  let sheetBytes = 0;
  const put = async (s: string): Promise<void> => {
    sheetBytes += Buffer.byteLength(s);
    await sheet.write(s);
  };
  await put(`${HEAD}<worksheet xmlns="${NS}" xmlns:r="${RNS}"><sheetData>`);
  let piece = '';
  for (const r of rows()) {
    piece += `<row r="${r.row}">`;
    const first = r.firstCol ?? 1;
    for (let k = 0; k < r.cells.length; k++) {
      const c = r.cells[k];
      if (c === null || c === undefined) continue;
      const col = first + k;
      const ref = o.omitRef?.(r.row, col) === true && k > 0 && r.cells[k - 1] !== null && r.cells[k - 1] !== undefined ? '' : ` r="${columnLetters(col - 1)}${r.row}"`;
      if (typeof c === 'number') piece += `<c${ref}><v>${numberText(c)}</v></c>`;
      else if (typeof c === 'boolean') piece += `<c${ref} t="b"><v>${c ? 1 : 0}</v></c>`;
      else if (typeof c === 'string') {
        if (mode !== 'inline' && useShared()) piece += `<c${ref} t="s"><v>${shared.get(c)!}</v></c>`;
        else piece += `<c${ref} t="inlineStr"><is>${tText(c)}</is></c>`;
      } else if ('error' in c) piece += `<c${ref} t="e"><v>${cellText(c.error)}</v></c>`;
      else if ('date' in c) piece += `<c${ref} s="1"><v>${numberText(c.date)}</v></c>`;
      else piece += `<c${ref} t="str"><f>"x"</f><v>${cellText(c.formulaText)}</v></c>`;
    }
    piece += '</row>';
    if (piece.length > 1 << 16) {
      await put(piece);
      piece = '';
    }
  }
  await put(`${piece}</sheetData></worksheet>`);
  await sheet.end();
  o.onPart?.('xl/worksheets/sheet1.xml', sheetBytes);
  return zip.finish();
}
