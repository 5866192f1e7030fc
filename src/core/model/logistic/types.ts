/** Types of the random-intercept logistic model for a yes/no outcome (adaptive Gauss–Hermite quadrature). */
import type { ContrastDay, Term, TermKind, TimeUnit } from '../types';
import type { ArmContrast } from '../armContrast';

export interface LogisticOptions {
  /** Confidence level, 0 < level < 1. */
  readonly level: number;
  readonly timeUnit: TimeUnit;
  /** Quadrature nodes per participant, 1 (Laplace) to 100; default 25. */
  readonly nodes?: number;
  /** Visits (label, study day) at which to give the population-averaged probability per arm. */
  readonly contrastDays: readonly ContrastDay[];
}

/** One fixed effect on the logit scale with its odds ratio; Wald z, interval and p. */
export interface LogisticEffect {
  readonly term: string;
  readonly kind: TermKind;
  readonly arm: string | null;
  readonly estimate: number;
  readonly se: number;
  readonly z: number;
  readonly lower: number;
  readonly upper: number;
  readonly p: number;
  readonly oddsRatio: number;
  readonly oddsRatioLower: number;
  readonly oddsRatioUpper: number;
}

/** Population-averaged probability of "yes" at one visit in one arm: ∫ expit(x'β + σz) φ(z) dz. */
export interface MarginalProbability {
  readonly arm: string | null;
  readonly label: string;
  readonly day: number;
  readonly time: number;
  readonly probability: number;
}

/** An arm's difference from the reference arm at a contrast day on the log-odds scale, with its odds ratio. */
export interface LogisticContrast extends ArmContrast {
  readonly oddsRatio: number;
  readonly oddsRatioLower: number;
  readonly oddsRatioUpper: number;
}

export interface LogisticFit {
  readonly kind: 'logistic';
  readonly status: 'converged' | 'boundary' | 'failed';
  readonly message: string;
  readonly level: number;
  readonly timeUnit: TimeUnit;
  readonly nodes: number;
  readonly nSubjects: number;
  readonly nObservations: number;
  /** Observations with outcome yes (1). */
  readonly nYes: number;
  readonly terms: readonly Term[];
  readonly arms: readonly string[];
  readonly fixedEffects: readonly LogisticEffect[];
  /** Between-participant variance of the random intercept on the logit scale, σ², and its SE (delta method). */
  readonly variance: { readonly subject: number; readonly subjectSe: number | null };
  readonly logLik: number;
  readonly aic: number;
  readonly bic: number;
  /** Fixed effects + 1 variance. */
  readonly nParameters: number;
  readonly iterations: number;
  /**
   * The log-likelihood at the estimates recomputed with twice the nodes, minus the fitted one: near 0 when the
   * quadrature is accurate. Adaptive Gauss–Hermite converges slowly for participants who answer the same throughout
   * when the between-participant variance is large.
   */
  readonly quadratureCheck: { readonly nodes: number; readonly logLikChange: number };
  readonly marginalProbabilities: readonly MarginalProbability[];
  /** Each arm against the reference arm at each contrast day (Wald, from the inverse information); empty when blinded or failed. */
  readonly treatmentEffects: readonly LogisticContrast[];
}
