/**
 * One writer case, in its own process so its peak memory is its own (used by bench/writer-bench.ts): builds the report
 * sheets of an invented run of `rows` data rows — the demo trial's sheets, with the two long listings grown to the
 * sizes a run of that many rows gives (deviations ≈ 20.2% of the rows, visits due ≈ 8.9%: 201,851 and 89,357 at
 * 1,000,000 rows in issue 12's profile) — then writes them with the chosen writer ("stream": src/files/writeWorkbook.ts;
 * "exceljs": the former writer kept in test/support/exceljsWriter) and prints JSON {seconds, cpuSeconds, peakMB, specMB, fileMB,
 * listingRows}. Arguments: writer, rows.
 */
import { readFileSync } from 'node:fs';
import { runAnalysis } from '../src/core/pipeline';
import { parseSchedule } from '../src/core/schedule';
import type { SheetCell, SheetSpec, TableBlock } from '../src/core/report/types';
import { readCsvText } from '../src/files';
import { writeWorkbook } from '../src/files/writeWorkbook';
import { writeWorkbook as writeWorkbookWithExceljs } from '../test/support/exceljsWriter/writeWorkbook';
import { mulberry32 } from '../scripts/random';

const [writer, rowsText] = process.argv.slice(2);
const rows = Number(rowsText);
if ((writer !== 'stream' && writer !== 'exceljs') || !Number.isInteger(rows) || rows <= 0) throw new Error('usage: writer-case.ts stream|exceljs ROWS');

/** Listing rows per data row, from issue 12's 1,000,000-row profile. */
const SHARE: Record<string, number> = { Deviations: 201_851 / 1_000_000, VisitsDue: 89_357 / 1_000_000 };

const cells = readCsvText(readFileSync('demo/egfr-visits.csv', 'utf8'));
const parsed = parseSchedule(readCsvText(readFileSync('demo/egfr-schedule.csv', 'utf8')), 'egfr-schedule', 'A1');
if (!parsed.ok) throw new Error('the demo schedule must parse');
const out = await runAnalysis(cells, {
  sheet: 'egfr-visits', topLeft: 'A1', dateSystem: 1900, mode: 'unblinded', numericText: 'accept', schedule: parsed.schedule,
  timeUnit: 'month', dfMethod: 'kenward-roger', method: 'reml', level: 0.95, scheduledOnly: false, perSubject: false,
  inputLabel: 'generated', runAt: '2026-12-02T00:00:00.000Z', referenceArm: 'Placebo',
});
if (!out.ok) throw new Error('the demo run must succeed');

/** A listing grown to `n` rows: the demo's rows in turn, each with a participant id of its own and its numbers moved a
 * little (seeded), so the text is not one repeated block. */
function grow(t: TableBlock, n: number): TableBlock {
  const u = mulberry32(20261202);
  const grown: SheetCell[][] = [];
  for (let i = 0; i < n; i++) {
    const base = t.rows[i % t.rows.length]!;
    grown.push(base.map((v, j) => (j === 0 && typeof v === 'string' ? `KFT-${String(1 + Math.floor(i / 4)).padStart(6, '0')}` : typeof v === 'number' && t.columns[j]?.format !== 'date' && t.columns[j]?.format !== 'integer' ? v + Math.round((u() - 0.5) * 100) / 100 : v)));
  }
  return { ...t, rows: grown };
}

let listingRows = 0;
const sheets: SheetSpec[] = out.sheets.map((s) => ({
  ...s,
  blocks: s.blocks.map((b) => {
    if (b.kind !== 'table' || SHARE[b.id] === undefined) return b;
    const n = Math.round(SHARE[b.id]! * rows);
    listingRows += n;
    return grow(b, n);
  }),
}));
if (listingRows === 0) throw new Error('the demo report has no Deviations or VisitsDue table to grow');

const specMB = Math.round(process.memoryUsage().rss / 1024 / 1024);
const t0 = performance.now();
const cpu0 = process.cpuUsage();
const bytes = writer === 'stream' ? await writeWorkbook(sheets, { runAt: '2026-12-02', fingerprint: '0123456789abcdef' }) : await writeWorkbookWithExceljs(sheets, { runAt: '2026-12-02', fingerprint: '0123456789abcdef' });
const seconds = (performance.now() - t0) / 1000;
const cpu = process.cpuUsage(cpu0);
const cpuSeconds = (cpu.user + cpu.system) / 1e6;
// maxRSS is in kilobytes (Node's process.resourceUsage, from getrusage).
process.stdout.write(JSON.stringify({ seconds, cpuSeconds, peakMB: Math.round(process.resourceUsage().maxRSS / 1024), specMB, fileMB: Math.round((bytes.length / 1024 / 1024) * 10) / 10, listingRows }));
