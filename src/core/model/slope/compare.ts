/**
 * The model comparison: every model fitted to the same rows, with its log-likelihood, AIC, BIC and number of
 * parameters, and the likelihood-ratio test of the random slope when both the random-intercept and the random
 * intercept and slope models were fitted (lrt.ts). Cost O(models).
 */
import type { ModelFit, ModelKind } from '../types';
import { slopeTest, type SlopeTest } from './lrt';

export interface ComparedModel {
  readonly kind: ModelKind;
  readonly logLik: number;
  readonly aic: number;
  readonly bic: number;
  readonly nParameters: number;
}

export interface ModelComparison {
  readonly models: readonly ComparedModel[];
  /** Null unless both the intercept and the slope model were fitted, by the same method. */
  readonly slopeTest: SlopeTest | null;
}

/**
 * Example: an intercept fit with logLik −125 and a slope fit with −120 (both REML) -> two models, slopeTest statistic
 * 10 and p ≈ 0.0043.
 */
export function compareModels(fits: readonly { kind: ModelKind; fit: ModelFit }[], level: number): ModelComparison {
  const models = fits.map(({ kind, fit }) => ({ kind, logLik: fit.logLik, aic: fit.aic, bic: fit.bic, nParameters: fit.nParameters }));
  const intercept = fits.find((f) => f.kind === 'intercept')?.fit;
  const slope = fits.find((f) => f.kind === 'slope')?.fit;
  const test = intercept !== undefined && slope !== undefined && intercept.method === slope.method ? slopeTest(slope.logLik, intercept.logLik, level) : null;
  return { models, slopeTest: test };
}
