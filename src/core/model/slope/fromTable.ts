/** fitSlopeFromTable: the random intercept and slope model on an intake table's rows, as fitFromTable (fromTable.ts). */
import type { IntakeTable } from '../../intake/types';
import { ModelInputError } from '../errors';
import { modelDataFromTable } from '../fromTable';
import type { FitOptions, SlopeFit } from '../types';
import { fitRandomSlope } from './fit';

/** Throws ModelInputError when no row qualifies or the reference arm is absent; RankDeficiencyError for a dependent design. */
export function fitSlopeFromTable(table: IntakeTable, offsets: Float64Array, include: Uint8Array, options: FitOptions & { referenceArm?: string }): SlopeFit {
  const data = modelDataFromTable(table, offsets, include, options.timeUnit, options.referenceArm);
  if (data.y.length === 0) throw new ModelInputError('no row has everything the model needs (value, study day, subject and, when unblinded, arm).');
  return fitRandomSlope(data, options);
}
