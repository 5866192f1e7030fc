/** Types of the random-intercept model engine (SPEC §5): what goes in, what comes out. */
import type { CovariateColumn } from '../intake/types';

export type TimeUnit = 'month' | 'week' | 'day';
export type DfMethod = 'kenward-roger' | 'satterthwaite' | 'residual' | 'containment';
export type FitMethod = 'reml' | 'ml';
export type FitStatus = 'converged' | 'boundary' | 'failed';
/** Which model a run fits and reports: random intercept, random slope, repeated measures, GEE, yes/no outcome. */
export type ModelKind = 'intercept' | 'slope' | 'repeated' | 'gee' | 'logistic';
export type TermKind = 'intercept' | 'arm' | 'time' | 'armTime' | 'covariate';

/** Clean model columns, one entry per observation. */
export interface ModelData {
  readonly y: Float64Array;
  /** Time in model units (e.g. months since day 1). */
  readonly time: Float64Array;
  /** Subject index 0..nSubjects-1 per observation. */
  readonly subject: Int32Array;
  readonly nSubjects: number;
  /** Arm index per observation (0 = reference arm), or null in blinded mode. */
  readonly armIndex: Int32Array | null;
  /** Arm names; arms[0] is the reference. Empty in blinded mode. */
  readonly arms: readonly string[];
  readonly covariates: readonly CovariateColumn[];
  /** Subject ids for the per-subject output (index = subject); defaults to "1", "2", ... */
  readonly subjectIds?: readonly string[];
}

export interface ContrastDay {
  readonly label: string;
  readonly day: number;
}

export interface FitOptions {
  readonly method: FitMethod;
  readonly dfMethod: DfMethod;
  /** Confidence level, 0 < level < 1. */
  readonly level: number;
  readonly timeUnit: TimeUnit;
  readonly contrastDays: readonly ContrastDay[];
  /**
   * 'intercept-only' fits the one-way random-effects model value_ij = b0 + u_i + e_ij: time, arms and covariates are
   * ignored. Default 'full' (SPEC §5 model).
   */
  readonly design?: 'full' | 'intercept-only';
  /** Also return the conditional residuals y - Xb - u per observation (default false). */
  readonly residuals?: boolean;
  /** Number of points of the predicted-trajectory grid (default 25). */
  readonly gridPoints?: number;
}

export interface Term {
  readonly name: string;
  readonly kind: TermKind;
  readonly arm: string | null;
}

/** A single-row contrast's inference. */
export interface ContrastResult {
  readonly estimate: number;
  readonly se: number;
  readonly df: number;
  readonly t: number;
  readonly lower: number;
  readonly upper: number;
  readonly p: number;
}

export interface FixedEffect extends ContrastResult {
  readonly term: string;
  readonly kind: TermKind;
  readonly arm: string | null;
}

export interface VarianceResult {
  /** Between-subject variance s2_u. */
  readonly subject: number;
  /** Within-subject (residual) variance s2. */
  readonly residual: number;
  readonly icc: number;
  readonly subjectLower: number;
  readonly subjectUpper: number;
  readonly residualLower: number;
  readonly residualUpper: number;
  readonly iccLower: number;
  readonly iccUpper: number;
  /** Plain words saying how the intervals were computed. */
  readonly intervalMethod: string;
}

export interface TreatmentEffect extends ContrastResult {
  readonly arm: string;
  readonly label: string;
  readonly day: number;
  readonly time: number;
}

export interface SlopeDifference extends ContrastResult {
  readonly arm: string;
}

export interface JointTest {
  readonly numDf: number;
  readonly denDf: number;
  readonly F: number;
  readonly p: number;
}

export interface Trajectory {
  readonly arm: string | null;
  readonly time: number[];
  readonly day: number[];
  readonly mean: number[];
  readonly lower: number[];
  readonly upper: number[];
}

/** One term of the naive least-squares fit (naive.ts), with its SE beside the mixed model's. */
export interface NaiveEffect extends ContrastResult {
  readonly term: string;
  readonly kind: TermKind;
  readonly arm: string | null;
  /** True when the term's column is constant within every participant (intercept, arm, a baseline covariate). */
  readonly between: boolean;
  /** Naive SE ÷ the mixed model's SE for the same term. */
  readonly seRatio: number;
}

/** Ordinary least squares with the same fixed effects, ignoring the correlation within participants. */
export interface NaiveFit {
  /** s² = RSS / (N − p). */
  readonly residualVariance: number;
  /** N − p. */
  readonly df: number;
  readonly fixedEffects: readonly NaiveEffect[];
}

export interface SubjectEffect {
  readonly id: string;
  readonly n: number;
  /** Best linear unbiased predictor of the subject's random intercept. */
  readonly blup: number;
  /** Mean of the subject's conditional residuals y - Xb - u. */
  readonly meanResidual: number;
}

/** A fitted model; it repeats the options that shape its output (method, df method, level, time unit). */
export interface ModelFit extends Pick<FitOptions, 'method' | 'dfMethod' | 'level' | 'timeUnit'> {
  readonly status: FitStatus;
  readonly message: string;
  readonly nSubjects: number;
  readonly nObservations: number;
  readonly terms: readonly Term[];
  /** Arms in the design, reference first; empty when blinded or intercept-only. */
  readonly arms: readonly string[];
  readonly fixedEffects: readonly FixedEffect[];
  readonly variance: VarianceResult;
  readonly logLik: number;
  readonly aic: number;
  readonly bic: number;
  /** The N in BIC = -2 logLik + k log N (n for ML, n - p for REML). */
  readonly bicN: number;
  /** The k in AIC and BIC (fixed effects + 2 variance parameters, for ML and REML alike). */
  readonly nParameters: number;
  readonly iterations: number;
  readonly converged: boolean;
  readonly treatmentEffects: readonly TreatmentEffect[];
  readonly slopeDifferences: readonly SlopeDifference[];
  readonly jointTest: JointTest | null;
  readonly trajectories: readonly Trajectory[];
  readonly subjects: readonly SubjectEffect[];
  /** The naive least-squares fit beside the model; null when it cannot be computed or the fit failed. */
  readonly naive: NaiveFit | null;
  /** Containment (between/within) degrees of freedom of the design, whatever dfMethod was chosen. */
  readonly containment: { readonly betweenDf: number; readonly withinDf: number };
  /** Conditional residuals per observation, only when FitOptions.residuals is true. */
  readonly residuals?: Float64Array;
}
