/** The random-intercept model engine (SPEC §5, §7). */
export { fitRandomIntercept, DAYS_PER_TIME_UNIT } from './fit';
export { ModelInputError, RankDeficiencyError, DegenerateDataError, type DegenerateReason } from './errors';
export { tQuantile, tTwoSided, fQuantile, fUpper, chiSquareQuantile, normalQuantile } from './distributions';
export type * from './types';
export { fitFromTable, modelDataFromTable } from './fromTable';
export { isSlopeFit, modelKindOf, fitRandomSlope, fitSlopeFromTable, slopeTest, mixtureUpperTail, compareModels, type SlopeTest, type ComparedModel, type ModelComparison } from './slope';
