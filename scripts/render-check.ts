/**
 * The render check (`npm run test:render`): a second reader opens the demo report. It writes the invented demo
 * trial's report (`npm run demo`), converts it with LibreOffice in headless mode to PDF, renders every page to PNG
 * with poppler, and checks that
 *   - the conversion succeeds and every sheet is present (each sheet's name stands in the footer of some page),
 *   - the page count is reasonable (at least one page a sheet, at most MAX_PAGES),
 *   - no table is split across pages sideways (some page shows every column heading of each table),
 *   - each chart renders: below its title on the page, the chart area holds coloured pixels (series, not only text),
 *   - the summary page shows the treatment difference at the last visit with the digits formatCell gives,
 *   - every wrapped paragraph of the summary sheet, the longest caution among them, is whole: its last words are
 *     printed and no other text is printed over its lines (a row too short for its text is either cut or overrun by
 *     the next row, depending on the reader); at least one of them wraps onto more than one line.
 * Not part of `npm test`: it needs the Debian packages named in INSTALL. With LONGIPANE_UPDATE_DOCS=1 it refreshes
 * docs/report-page.png (the first page) for the README.
 */
import { spawnSync } from 'node:child_process';
import { copyFileSync, mkdirSync, mkdtempSync, readFileSync, readdirSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import JSZip from 'jszip';
import { CAUTIONS, UNBLINDED_CAUTION } from '../src/core/report/cautions';
import { formatCell } from '../src/core/report/formats';
import { colouredPixels, readPng } from './render/png';

const INSTALL = 'apt-get install -y --no-install-recommends libreoffice-calc-nogui poppler-utils fonts-crosextra-carlito';
const ROOT = resolve(import.meta.dirname, '..');
const REPORT = join(ROOT, 'out', 'demo-report.xlsx');
const OUT = join(ROOT, 'out', 'render');
/** The demo report prints on 17 pages (2026-12-02); twice that means something spreads out of shape. */
const MAX_PAGES = 34;
/** Resolution of the PNG pages (dots per inch; 1 PDF point = DPI / 72 pixels). */
const DPI = 100;
/** Coloured pixels a drawn chart shows below its title at this resolution: the sparsest demo chart (markers and thin
 * lines) gives about 400, the bar charts thousands; an empty frame, text and grid lines give none. */
const MIN_CHART_PIXELS = 150;

const failures: string[] = [];
const fail = (why: string): void => void failures.push(why);

function run(cmd: string, args: readonly string[], quiet = true): string {
  const r = spawnSync(cmd, args, { cwd: ROOT, encoding: 'utf8', stdio: quiet ? 'pipe' : 'inherit', maxBuffer: 256 * 1024 * 1024 });
  if (r.error !== undefined || r.status !== 0) {
    throw new Error(`${cmd} ${args.join(' ')} failed${r.error ? `: ${r.error.message}` : ` (exit ${r.status}): ${r.stderr}`}`);
  }
  return r.stdout ?? '';
}

function have(cmd: string): boolean {
  return spawnSync(cmd, ['--version'], { stdio: 'ignore' }).error === undefined;
}

interface Word {
  readonly text: string;
  readonly xMin: number;
  readonly yMin: number;
  readonly xMax: number;
  readonly yMax: number;
}

/** Words of each page with their boxes in points, from `pdftotext -bbox`. */
function pageWords(pdf: string): Word[][] {
  const html = run('pdftotext', ['-bbox', pdf, '-']);
  const unescape = (s: string): string => s.replace(/&lt;/g, '<').replace(/&gt;/g, '>').replace(/&quot;/g, '"').replace(/&apos;/g, "'").replace(/&amp;/g, '&');
  return html.split(/<page /).slice(1).map((page) =>
    [...page.matchAll(/<word xMin="([\d.]+)" yMin="([\d.]+)" xMax="([\d.]+)" yMax="([\d.]+)">([^<]*)<\/word>/g)].map((m) => ({
      xMin: Number(m[1]),
      yMin: Number(m[2]),
      xMax: Number(m[3]),
      yMax: Number(m[4]),
      text: unescape(m[5]!),
    })),
  );
}

/** Every place `phrase` stands on a page as consecutive words of one line. */
function findPhrases(words: readonly Word[], phrase: string): Word[] {
  const found: Word[] = [];
  for (let i = 0; i < words.length; i++) {
    const at = findPhrase(words.slice(i), phrase);
    if (at === undefined) break;
    found.push(at);
    i += words.slice(i).findIndex((w) => w.xMin === at.xMin && w.yMin === at.yMin);
  }
  return found;
}

/** Where `phrase` stands on a page as consecutive words of one line, or undefined. */
function findPhrase(words: readonly Word[], phrase: string): Word | undefined {
  const want = phrase.split(/\s+/).filter((w) => w !== '');
  for (let i = 0; i + want.length <= words.length; i++) {
    let ok = true;
    for (let k = 0; k < want.length && ok; k++) ok = words[i + k]!.text === want[k] && Math.abs(words[i + k]!.yMin - words[i]!.yMin) < 1;
    if (ok) {
      const last = words[i + want.length - 1]!;
      return { text: phrase, xMin: words[i]!.xMin, yMin: words[i]!.yMin, xMax: last.xMax, yMax: last.yMax };
    }
  }
  return undefined;
}

/** Sheet names, table column headings and chart titles, read from the package itself. */
async function packageFacts(bytes: Uint8Array): Promise<{ sheets: string[]; tables: string[][]; charts: string[]; summaryParagraphs: string[] }> {
  const zip = await JSZip.loadAsync(bytes);
  const text = async (name: string): Promise<string> => (await zip.file(name)?.async('string')) ?? '';
  const decode = (s: string): string => s.replace(/&lt;/g, '<').replace(/&gt;/g, '>').replace(/&quot;/g, '"').replace(/&apos;/g, "'").replace(/&amp;/g, '&');
  const sheets = [...(await text('xl/workbook.xml')).matchAll(/<sheet\b[^>]*\bname="([^"]*)"/g)].map((m) => decode(m[1]!));
  const tables: string[][] = [];
  const charts: string[] = [];
  for (const name of Object.keys(zip.files).sort()) {
    if (/^xl\/tables\/table\d+\.xml$/.test(name)) tables.push([...(await text(name)).matchAll(/<tableColumn\b[^>]*\bname="([^"]*)"/g)].map((m) => decode(m[1]!)));
    if (/^xl\/charts\/chart\d+\.xml$/.test(name)) {
      const title = /<c:title>.*?<a:t>([^<]*)<\/a:t>/.exec(await text(name));
      if (title !== null) charts.push(decode(title[1]!));
    }
  }
  // The summary sheet (the first, sheet1.xml as the writer names it): the texts of its merged cells, which are its
  // wrapped paragraphs, stored as inline strings or as shared strings (ECMA-376 Part 1 §18.3.1.53 is, §18.4).
  const runs = (xml: string): string => decode([...xml.matchAll(/<t[^>]*>([^<]*)<\/t>/g)].map((t) => t[1]).join(''));
  const sharedPart = await text('xl/sharedStrings.xml');
  const shared = [...sharedPart.matchAll(/<si>([\s\S]*?)<\/si>/g)].map((m) => runs(m[1]!));
  const first = await text('xl/worksheets/sheet1.xml');
  const summaryParagraphs = [...first.matchAll(/<mergeCell ref="([A-Z]+\d+):[A-Z]+\d+"\/>/g)].flatMap((m) => {
    const cell = new RegExp(`<c r="${m[1]}"([^>]*)>([\\s\\S]*?)</c>`).exec(first);
    if (cell === null) return [];
    if (/t="s"/.test(cell[1]!)) {
      const index = /<v>(\d+)<\/v>/.exec(cell[2]!);
      return index === null ? [] : [shared[Number(index[1])] ?? ''];
    }
    return /t="inlineStr"/.test(cell[1]!) ? [runs(cell[2]!)] : [];
  });
  return { sheets, tables, charts, summaryParagraphs };
}

async function main(): Promise<void> {
  const missing = ['soffice', 'pdftoppm', 'pdftotext'].filter((c) => !have(c));
  if (missing.length > 0) {
    console.error(`The render check needs LibreOffice and poppler (${missing.join(', ')} not found). Install them with:\n  sudo ${INSTALL}`);
    process.exit(1);
  }
  run('npm', ['run', '--silent', 'demo']);
  rmSync(OUT, { recursive: true, force: true });
  mkdirSync(OUT, { recursive: true });
  // A private LibreOffice profile, so a desktop session or a parallel run does not lock or change it.
  const profile = mkdtempSync(join(tmpdir(), 'longipane-lo-'));
  const started = Date.now();
  try {
    run('soffice', [`-env:UserInstallation=file://${profile}`, '--headless', '--convert-to', 'pdf', '--outdir', OUT, REPORT]);
  } finally {
    rmSync(profile, { recursive: true, force: true });
  }
  const pdf = join(OUT, 'demo-report.pdf');
  const pages = Number(/Pages:\s+(\d+)/.exec(run('pdfinfo', [pdf]))?.[1] ?? 0);
  run('pdftoppm', ['-png', '-r', String(DPI), pdf, join(OUT, 'page')]);
  const pngs = readdirSync(OUT).filter((f) => /^page-\d+\.png$/.test(f)).sort();
  console.log(`LibreOffice converted the report in ${((Date.now() - started) / 1000).toFixed(1)} s: ${pages} pages, PNG pages in ${OUT}`);

  const facts = await packageFacts(readFileSync(REPORT));
  const words = pageWords(pdf);
  if (pngs.length !== pages || words.length !== pages) fail(`${pages} PDF pages but ${pngs.length} PNG pages and ${words.length} text pages`);
  if (pages < facts.sheets.length || pages > MAX_PAGES) fail(`${pages} pages for ${facts.sheets.length} sheets (expected ${facts.sheets.length} to ${MAX_PAGES})`);

  // Every sheet prints: its name stands in the left footer (&A) of at least one page.
  for (const sheet of facts.sheets) {
    if (!words.some((ws) => findPhrase(ws.filter((w) => w.yMin > 0.85 * maxY(words)), sheet) !== undefined)) fail(`sheet "${sheet}" is on no page`);
  }
  // No table split sideways: some page shows every column heading of the table.
  for (const headers of facts.tables) {
    if (!words.some((ws) => headers.every((h) => findPhrase(ws, h) !== undefined))) fail(`no page shows all the headings of the table ${JSON.stringify(headers)}`);
  }
  // Every chart is drawn: coloured pixels in the chart area below its title. A title can stand more than once (the
  // same chart on the summary and on its own sheet, or in the caption "Numbers behind the chart: …" of its table), so
  // every place it stands is measured, and a title needs as many drawn places as the workbook has charts of that name.
  const px = DPI / 72;
  const wanted = new Map<string, number>();
  for (const title of facts.charts) wanted.set(title, (wanted.get(title) ?? 0) + 1);
  for (const [title, count] of wanted) {
    const drawn: string[] = [];
    let seen = 0;
    words.forEach((ws, page) => {
      for (const at of findPhrases(ws, title)) {
        seen++;
        const img = readPng(readFileSync(join(OUT, pngs[page]!)));
        // The chart area: below the title, 80 points deep (a chart is 300 sheet points tall, printed at ≥ 1/3 scale).
        const n = colouredPixels(img, 0, Math.round(at.yMax * px), img.width, Math.round((at.yMax + 80) * px));
        if (n >= MIN_CHART_PIXELS) drawn.push(`page ${page + 1}: ${n} coloured pixels`);
      }
    });
    if (seen === 0) fail(`chart "${title}": its title is on no page`);
    else if (drawn.length < count) fail(`chart "${title}": ${count} expected, ${drawn.length} drawn (at least ${MIN_CHART_PIXELS} coloured pixels below the title)`);
    else console.log(`chart "${title}" (${count}) drawn on ${drawn.join('; ')}`);
  }
  wholeParagraphs(words, facts.summaryParagraphs, [...CAUTIONS, UNBLINDED_CAUTION]);
  sameDigits(words);
  if (facts.charts.length < 3) fail(`the demo report has ${facts.charts.length} charts; at least 3 expected (means over time, on-time rate by site, visits by status)`);

  if (process.env.LONGIPANE_UPDATE_DOCS === '1' && pngs[0] !== undefined) {
    copyFileSync(join(OUT, pngs[0]), join(ROOT, 'docs', 'report-page.png'));
    console.log('Updated docs/report-page.png');
  }
  if (failures.length > 0) {
    for (const f of failures) console.error(`FAIL ${f}`);
    process.exit(1);
  }
  console.log(`Render check passed: ${facts.sheets.length} sheets, ${facts.tables.length} tables whole, ${facts.charts.length} charts drawn.`);
}

/** A paragraph's words as pdftotext may print them: whole, and split after a hyphen at a line break. */
function ownWords(text: string): Set<string> {
  const own = new Set<string>();
  for (const w of text.split(/\s+/)) {
    own.add(w);
    const parts = w.split(/(?<=-)/);
    for (const p of parts) own.add(p);
  }
  return own;
}

/**
 * Each wrapped paragraph of the summary sheet (`paragraphs`, its merged cells' texts, the cautions among them) stands
 * whole on the first page that shows its opening words: its closing words printed on that line or below, and every
 * word printed between its first line's top and its last line's bottom one of its own. At least one of them must wrap
 * onto more than one line (else the check proves nothing), and the longest caution must be among those checked.
 */
function wholeParagraphs(words: readonly (readonly Word[])[], paragraphs: readonly string[], cautions: readonly string[]): void {
  const longest = cautions.reduce((a, b) => (b.length > a.length ? b : a), '');
  if (!paragraphs.includes(longest)) fail(`the longest caution is not a wrapped paragraph of the summary sheet`);
  let wrapped = 0;
  for (const text of paragraphs) {
    const tokens = text.split(/\s+/).filter((w) => w !== '');
    const opening = tokens.slice(0, 3).join(' ');
    const closing = tokens.slice(-2).join(' ');
    const page = words.findIndex((ws) => findPhrase(ws, opening) !== undefined);
    if (page < 0) {
      fail(`the paragraph "${opening} …" is on no page as one line of words (cut, or overrun by another row)`);
      continue;
    }
    const first = findPhrase(words[page]!, opening)!;
    const last = findPhrases(words[page]!, closing).find((w) => w.yMin >= first.yMin - 1);
    if (last === undefined) {
      fail(`the paragraph "${opening} …" is cut: its last words "${closing}" are not printed on page ${page + 1}`);
      continue;
    }
    const own = ownWords(text);
    const intruders = words[page]!.filter((w) => w.yMax > first.yMin + 1 && w.yMin < last.yMax - 1 && !own.has(w.text));
    if (intruders.length > 0) {
      fail(`the paragraph "${opening} …" is overrun on page ${page + 1}: ${intruders.slice(0, 5).map((w) => `"${w.text}"`).join(', ')} printed over its lines (its row is too short)`);
      continue;
    }
    const lines = new Set(words[page]!.filter((w) => w.yMin >= first.yMin - 1 && w.yMax <= last.yMax + 1).map((w) => Math.round(w.yMin))).size;
    if (lines > 1) wrapped++;
    console.log(`paragraph "${opening} …" (${text.length} characters${text === longest ? ', the longest caution' : ''}) whole on page ${page + 1}: ${lines} line${lines === 1 ? '' : 's'}, ending "${closing}"`);
  }
  if (wrapped === 0) fail('no paragraph of the summary sheet wraps, so the check of whole paragraphs proves nothing');
}

/**
 * The second reader shows a number's digits as the page and the pane do: the treatment difference at the last visit
 * (from the results JSON) stands on the summary page's table row for that visit exactly as formatCell writes it, so
 * each cell's stored number-format code gives the same text in LibreOffice.
 */
function sameDigits(words: readonly (readonly Word[])[]): void {
  const json = JSON.parse(readFileSync(join(ROOT, 'out', 'demo-results.json'), 'utf8')) as { model?: { treatmentEffects?: { label: string; estimate: number; lower: number; upper: number }[] } };
  const last = json.model?.treatmentEffects?.at(-1);
  if (last === undefined) return fail('the demo results have no treatment difference to compare digits with');
  const want = [last.estimate, last.lower, last.upper].map((x) => formatCell(x, 'significant'));
  const label = last.label.split(/\s+/);
  const page = words[0] ?? [];
  const lines = new Map<number, string[]>();
  for (const w of page) lines.set(Math.round(w.yMin), [...(lines.get(Math.round(w.yMin)) ?? []), w.text]);
  const row = [...lines.values()].find((ws) => label.every((l) => ws.includes(l)) && want.some((t) => ws.includes(t)));
  if (row === undefined || !want.every((t) => row.includes(t))) {
    return fail(`the summary page does not show the difference at ${last.label} as ${want.join(', ')} (found: ${row?.join(' ') ?? 'no such row'})`);
  }
  console.log(`the summary page shows the difference at ${last.label} as the page and pane do: ${want.join(', ')}`);
}

/** The lowest word on any page, which is in the footer. */
function maxY(words: readonly (readonly Word[])[]): number {
  return Math.max(...words.flat().map((w) => w.yMax));
}

main().catch((e: unknown) => {
  console.error(e instanceof Error ? e.message : String(e));
  process.exit(1);
});
