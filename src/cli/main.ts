/** The command line: `longipane analyze …` reads files, runs the same pipeline as the add-in and writes .xlsx/JSON. */
import { detectMapping, IntakeUsageError, parseCell } from '../core/intake';
import type { Issue } from '../core/intake/types';
import { PipelineUsageError, runAnalysis } from '../core/pipeline';
import type { AnalysisSettings } from '../core/pipeline/types';
import { CAUTIONS, UNBLINDED_CAUTION } from '../core/report/cautions';
import { mainResult, mainSentences } from '../core/report/mainResult';
import { isoWithOffset } from '../core/report/runTime';
import { STATUS_WORDS } from '../core/schedule/types';
import type { VisitStatus } from '../core/schedule/types';
import { FileFormatError, printStampOf, writeWorkbook } from '../files';
import pkg from '../../package.json';
import { HELP_TEXT, parseAnalyzeArgs, UsageError } from './args';
import type { AnalyzeArgs } from './args';
import { OutputWriteError, writeFilesAtomic, type FileData } from './atomicWrite';
import { jsonPieces } from './jsonPieces';
export { removeTemporariesOnSignal } from './atomicWrite';
import { buildMapping } from './mapping';
import { readDataFile, readScheduleFile } from './readInputs';
import { groupLines, groupWarnings, leftOutOf, otherWarnings, where } from './groupWarnings';
import { stageClock } from './profile';
import type { Printable } from './groupWarnings';

/** Errors that --map can cure: a role with no column. */
const MAPPING_CODES: ReadonlySet<string> = new Set(['no-subject-column', 'no-time-column', 'no-value-column', 'no-arm-column']);

export const VERSION: string = pkg.version;

/** Where output goes; tests pass their own to capture it. */
export interface CliOutput {
  out(line: string): void;
  err(line: string): void;
}

const processConsole: CliOutput = {
  out: (line) => process.stdout.write(`${line}\n`),
  err: (line) => process.stderr.write(`${line}\n`),
};

function countsLine(counts: unknown): string | null {
  if (counts === null || typeof counts !== 'object') return null;
  const c = counts as Record<string, unknown>;
  return (Object.keys(STATUS_WORDS) as VisitStatus[]).map((k) => `${STATUS_WORDS[k].toLowerCase()} ${String(c[k] ?? 0)}`).join(', ');
}

/** The results JSON as written: compact on one line by default (smaller and quicker to write), indented with
 * `--pretty`; always ending with a newline. */
export function jsonText(json: unknown, pretty: boolean): string {
  return `${pretty ? JSON.stringify(json, null, 2) : JSON.stringify(json)}\n`;
}

/** The compact results file, jsonText(json, false), as pieces made while the file is written. */
function* jsonFileText(json: unknown): Generator<string> {
  yield* jsonPieces(json);
  yield '\n';
}

function printSummary(json: Record<string, unknown>, io: CliOutput): void {
  const input = (json.input ?? {}) as Record<string, unknown>;
  const visits = (json.visits ?? {}) as Record<string, unknown>;
  const model = json.model as Record<string, unknown> | null | undefined;
  io.out(
    `Rows: ${String(input.rows)} (${String(input.usedForTiming)} used for visit timing, ${String(input.usedForModel)} for the model); participants: ${String(input.subjects)}.`,
  );
  const settings = (json.settings ?? {}) as Record<string, unknown>;
  if (typeof settings.cutoff === 'string') io.out(`Data cut-off: ${settings.cutoff}.`);
  if (Array.isArray(json.notes)) for (const n of json.notes) io.out(`Note: ${String(n)}`);
  const line = countsLine(visits.counts);
  if (line !== null) io.out(`Visits: ${line}.`);
  // The random-intercept and slope models carry their own summary; the other models' main result is read from their
  // JSON section as the summary sheet reads it (mainResult.ts), naming the model.
  const main = model ? mainResult(model) : null;
  if (model && typeof model.summary === 'string') io.out(`Model: ${model.summary}`);
  else if (main !== null) io.out(`Model: ${mainSentences(main, false).join(' ')}`);
  else if (typeof json.modelNote === 'string') io.out(`Model: not fitted (${json.modelNote.replace(/\.+$/, '')}).`);
}

/** The run time as ISO 8601 with this computer's UTC offset at that moment (results JSON settings.runAt). */
const localRunAt = (d: Date): string => isoWithOffset(d.getTime(), Math.round(-d.getTimezoneOffset()));
const rowsWord = (n: number): string => `${n.toLocaleString('en-US')} row${n === 1 ? '' : 's'}`;

/**
 * The rows left out of each use, counted and then listed once per use, grouped by kind (the first row of each kind in
 * full, then how many more and their first cells); then any other warnings (rows kept, the file's notes). The counts
 * are the numbers of distinct rows the lines under them account for. O(issues).
 */
function printLeftOut(issues: readonly Issue[], fileNotes: readonly Printable[], io: CliOutput): void {
  const timing = leftOutOf(issues, 'timing');
  const model = leftOutOf(issues, 'model');
  if (timing.rows > 0 || model.rows > 0) {
    io.out(`Rows left out of visit timing: ${timing.rows.toLocaleString('en-US')}; of the model: ${model.rows.toLocaleString('en-US')} (each is listed with its reason in the outputs).`);
    if (timing.rows > 0) {
      io.out(`Left out of visit timing (${rowsWord(timing.rows)}):`);
      for (const l of groupLines(timing.groups)) io.out(l);
    }
    if (model.rows > 0) {
      io.out(`Left out of the model (${rowsWord(model.rows)}):`);
      for (const l of groupLines(model.groups)) io.out(l);
    }
  }
  const others = groupWarnings([...fileNotes, ...otherWarnings(issues.filter((i) => i.severity === 'warning'))]);
  const count = others.reduce((n, g) => n + g.count, 0);
  if (count > 0) {
    io.out(`Other warnings (${count.toLocaleString('en-US')}; none leaves a row out):`);
    for (const l of groupLines(others)) io.out(l);
  }
}

async function analyze(args: AnalyzeArgs, io: CliOutput, now: () => Date): Promise<number> {
  const clock = stageClock((line) => io.err(line));
  const data = await readDataFile(args.data, args.sheet);
  clock.mark('read data file');
  const schedule = await readScheduleFile(args.schedule);
  if (!schedule.ok) {
    io.err(`The schedule "${args.schedule}" cannot be used:`);
    for (const e of schedule.errors) io.err(`  ${e}`);
    return 1;
  }
  for (const w of schedule.warnings) io.out(`Schedule note: ${w}`);
  const headers = (data.source.rowCount > 0 ? data.source.rowCells(0) : []).map((h) => (h === null || h === undefined ? '' : String(h)));
  const custom = args.map.length > 0 || args.covariates.length > 0;
  const mode = args.unblinded ? 'unblinded' : 'blinded';
  const settings: AnalysisSettings = {
    sheet: data.sheet,
    topLeft: data.topLeft,
    dateSystem: data.dateSystem,
    mode,
    ...(custom ? { mapping: buildMapping(detectMapping(headers, mode).mapping, headers, args.map, args.covariates, parseCell(data.topLeft).col) } : {}),
    schedule: schedule.schedule,
    ...(args.cutoff === undefined ? {} : { cutoff: args.cutoff }),
    ...(args.cutoffDay === undefined ? {} : { cutoffDay: args.cutoffDay }),
    ...(args.referenceArm === undefined ? {} : { referenceArm: args.referenceArm }),
    ...(args.dateOrder === undefined ? {} : { dateOrder: args.dateOrder }),
    timeUnit: args.timeUnit,
    dfMethod: args.df,
    method: args.method,
    model: args.model,
    level: args.level,
    scheduledOnly: args.scheduledOnly,
    perSubject: args.perSubject,
    ...(args.responder === undefined ? {} : { responder: args.responder }),
    inputLabel: data.label,
    fileFingerprint: data.fingerprint,
    ...(data.notes.length > 0 ? { fileNotes: data.notes } : {}),
    runAt: localRunAt(now()),
    numericText: data.numericText,
    toolVersion: VERSION,
  };
  if (args.unblinded) io.out(UNBLINDED_CAUTION);
  // With LONGIPANE_PROFILE set, each of the pipeline's stages is timed from its start to the next one's.
  const running: { stage: string | null } = { stage: null };
  const output = await runAnalysis(data.source, settings, {
    onStage: (next) => {
      if (running.stage !== null) clock.mark(running.stage);
      running.stage = next;
      // Intake has its typed columns once windowing starts: let the file's text and index go (releasableSource.ts).
      if (next === 'windowing') data.source.release();
    },
  });
  if (running.stage !== null) clock.mark(running.stage);
  const errors = output.issues.filter((i: Issue) => i.severity === 'error');
  // The reader's notes about the file lead; then intake's warnings, grouped by kind (linear in their number).
  const fileNotes: Printable[] = data.notes.map((n) => ({ code: `file:${n}`, cell: null, message: n }));
  if (!output.ok) {
    const groups = groupWarnings([...fileNotes, ...output.issues.filter((i: Issue) => i.severity === 'warning')]);
    const warned = groups.reduce((n, g) => n + g.count, 0);
    io.err(`The data "${args.data}" cannot be analysed:`);
    for (const e of errors) io.err(`  ${where(e)}`);
    if (errors.length === 0) io.err('  The run stopped without a reason given.');
    if (errors.some((e) => MAPPING_CODES.has(e.code))) {
      const shown = headers.slice(0, 20).map((h) => `"${h}"`).join(', ');
      io.err(`  Name the columns with --map role=Header (roles: participant, date, studyDay, reference, visit, value, arm, site, exit, exitStatus, exitReason); the headers are: ${shown}${headers.length > 20 ? ', …' : ''}.`);
    }
    if (warned > 0) {
      io.err(`The warnings found before it stopped (${warned.toLocaleString('en-US')}, grouped by kind):`);
      for (const l of groupLines(groups)) io.err(l);
    }
    // A script reading the JSON learns why the run stopped: write it even now (all or nothing, as below).
    if (args.json !== undefined && output.json !== undefined) {
      await writeFilesAtomic([{ target: args.json, data: jsonText(output.json, args.pretty) }]);
      io.err(`Wrote ${args.json} (the reasons the run stopped).`);
    }
    return 1;
  }
  printLeftOut(output.issues, fileNotes, io);
  printSummary(output.json, io);
  // The cautions of SPEC §2 go with every result, on the terminal as on every sheet.
  for (const c of CAUTIONS) io.out(`Caution: ${c}`);
  // Build every output in memory first, then write all or nothing, so a failure leaves no file half-written.
  const files: { target: string; data: FileData }[] = [];
  if (args.out !== undefined) files.push({ target: args.out, data: await writeWorkbook(output.sheets, printStampOf(output.json)) });
  clock.mark('report workbook');
  // Compact JSON goes to the file in pieces as it is written (jsonPieces.ts: the same text, never one ~60 MB string).
  if (args.json !== undefined) files.push({ target: args.json, data: args.pretty ? jsonText(output.json, true) : jsonFileText(output.json) });
  clock.mark('results JSON text');
  await writeFilesAtomic(files);
  clock.mark('write files');
  for (const f of files) io.out(`Wrote ${f.target}`);
  if (args.out === undefined && args.json === undefined) io.out('Nothing written: give --out FILE.xlsx and/or --json FILE.json to save the results.');
  return 0;
}

/**
 * Runs the command line with the arguments after the program name and returns the exit code:
 * 0 done, 1 the data or schedule could not be analysed, 2 wrong usage or an unreadable file.
 */
export async function main(argv: readonly string[], io: CliOutput = processConsole, now: () => Date = () => new Date()): Promise<number> {
  const [command, ...rest] = argv;
  if (command === undefined || command === 'help' || command === '--help' || command === '-h') {
    io.out(HELP_TEXT);
    return command === undefined ? 2 : 0;
  }
  if (command === '--version' || command === 'version') {
    io.out(VERSION);
    return 0;
  }
  if (command === 'analyze' && (rest.includes('--help') || rest.includes('-h'))) {
    io.out(HELP_TEXT);
    return 0;
  }
  if (command !== 'analyze') {
    io.err(`longipane: unknown command "${command}". Run \`longipane help\`.`);
    return 2;
  }
  try {
    return await analyze(parseAnalyzeArgs(rest), io, now);
  } catch (e) {
    if (e instanceof UsageError) {
      io.err(`longipane: ${e.message}`);
      io.err('Run `longipane help` for the options.');
      return 2;
    }
    if (e instanceof FileFormatError || e instanceof IntakeUsageError || e instanceof PipelineUsageError || e instanceof OutputWriteError) {
      io.err(`longipane: ${e.message}`);
      return 2;
    }
    const err = e as NodeJS.ErrnoException;
    if (typeof err.code === 'string' && typeof err.path === 'string') {
      io.err(`longipane: cannot write "${err.path}" (${err.code}): ${err.message}`);
      return 2;
    }
    io.err(`longipane: unexpected failure: ${e instanceof Error ? (e.stack ?? e.message) : String(e)}`);
    return 70;
  }
}
