/**
 * The command line's `Model:` line follows --model: the GEE, the yes/no and the visit-by-visit models print their own
 * main number (the results JSON's, same rounding: formatCell) and name the model. Bundled demo: an invented
 * kidney-function trial (demo/README.md).
 */
import { mkdtemp, readFile, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { main } from '../../src/cli/main';
import type { CliOutput } from '../../src/cli/main';
import { formatCell } from '../../src/core/report/formats';
import { MODEL_NAMES } from '../../src/core/report/mainResult';

const DEMO_DATA = join(__dirname, '..', '..', 'demo', 'egfr-visits.csv');
const DEMO_SCHEDULE = join(__dirname, '..', '..', 'demo', 'egfr-schedule.csv');
const FIXED_NOW = (): Date => new Date('2026-04-01T09:00:00Z');

let dir: string;
beforeAll(async () => {
  dir = await mkdtemp(join(tmpdir(), 'longipane-model-line-'));
});
afterAll(async () => {
  await rm(dir, { recursive: true, force: true });
});

type Json = Record<string, unknown>;

describe('the command line names the chosen model and prints its own number', () => {
  for (const kind of ['repeated', 'gee', 'logistic'] as const) {
    it(`--model ${kind}`, async () => {
      const out: string[] = [];
      const io: CliOutput = { out: (l) => out.push(l), err: () => undefined };
      const json = join(dir, `${kind}.json`);
      const extra = kind === 'logistic' ? ['--responder-below', '45'] : [];
      const code = await main(['analyze', '--data', DEMO_DATA, '--schedule', DEMO_SCHEDULE, '--unblinded', '--reference-arm', 'Placebo', '--model', kind, ...extra, '--json', json], io, FIXED_NOW);
      expect(code).toBe(0);
      const model = JSON.parse(await readFile(json, 'utf8')).model as Json;
      const last = (model.treatmentEffects as Json[]).find((e) => e.label === 'Week 48')!;
      const value = formatCell((kind === 'logistic' ? last.oddsRatio : last.estimate) as number, 'significant');
      const line = out.find((l) => l.startsWith('Model: '));
      expect(line).toContain(kind === 'logistic' ? `in Active were ${value} times those in Placebo` : `differed from Placebo by ${value} `);
      expect(line).toContain(`in ${MODEL_NAMES[kind]}.`);
    }, 60_000);
  }
});
