/** The random-intercept logistic model for a yes/no outcome (adaptive Gauss–Hermite quadrature). */
export { fitLogistic } from './fitLogistic';
export { hermiteRule, type HermiteRule } from './hermite';
export type * from './types';
