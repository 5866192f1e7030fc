/**
 * The add-in's requests at 1,000,000 rows, from the pure planning functions (readPlan, planSize): reads of `values`
 * only against `values` + `valueTypes`, and writes with number formats by column (workbook styles) against a code
 * per cell. Issue 12's target: payloads halved or better. The listing is invented (the demo generator's trial,
 * scripts/make-demo-data.ts, grown to 1,000,000 rows); the report's two long sheets are grown to the sizes a
 * 1,000,000-row run gives (issue 12: a 201,851-row deviations sheet and an 89,357-row visits-due sheet) by repeating
 * the demo run's rows. Byte counts are the JSON text the requests carry (the planning's own estimate for writes).
 */
import { describe, expect, it } from 'vitest';
import { readFileSync } from 'node:fs';
import { resolve } from 'node:path';
import { dayNumber, generateTrial } from '../../scripts/make-demo-data';
import { detectMapping } from '../../src/core/intake';
import { runAnalysis } from '../../src/core/pipeline/runAnalysis';
import type { Block, SheetSpec } from '../../src/core/report/types';
import { parseSchedule } from '../../src/core/schedule';
import { readCsvFile } from '../../src/files';
import { layoutSheet } from '../../src/excel/layout';
import { readPlan } from '../../src/excel/readRange';
import { planSize } from '../../src/excel/writePlan';

const ROWS = 1_000_000;
const TARGET_BYTES = 1_500_000; // the adapter's defaults (readRange, renderSheet)
const READ_CELLS = 500_000;
const WRITE_CELLS = 200_000;

/** JSON bytes of the whole listing's `values` and of its `valueTypes`, as the host would send them (ASCII only). */
function listingBytes(): { values: number; types: number; cells: number } {
  let rows = 0;
  let values = 0;
  let types = 0;
  const typeOf = (x: unknown): string => (x === '' ? 'Empty' : typeof x === 'number' ? 'Double' : 'String');
  generateTrial(
    {
      patients: Math.ceil(ROWS / 3.8),
      seed: 12,
      firstRandomised: dayNumber('2025-01-06'),
      enrolmentDays: 270,
      cutoff: dayNumber('2026-03-31'),
      missRate: 0.05,
      dropoutRate: 0.1,
      extraRate: 0.06,
      repeatRate: 0.03,
    },
    (r) => {
      if (rows >= ROWS) return;
      rows++;
      // Dates as the host gives them (serial numbers), the exit date empty when not known.
      const row = [r.subject, r.site, r.arm, r.visit, r.date, r.rand, r.value, r.exit ?? '', r.status, r.reason];
      values += JSON.stringify(row).length + 1;
      types += JSON.stringify(row.map(typeOf)).length + 1;
    },
  );
  expect(rows).toBe(ROWS);
  return { values, types, cells: rows * 10 };
}

/** The demo run's sheets with its long tables grown to a 1,000,000-row run's sizes by repeating their rows. */
async function reportAtScale(): Promise<SheetSpec[]> {
  const demo = resolve(process.cwd(), 'demo');
  const data = readCsvFile(new Uint8Array(readFileSync(resolve(demo, 'egfr-visits.csv'))), 'egfr-visits.csv', 'egfr-visits');
  const sched = parseSchedule(readCsvFile(new Uint8Array(readFileSync(resolve(demo, 'egfr-schedule.csv'))), 's.csv', 's').cells, 's', 'A1');
  if (!sched.ok) throw new Error('demo schedule');
  const output = await runAnalysis(data.cells, {
    sheet: 'egfr-visits',
    topLeft: 'A1',
    dateSystem: 1900,
    mode: 'unblinded',
    referenceArm: 'Placebo',
    schedule: sched.schedule,
    mapping: detectMapping(data.cells[0]!.map(String), 'unblinded').mapping,
    numericText: 'accept',
    runAt: '2026-12-02T10:00:00.000Z',
  } as Parameters<typeof runAnalysis>[1]);
  if (!output.ok) throw new Error('demo run');
  const grown = (rows: number) => (b: Block): Block => {
    if (b.kind !== 'table' || b.rows.length < 20) return b;
    return { ...b, rows: Array.from({ length: rows }, (_, i) => b.rows[i % b.rows.length]!) };
  };
  return output.sheets.map((s) => {
    if (/deviation/i.test(s.name)) return { ...s, blocks: s.blocks.map(grown(201_851)) };
    if (/due/i.test(s.name)) return { ...s, blocks: s.blocks.map(grown(89_357)) };
    return s;
  });
}

describe('the add-in\'s requests at 1,000,000 rows', () => {
  it('reading `values` only at least halves the read payload and the requests', () => {
    const b = listingBytes();
    const before = readPlan(ROWS, 10, (b.values + b.types) / b.cells, TARGET_BYTES, READ_CELLS);
    const after = readPlan(ROWS, 10, b.values / b.cells, TARGET_BYTES, READ_CELLS);
    const beforeBytes = b.values + b.types;
    const afterBytes = b.values;
    process.stdout.write(
      `reads at 1,000,000 rows: before ${before.length} requests, ${(beforeBytes / 1e6).toFixed(1)} MB; ` +
        `after ${after.length} requests, ${(afterBytes / 1e6).toFixed(1)} MB\n`,
    );
    expect(afterBytes).toBeLessThanOrEqual(beforeBytes / 2);
    expect(after.length).toBeLessThanOrEqual(Math.ceil(before.length / 2));
    expect(after.reduce((n, r) => n + r, 0)).toBe(ROWS);
  }, 60_000);

  it('writing number formats by column at least halves the write payload, with no more requests', async () => {
    const sheets = await reportAtScale();
    const rows = sheets.flatMap((s) => s.blocks).reduce((n, b) => n + (b.kind === 'table' ? b.rows.length : 0), 0);
    expect(rows).toBeGreaterThan(291_000);
    let cells = { requests: 0, bytes: 0 };
    let columns = { requests: 0, bytes: 0 };
    for (const sheet of sheets) {
      const patches = layoutSheet(sheet, 1900).patches;
      const c = planSize(patches, TARGET_BYTES, WRITE_CELLS, 'cells');
      const k = planSize(patches, TARGET_BYTES, WRITE_CELLS, 'columns');
      cells = { requests: cells.requests + c.requests, bytes: cells.bytes + c.bytes };
      // Column mode adds one request per sheet: the styles it needs (renderSheet's ensureFormatStyles).
      columns = { requests: columns.requests + k.requests + 1, bytes: columns.bytes + k.bytes };
    }
    process.stdout.write(
      `writes at 1,000,000 rows (${rows} table rows): per cell ${cells.requests} requests, ${(cells.bytes / 1e6).toFixed(1)} MB; ` +
        `by column ${columns.requests} requests, ${(columns.bytes / 1e6).toFixed(1)} MB\n`,
    );
    expect(columns.bytes).toBeLessThanOrEqual(cells.bytes / 2);
    expect(columns.requests).toBeLessThanOrEqual(cells.requests);
  }, 120_000);
});
