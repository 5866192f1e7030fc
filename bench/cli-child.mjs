// One whole command-line run for bench/whole-run.ts, in a process of its own: the built command line
// (build/cli.mjs, `npm run build:cli`) with the arguments given, timed from the call to its return (Node's own start-up
// and the bundle's loading not counted). Prints, on standard error after the run's own lines,
// `longipane-bench {"seconds", "cpuSeconds", "peakMB", "exitCode"}` (peakMB: this process's high-water mark of resident memory).
import { main } from '../build/cli.mjs';

const quiet = { out: () => {}, err: (line) => process.stderr.write(`${line}\n`) };
const t0 = performance.now();
const c0 = process.cpuUsage();
const exitCode = await main(process.argv.slice(2), quiet);
const seconds = (performance.now() - t0) / 1000;
const c1 = process.cpuUsage(c0);
const cpuSeconds = (c1.user + c1.system) / 1e6;
process.stderr.write(`longipane-bench ${JSON.stringify({ seconds, cpuSeconds, peakMB: Math.round(process.resourceUsage().maxRSS / 1024), exitCode })}\n`);
