/**
 * Stage timings for `LONGIPANE_PROFILE=1`: wall-clock seconds, CPU seconds and resident memory after each stage of a
 * run, printed to standard error as one line per stage, so a benchmark (bench/whole-run.ts) can split a whole run
 * into reading, intake, windowing, fitting, report building and output. Costs nothing when the variable is unset.
 */

/** One measured stage. */
export interface StageTime {
  readonly stage: string;
  readonly seconds: number;
  readonly cpuSeconds: number;
  /** Resident memory when the stage ended, in MB. */
  readonly rssMB: number;
  /** Of which the JavaScript heap in use, and memory outside it (buffers, typed arrays' stores), in MB. */
  readonly heapMB: number;
  readonly externalMB: number;
}

/** The prefix of every profile line on standard error; the rest of the line is JSON (one StageTime). */
export const PROFILE_PREFIX = 'longipane-profile ';

/** Records the stages of one run; `mark(stage)` ends the stage that ran since the previous mark. */
export class StageClock {
  private lastWall = process.hrtime.bigint();
  private lastCpu = process.cpuUsage();
  readonly stages: StageTime[] = [];

  constructor(private readonly print: ((line: string) => void) | null) {}

  mark(stage: string): void {
    if (this.print === null) return;
    const wall = process.hrtime.bigint();
    const cpu = process.cpuUsage();
    const entry: StageTime = {
      stage,
      seconds: Number(wall - this.lastWall) / 1e9,
      cpuSeconds: (cpu.user - this.lastCpu.user + cpu.system - this.lastCpu.system) / 1e6,
      ...memoryNow(),
    };
    this.stages.push(entry);
    this.print(`${PROFILE_PREFIX}${JSON.stringify(entry)}`);
    this.lastWall = process.hrtime.bigint();
    this.lastCpu = process.cpuUsage();
  }
}

function memoryNow(): { rssMB: number; heapMB: number; externalMB: number } {
  const m = process.memoryUsage();
  const mb = (bytes: number): number => Math.round(bytes / 1048576);
  return { rssMB: mb(m.rss), heapMB: mb(m.heapUsed), externalMB: mb(m.external) };
}

/** A clock that prints when LONGIPANE_PROFILE is set to anything but "" or "0", and does nothing otherwise. */
export function stageClock(print: (line: string) => void): StageClock {
  const v = process.env.LONGIPANE_PROFILE;
  return new StageClock(v !== undefined && v !== '' && v !== '0' ? print : null);
}
