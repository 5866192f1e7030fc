/**
 * fitFromTable: builds the model's columns from an intake table and fits (SPEC §3, §5). A row enters when
 * include[i] === 1, table.usableModel[i] === 1, offsets[i] is finite and the row has a subject (subjectIndex ≥ 0, true
 * of every usable row); nothing else is checked here (the caller's include mask carries any further choice); time =
 * calendar offset from the reference date / unit (offset = date − reference date, so study day 1 is time 0 and the
 * day before the reference date is −1 day; unit = 30.4375
 * days for a month, 7 for a week, 1 for a day); subjects are renumbered in order of first appearance; in unblinded
 * mode the arms present among the rows are ordered with the reference arm first (the given one, else the first in the
 * table's order); categorical covariates keep only the levels present among the rows, in the table's level order.
 * Cost O(rows) plus the fit.
 */
import type { IntakeTable } from '../intake/types';
import { ModelInputError } from './errors';
import { DAYS_PER_TIME_UNIT, fitRandomIntercept } from './fit';
import type { FitOptions, ModelData, ModelFit } from './types';

/** Example: 3 subjects x 4 visits at offsets 0, 84, 168, 252 (study days 1, 85, 169, 253) with unit 'week' -> time 0, 12, 24, 36. */
export function modelDataFromTable(table: IntakeTable, offsets: Float64Array, include: Uint8Array, timeUnit: FitOptions['timeUnit'], referenceArm?: string): ModelData {
  if (offsets.length !== table.nRows || include.length !== table.nRows) {
    throw new ModelInputError(`offsets (${offsets.length}) and include (${include.length}) must have one entry per table row (${table.nRows}).`);
  }
  // The rows that enter, as indices in a typed array (counted first): no per-row objects or boxed numbers.
  // The table's columns are read into locals once (the table is a large object; a property read per row costs).
  const usable = table.usableModel;
  const subjectIndex = table.subjectIndex;
  const value = table.value;
  const enters = (i: number): boolean => include[i] === 1 && usable[i] === 1 && Number.isFinite(offsets[i]!) && subjectIndex[i]! >= 0;
  let n = 0;
  for (let i = 0; i < table.nRows; i++) if (enters(i)) n++;
  const picked = new Int32Array(n);
  for (let i = 0, j = 0; i < table.nRows; i++) if (enters(i)) picked[j++] = i;
  const unit = DAYS_PER_TIME_UNIT[timeUnit];
  const y = new Float64Array(n);
  const time = new Float64Array(n);
  const subject = new Int32Array(n);
  // Intake's subject index → the model's, in order of first appearance among the rows that enter.
  const renumber = new Int32Array(table.subjectIds.length).fill(-1);
  const ids: string[] = [];
  for (let j = 0; j < n; j++) {
    const i = picked[j]!;
    const s = subjectIndex[i]!;
    let k = renumber[s]!;
    if (k < 0) {
      k = ids.length;
      renumber[s] = k;
      ids.push(table.subjectIds[s]!);
    }
    y[j] = value[i]!;
    time[j] = offsets[i]! / unit;
    subject[j] = k;
  }
  let armIndex: Int32Array | null = null;
  let arms: string[] = [];
  if (table.mode === 'unblinded' && table.arm !== null) {
    const armCol = table.arm;
    const present = new Set<string>();
    for (let j = 0; j < n; j++) present.add(armCol[picked[j]!]!);
    const inOrder = table.arms.filter((a) => present.has(a));
    for (const a of present) if (!inOrder.includes(a)) inOrder.push(a);
    if (referenceArm !== undefined && !inOrder.includes(referenceArm)) {
      throw new ModelInputError(`the reference arm "${referenceArm}" has no rows in the model (arms present: ${inOrder.map((a) => `"${a}"`).join(', ')}).`);
    }
    const ref = referenceArm ?? inOrder[0];
    arms = ref === undefined ? [] : [ref, ...inOrder.filter((a) => a !== ref)];
    const index = new Map(arms.map((a, k) => [a, k]));
    armIndex = Int32Array.from(picked, (i) => index.get(armCol[i]!)!);
  }
  const covariates = table.covariates.map((c) => {
    if (c.kind === 'numeric') return { name: c.name, kind: 'numeric' as const, values: Float64Array.from(picked, (i) => c.values[i]!) };
    const values = Array.from(picked, (i) => c.values[i]!);
    const present = new Set(values);
    return { name: c.name, kind: 'categorical' as const, values, levels: c.levels.filter((lv) => present.has(lv)) };
  });
  return { y, time, subject, nSubjects: ids.length, armIndex, arms, covariates, subjectIds: ids };
}

/**
 * Fits the random-intercept model to the usable, included rows of an intake table. Throws ModelInputError when no row
 * qualifies or the reference arm is absent; RankDeficiencyError for a dependent design.
 */
export function fitFromTable(table: IntakeTable, offsets: Float64Array, include: Uint8Array, options: FitOptions & { referenceArm?: string }): ModelFit {
  const data = modelDataFromTable(table, offsets, include, options.timeUnit, options.referenceArm);
  if (data.y.length === 0) throw new ModelInputError('no row has everything the model needs (value, study day, subject and, when unblinded, arm).');
  return fitRandomIntercept(data, options);
}
