/** One hostile-file case, run in its own process so its peak memory is its own: reads the workbook given as the
 * argument with the .xlsx reader and prints {seconds, outcome, peakMB} as JSON. Used by bench/hostile-bench.ts. */
import { readFileSync } from 'node:fs';
import { readXlsxBuffer } from '../src/files/readXlsx';

const bytes = new Uint8Array(readFileSync(process.argv[2]!));
const t0 = performance.now();
let outcome: string;
try {
  const read = await readXlsxBuffer(bytes);
  outcome = `read: ${read.cells.length.toLocaleString('en-US')} rows x ${read.cells[0]?.length ?? 0} columns`;
} catch (e) {
  outcome = `refused: ${(e as Error).message.slice(0, 90)}…`;
}
const seconds = (performance.now() - t0) / 1000;
// maxRSS is in kilobytes (Node's process.resourceUsage, from getrusage).
process.stdout.write(JSON.stringify({ seconds, outcome, peakMB: Math.round(process.resourceUsage().maxRSS / 1024) }));
