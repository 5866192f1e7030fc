/** The random intercept and slope model, and its comparison with the random-intercept model. */
export { fitRandomSlope } from './fit';
export { slopeTest, mixtureUpperTail, type SlopeTest } from './lrt';
