/**
 * The report writer at the sizes of a 200,000-row and a 1,000,000-row run (bench/writer-case.ts builds the sheets:
 * the demo report with its deviations and visits-due listings grown to ~20.2% and ~8.9% of the rows), before (the
 * exceljs writer it replaced, test/support/exceljsWriter) and after (src/files/writeWorkbook.ts). Each case runs in a
 * child process of its own, so its peak resident memory is its own.
 */
import { execFileSync } from 'node:child_process';
import { dirname, join, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';

export interface WriterEntry {
  readonly writer: 'stream' | 'exceljs';
  readonly runRows: number;
  readonly listingRows: number;
  /** Wall-clock seconds of the write alone (the machine is shared, so CPU seconds are printed beside them). */
  readonly seconds: number;
  readonly cpuSeconds: number;
  /** The process's high-water mark of resident memory, and its resident memory once the sheets were built. */
  readonly peakMB: number;
  readonly specMB: number;
  readonly fileMB: number;
}

export function runWriterBench(sizes: readonly number[] = [200_000, 1_000_000]): WriterEntry[] {
  const here = dirname(fileURLToPath(import.meta.url));
  const entries: WriterEntry[] = [];
  for (const runRows of sizes) {
    for (const writer of ['exceljs', 'stream'] as const) {
      // exceljs needs more than Node's default heap at 1,000,000 rows (3.6 GB in issue 12's profile).
      const json = execFileSync(process.execPath, ['--max-old-space-size=8192', '--import', 'tsx', join(here, 'writer-case.ts'), writer, String(runRows)], {
        encoding: 'utf8',
        cwd: resolve(here, '..'),
        maxBuffer: 1 << 20,
      });
      entries.push({ writer, runRows, ...(JSON.parse(json) as Omit<WriterEntry, 'writer' | 'runRows'>) });
    }
  }
  return entries;
}

/** The table printed by `npm run bench`. */
export function writerTable(entries: readonly WriterEntry[]): string {
  const pad = (s: string, n: number): string => s.padStart(n);
  const head = `${'writer'.padEnd(10)}${pad('run rows', 10)}${pad('listing rows', 14)}${pad('wall s', 9)}${pad('CPU s', 8)}${pad('peak MB', 9)}${pad('sheets MB', 11)}${pad('file MB', 9)}${pad('CPU ratio', 11)}`;
  const lines = entries.map((e) => {
    const before = entries.find((b) => b.writer === 'exceljs' && b.runRows === e.runRows);
    const ratio = before === undefined ? '' : (e.cpuSeconds / before.cpuSeconds).toFixed(2);
    return `${e.writer.padEnd(10)}${pad(e.runRows.toLocaleString('en'), 10)}${pad(e.listingRows.toLocaleString('en'), 14)}${pad(e.seconds.toFixed(2), 9)}${pad(e.cpuSeconds.toFixed(2), 8)}${pad(String(e.peakMB), 9)}${pad(String(e.specMB), 11)}${pad(String(e.fileMB), 9)}${pad(ratio, 11)}`;
  });
  return [
    head,
    ...lines,
    'Writing the report workbook: exceljs = the writer before (in memory, then jszip for charts and links), stream = ours.',
    'CPU s counts every thread of the process (deflate runs on the thread pool); CPU ratio = this writer / exceljs at that size.',
    'peak MB: the child process\'s high-water mark of resident memory; sheets MB: its resident memory once the sheets were built.',
  ].join('\n');
}
