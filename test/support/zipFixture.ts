/**
 * Builds zip archives and minimal .xlsx workbooks byte by byte for the reader's tests (PKWARE APPNOTE 4.3.7 local
 * header, 4.3.12 central header, 4.3.16 end record), so each test can make exactly the damage or size it needs.
 */
import { deflateRawSync } from 'node:zlib';
import { crc32Update } from '../../src/files/crc32';

export interface FixturePart {
  readonly name: string;
  readonly data: Uint8Array | string;
  /** 0 stored, 8 deflated (default). */
  readonly method?: 0 | 8;
  /** Already-compressed bytes to store as this part (with `size` and `crc` describing the inflated content). */
  readonly raw?: { readonly bytes: Uint8Array; readonly size: number; readonly crc: number };
  readonly crc?: number;
  readonly size?: number;
}

const u16 = (n: number): number[] => [n & 0xff, (n >>> 8) & 0xff];
const u32 = (n: number): number[] => [n & 0xff, (n >>> 8) & 0xff, (n >>> 16) & 0xff, (n >>> 24) & 0xff];

export function makeZip(parts: readonly FixturePart[]): Uint8Array {
  const chunks: Uint8Array[] = [];
  const central: number[][] = [];
  let offset = 0;
  for (const p of parts) {
    const name = new TextEncoder().encode(p.name);
    const plain = typeof p.data === 'string' ? new TextEncoder().encode(p.data) : p.data;
    const method = p.method ?? 8;
    const body = p.raw?.bytes ?? (method === 8 ? new Uint8Array(deflateRawSync(plain)) : plain);
    const crc = p.crc ?? p.raw?.crc ?? crc32Update(0, plain);
    const size = p.size ?? p.raw?.size ?? plain.length;
    const common = [...u16(20), ...u16(0x0800), ...u16(method), ...u16(0), ...u16(0x21), ...u32(crc), ...u32(body.length), ...u32(size), ...u16(name.length), ...u16(0)];
    const local = Uint8Array.from([...u32(0x04034b50), ...common]);
    central.push([...u32(0x02014b50), ...u16(20), ...common, ...u16(0), ...u16(0), ...u16(0), ...u32(0), ...u32(offset), ...name]);
    chunks.push(local, name, body);
    offset += local.length + name.length + body.length;
  }
  const dir = Uint8Array.from(central.flat());
  const end = Uint8Array.from([...u32(0x06054b50), ...u16(0), ...u16(0), ...u16(parts.length), ...u16(parts.length), ...u32(dir.length), ...u32(offset), ...u16(0)]);
  const out = new Uint8Array(offset + dir.length + end.length);
  let o = 0;
  for (const c of [...chunks, dir, end]) {
    out.set(c, o);
    o += c.length;
  }
  return out;
}

const NS = 'http://schemas.openxmlformats.org/spreadsheetml/2006/main';
const RNS = 'http://schemas.openxmlformats.org/officeDocument/2006/relationships';

/** XML-escapes text for a fixture. */
export const esc = (s: string): string => s.replace(/&/g, '&amp;').replace(/</g, '&lt;').replace(/>/g, '&gt;').replace(/"/g, '&quot;');

/** One worksheet's XML from rows of [address, value] cells; strings become inline strings. */
export function sheetXml(cells: readonly (readonly [string, string | number])[], before = '', after = ''): string {
  const body = cells
    .map(([r, v]) => (typeof v === 'number' ? `<c r="${r}"><v>${v}</v></c>` : `<c r="${r}" t="inlineStr"><is><t>${esc(v)}</t></is></c>`))
    .join('');
  return `<?xml version="1.0" encoding="UTF-8" standalone="yes"?><worksheet xmlns="${NS}"><sheetData>${before}<row>${body}</row>${after}</sheetData></worksheet>`;
}

/** The parts of a one-sheet workbook around `sheet` (the worksheet XML), plus any `extra` parts. */
export function workbookParts(sheet: string | FixturePart, extra: readonly FixturePart[] = []): FixturePart[] {
  return [
    { name: '_rels/.rels', data: `<?xml version="1.0"?><Relationships xmlns="http://schemas.openxmlformats.org/package/2006/relationships"><Relationship Id="rId1" Type="${RNS}/officeDocument" Target="xl/workbook.xml"/></Relationships>` },
    { name: 'xl/workbook.xml', data: `<?xml version="1.0"?><workbook xmlns="${NS}" xmlns:r="${RNS}"><sheets><sheet name="Data" sheetId="1" r:id="rId1"/></sheets></workbook>` },
    { name: 'xl/_rels/workbook.xml.rels', data: `<?xml version="1.0"?><Relationships xmlns="http://schemas.openxmlformats.org/package/2006/relationships"><Relationship Id="rId1" Type="${RNS}/worksheet" Target="worksheets/sheet1.xml"/></Relationships>` },
    typeof sheet === 'string' ? { name: 'xl/worksheets/sheet1.xml', data: sheet } : sheet,
    ...extra,
  ];
}

/** A small table as cells (header + rows) at A1, for fixtures: [[address, value]]. */
export function tableCells(rows: readonly (readonly (string | number)[])[]): [string, string | number][] {
  const out: [string, string | number][] = [];
  rows.forEach((r, i) => r.forEach((v, j) => out.push([`${String.fromCharCode(65 + j)}${i + 1}`, v])));
  return out;
}
