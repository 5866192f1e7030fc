// The baseline of bench/whole-run.ts, in a process of its own: papaparse (a dependency; its default settings) parses
// the CSV file given as the argument into arrays of strings, from reading the file to the last row. Prints
// {seconds, cpuSeconds, rows, peakMB} as JSON (peakMB: this process's high-water mark of resident memory).
import { readFileSync } from 'node:fs';
import Papa from 'papaparse';

const t0 = performance.now();
const c0 = process.cpuUsage();
const text = readFileSync(process.argv[2], 'utf8');
const parsed = Papa.parse(text, { skipEmptyLines: false });
const seconds = (performance.now() - t0) / 1000;
const c1 = process.cpuUsage(c0);
const cpuSeconds = (c1.user + c1.system) / 1e6;
process.stdout.write(JSON.stringify({ seconds, cpuSeconds, rows: parsed.data.length, peakMB: Math.round(process.resourceUsage().maxRSS / 1024) }));
