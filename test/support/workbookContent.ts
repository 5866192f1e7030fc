/**
 * What a reader of a report workbook sees, extracted from the package's XML (ECMA-376 Part 1) into plain data so two
 * workbooks written by different writers can be compared: per sheet its cells (value, type, number format code),
 * merged ranges, column widths, row heights, internal links, frozen rows, print settings (orientation, fit, margins,
 * footer, page breaks, print titles), tables (name, range, filter, column names) and charts (kind, anchor, series
 * references). Test-only: reads the zip with the project's own reader (src/files/zip.ts) and the parts with regular
 * expressions, which is enough for the packages these two writers produce.
 */
import { inflatePart, zipEntries } from '../../src/files/zip';
import { decodeXml } from '../../src/files/xml';

export interface CellContent {
  readonly type: 'number' | 'text';
  readonly value: number | string;
  readonly format: string;
}

export interface SheetContent {
  readonly name: string;
  /** The last row and column (1-based) holding any cell element, blank or not: the area a reader counts as used. */
  readonly used: { rows: number; columns: number };
  readonly cells: Record<string, CellContent>;
  readonly merges: string[];
  readonly widths: Record<number, number>;
  readonly heights: Record<number, number>;
  readonly links: { ref: string; location: string }[];
  readonly frozenRows: number;
  readonly print: {
    orientation: string;
    fitToPage: boolean;
    fitToWidth: string;
    fitToHeight: string;
    margins: Record<string, string>;
    footer: string;
    breaks: number[];
    titles: string;
  };
  readonly tables: { name: string; ref: string; filter: string; columns: string[]; headerRows: string }[];
  readonly charts: { kind: string; from: string; to: string; references: string[] }[];
}

/** Built-in number formats the writers use (ECMA-376 Part 1 §18.8.30). */
const BUILT_IN: Record<string, string> = { '0': 'General', '1': '0', '2': '0.00', '9': '0%', '10': '0.00%', '49': '@' };

/** Every part of the package as text, by name. */
export async function packageParts(bytes: Uint8Array): Promise<Map<string, string>> {
  const out = new Map<string, string>();
  const budget = { used: 0, total: 1 << 30 };
  const decoder = new TextDecoder();
  for (const e of zipEntries(bytes).values()) {
    const chunks: Uint8Array[] = [];
    await inflatePart(bytes, e, 1 << 30, budget, (c) => chunks.push(c.slice()), 'part');
    const all = new Uint8Array(chunks.reduce((n, c) => n + c.length, 0));
    let p = 0;
    for (const c of chunks) {
      all.set(c, p);
      p += c.length;
    }
    out.set(e.name, decoder.decode(all));
  }
  return out;
}

const attr = (tag: string, name: string): string | undefined => {
  const m = new RegExp(`\\s${name}="([^"]*)"`).exec(tag);
  return m === null ? undefined : decodeXml(m[1]!);
};

function resolve(from: string, target: string): string {
  if (target.startsWith('/')) return target.slice(1);
  const segments = `${from.slice(0, from.lastIndexOf('/'))}/${target}`.split('/');
  const out: string[] = [];
  for (const s of segments) if (s === '..') out.pop(); else if (s !== '.') out.push(s);
  return out.join('/');
}

function rels(all: Map<string, string>, part: string): Map<string, string> {
  const slash = part.lastIndexOf('/');
  const xml = all.get(`${part.slice(0, slash)}/_rels/${part.slice(slash + 1)}.rels`) ?? '';
  const out = new Map<string, string>();
  for (const m of xml.matchAll(/<Relationship\b[^>]*>/g)) out.set(attr(m[0], 'Id')!, resolve(part, attr(m[0], 'Target')!));
  return out;
}

/** Text of a <t> run set (shared string item or inline string), phonetic runs left out. */
function runText(xml: string): string {
  return [...xml.replace(/<rPh\b[\s\S]*?<\/rPh>/g, '').matchAll(/<t(?:\s[^>]*)?>([\s\S]*?)<\/t>|<t(?:\s[^>]*)?\/>/g)].map((m) => decodeXml(m[1] ?? '')).join('');
}

/** The content of every sheet, in workbook order. */
export async function workbookContent(bytes: Uint8Array): Promise<SheetContent[]> {
  const all = await packageParts(bytes);
  const workbook = all.get('xl/workbook.xml') ?? '';
  const wbRels = rels(all, 'xl/workbook.xml');
  const shared = [...(all.get('xl/sharedStrings.xml') ?? '').matchAll(/<si>([\s\S]*?)<\/si>/g)].map((m) => runText(m[1]!));
  const styles = all.get('xl/styles.xml') ?? '';
  const codes = new Map<string, string>(Object.entries(BUILT_IN));
  for (const m of styles.matchAll(/<numFmt\b[^>]*>/g)) codes.set(attr(m[0], 'numFmtId')!, attr(m[0], 'formatCode')!);
  const cellXfs = /<cellXfs\b[^>]*>([\s\S]*?)<\/cellXfs>/.exec(styles)?.[1] ?? '';
  const xfFormats = [...cellXfs.matchAll(/<xf\b[^>]*>/g)].map((m) => codes.get(attr(m[0], 'numFmtId') ?? '0') ?? `id ${attr(m[0], 'numFmtId')}`);
  const titles = new Map<number, string>();
  for (const m of workbook.matchAll(/<definedName\b([^>]*)>([^<]*)<\/definedName>/g)) {
    if (attr(m[1]!, 'name') === '_xlnm.Print_Titles') titles.set(Number(attr(m[1]!, 'localSheetId')), decodeXml(m[2]!));
  }
  const sheets: SheetContent[] = [];
  for (const [k, m] of [...workbook.matchAll(/<sheet\b[^>]*>/g)].entries()) {
    const name = attr(m[0], 'name')!;
    const part = wbRels.get(attr(m[0], 'r:id')!)!;
    const xml = all.get(part) ?? '';
    const cells: Record<string, CellContent> = {};
    const used = { rows: 0, columns: 0 };
    for (const c of xml.matchAll(/<c\b([^>]*?)(?:\/>|>([\s\S]*?)<\/c>)/g)) {
      const ref = attr(c[1]!, 'r')!;
      const at = /^([A-Z]+)(\d+)$/.exec(ref)!;
      used.rows = Math.max(used.rows, Number(at[2]));
      used.columns = Math.max(used.columns, [...at[1]!].reduce((n, ch) => n * 26 + ch.charCodeAt(0) - 64, 0));
      const t = attr(c[1]!, 't') ?? 'n';
      const inner = c[2] ?? '';
      const v = /<v>([\s\S]*?)<\/v>/.exec(inner)?.[1];
      const format = xfFormats[Number(attr(c[1]!, 's') ?? '0')] ?? 'General';
      if (t === 'inlineStr') {
        const text = runText(/<is>([\s\S]*?)<\/is>/.exec(inner)?.[1] ?? '');
        if (text !== '') cells[ref] = { type: 'text', value: text, format };
      } else if (t === 's' && v !== undefined) {
        const text = shared[Number(v)] ?? '';
        if (text !== '') cells[ref] = { type: 'text', value: text, format };
      } else if (t === 'str' && v !== undefined) cells[ref] = { type: 'text', value: decodeXml(v), format };
      else if (v !== undefined) cells[ref] = { type: 'number', value: Number(v), format };
    }
    const merges = [...xml.matchAll(/<mergeCell\b[^>]*>/g)].map((x) => attr(x[0], 'ref')!).sort();
    const widths: Record<number, number> = {};
    for (const c of xml.matchAll(/<col\b[^>]*>/g)) {
      if (attr(c[0], 'customWidth') === undefined && attr(c[0], 'width') === undefined) continue;
      for (let j = Number(attr(c[0], 'min')); j <= Number(attr(c[0], 'max')); j++) widths[j] = Number(attr(c[0], 'width'));
    }
    const heights: Record<number, number> = {};
    for (const r of xml.matchAll(/<row\b[^>]*>/g)) {
      const ht = attr(r[0], 'ht');
      if (ht !== undefined) heights[Number(attr(r[0], 'r'))] = Number(ht);
    }
    const sheetRels = rels(all, part);
    const links = [...xml.matchAll(/<hyperlink\b[^>]*>/g)].map((h) => ({ ref: attr(h[0], 'ref')!, location: attr(h[0], 'location') ?? `external ${attr(h[0], 'r:id')}` }));
    const pane = /<pane\b[^>]*>/.exec(xml)?.[0];
    const setup = /<pageSetup\b[^>]*>/.exec(xml)?.[0] ?? '';
    const marginsTag = /<pageMargins\b[^>]*>/.exec(xml)?.[0] ?? '';
    const margins: Record<string, string> = {};
    for (const side of ['left', 'right', 'top', 'bottom', 'header', 'footer']) margins[side] = String(Number(attr(marginsTag, side)));
    const tables = [...xml.matchAll(/<tablePart\b[^>]*>/g)].map((tp) => {
      const t = all.get(sheetRels.get(attr(tp[0], 'r:id')!)!) ?? '';
      const head = /<table\b[^>]*>/.exec(t)?.[0] ?? '';
      return {
        name: attr(head, 'name')!,
        ref: attr(head, 'ref')!,
        filter: attr(/<autoFilter\b[^>]*>/.exec(t)?.[0] ?? '', 'ref') ?? '',
        columns: [...t.matchAll(/<tableColumn\b[^>]*>/g)].map((c) => attr(c[0], 'name')!),
        headerRows: attr(head, 'headerRowCount') ?? '1',
      };
    });
    const charts: SheetContent['charts'] = [];
    const drawingTag = /<drawing\b[^>]*>/.exec(xml)?.[0];
    if (drawingTag !== undefined) {
      const drawingPart = sheetRels.get(attr(drawingTag, 'r:id')!)!;
      const drawing = all.get(drawingPart) ?? '';
      const drawingRels = rels(all, drawingPart);
      for (const a of drawing.matchAll(/<xdr:twoCellAnchor\b[\s\S]*?<\/xdr:twoCellAnchor>/g)) {
        const at = (tag: string): string => {
          const block = new RegExp(`<xdr:${tag}>([\\s\\S]*?)</xdr:${tag}>`).exec(a[0])?.[1] ?? '';
          return `${/<xdr:col>(\d+)/.exec(block)?.[1]},${/<xdr:row>(\d+)/.exec(block)?.[1]}`;
        };
        const chartPart = drawingRels.get(attr(/<c:chart\b[^>]*>/.exec(a[0])![0], 'r:id')!)!;
        const chart = all.get(chartPart) ?? '';
        charts.push({
          kind: /<c:(barChart|lineChart|scatterChart)>/.exec(chart)?.[1] ?? 'none',
          from: at('from'),
          to: at('to'),
          references: [...chart.matchAll(/<c:f>([\s\S]*?)<\/c:f>/g)].map((f) => decodeXml(f[1]!)),
        });
      }
    }
    sheets.push({
      name,
      used,
      cells,
      merges,
      widths,
      heights,
      links,
      frozenRows: pane !== undefined && attr(pane, 'state') === 'frozen' ? Number(attr(pane, 'ySplit')) : 0,
      print: {
        orientation: attr(setup, 'orientation') ?? 'portrait',
        fitToPage: /<pageSetUpPr\b[^>]*fitToPage="1"/.test(xml),
        fitToWidth: attr(setup, 'fitToWidth') ?? '1',
        fitToHeight: attr(setup, 'fitToHeight') ?? '1',
        margins,
        footer: decodeXml(/<oddFooter>([\s\S]*?)<\/oddFooter>/.exec(xml)?.[1] ?? ''),
        breaks: [...xml.matchAll(/<brk\b[^>]*>/g)].map((b) => Number(attr(b[0], 'id'))),
        titles: titles.get(k) ?? '',
      },
      tables,
      charts,
    });
  }
  return sheets;
}
