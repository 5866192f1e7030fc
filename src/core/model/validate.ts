/** Checks model input and options before fitting; misuse throws a ModelInputError naming the problem. */
import { ModelInputError } from './errors';
import type { FitOptions, ModelData } from './types';

/** Throws on inconsistent lengths, an empty arm list or impossible options. Cost O(1). */
export function validateModelShape(data: ModelData, options: FitOptions): void {
  const n = data.y.length;
  if (data.time.length !== n) throw new ModelInputError(`time has ${data.time.length} values for ${n} observations.`);
  if (data.subject.length !== n) throw new ModelInputError(`subject has ${data.subject.length} values for ${n} observations.`);
  if (!Number.isInteger(data.nSubjects) || data.nSubjects < 1) throw new ModelInputError(`nSubjects must be a positive integer, got ${data.nSubjects}.`);
  if (data.subjectIds !== undefined && data.subjectIds.length !== data.nSubjects) {
    throw new ModelInputError(`subjectIds has ${data.subjectIds.length} ids for ${data.nSubjects} subjects.`);
  }
  if (data.armIndex !== null) {
    if (data.armIndex.length !== n) throw new ModelInputError(`armIndex has ${data.armIndex.length} values for ${n} observations.`);
    if (data.arms.length < 1) throw new ModelInputError('armIndex is given but arms is empty.');
  }
  if (!(options.level > 0 && options.level < 1)) throw new ModelInputError(`level must lie strictly between 0 and 1, got ${options.level}.`);
  if (options.method !== 'reml' && options.method !== 'ml') throw new ModelInputError(`method must be 'reml' or 'ml', got '${String(options.method)}'.`);
  if (!['kenward-roger', 'satterthwaite', 'residual', 'containment'].includes(options.dfMethod)) throw new ModelInputError(`unknown dfMethod '${String(options.dfMethod)}'.`);
  if (!['month', 'week', 'day'].includes(options.timeUnit)) throw new ModelInputError(`unknown timeUnit '${String(options.timeUnit)}'.`);
  for (const c of options.contrastDays) {
    if (!Number.isFinite(c.day)) throw new ModelInputError(`contrast day for "${c.label}" is not a finite number.`);
  }
  if (options.gridPoints !== undefined && !(Number.isInteger(options.gridPoints) && options.gridPoints >= 2)) {
    throw new ModelInputError(`gridPoints must be an integer of at least 2, got ${options.gridPoints}.`);
  }
}

/** Throws on a non-finite value or time, or an out-of-range subject or arm index, naming the observation. Cost O(n). */
export function validateModelRows(data: ModelData): void {
  const n = data.y.length;
  for (let r = 0; r < n; r++) {
    if (!Number.isFinite(data.y[r]!)) throw new ModelInputError(`the value at observation ${r + 1} is not a finite number.`);
    if (!Number.isFinite(data.time[r]!)) throw new ModelInputError(`the time at observation ${r + 1} is not a finite number.`);
    const s = data.subject[r]!;
    if (s < 0 || s >= data.nSubjects) throw new ModelInputError(`the subject index ${s} at observation ${r + 1} is outside 0..${data.nSubjects - 1}.`);
  }
  if (data.armIndex !== null) {
    for (let r = 0; r < n; r++) {
      const a = data.armIndex[r]!;
      if (a < 0 || a >= data.arms.length) throw new ModelInputError(`the arm index ${a} at observation ${r + 1} is outside 0..${data.arms.length - 1}.`);
    }
  }
}
