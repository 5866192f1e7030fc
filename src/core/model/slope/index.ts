/** The random intercept and slope model, and its comparison with the random-intercept model. */
export { fitRandomSlope } from './fit';
export { fitSlopeFromTable } from './fromTable';
export { slopeTest, mixtureUpperTail, type SlopeTest } from './lrt';
export { compareModels, type ComparedModel, type ModelComparison } from './compare';
export { isSlopeFit, modelKindOf } from './kind';
