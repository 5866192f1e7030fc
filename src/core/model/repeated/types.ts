/** Types of the repeated-measures model with an unstructured covariance across scheduled visits: what goes in, what comes out. */
import type { ContrastResult, DfMethod, FitMethod, FitStatus } from '../types';

/**
 * One row per participant, one column per scheduled visit (in schedule order; the first visit is the reference level
 * of the visit terms). `y[i * visits.length + v]` is participant i's value at visit v, NaN when there is none.
 */
export interface RepeatedData {
  readonly visits: readonly string[];
  /** Target day per visit (for the output only); omitted when unknown. */
  readonly visitDays?: readonly number[];
  readonly nSubjects: number;
  readonly y: Float64Array;
  /** Arm index per participant (0 = reference arm), or null in blinded mode. */
  readonly armIndex: Int32Array | null;
  /** Arm names; arms[0] is the reference. Empty in blinded mode. */
  readonly arms: readonly string[];
  /** An optional baseline covariate, one finite value per participant, entered with its own slope at every visit. */
  readonly baseline: { readonly name: string; readonly values: Float64Array } | null;
}

export interface RepeatedOptions {
  readonly method: FitMethod;
  readonly dfMethod: DfMethod;
  /** Confidence level, 0 < level < 1. */
  readonly level: number;
  /** Most scoring steps before the fit is called not converged (default 200). */
  readonly maxIterations?: number;
}

/** Kinds of the fixed-effect terms (reference-level coding; the README's "Results JSON" names them). */
export type RepeatedTermKind = 'intercept' | 'arm' | 'visit' | 'armVisit' | 'baseline' | 'baselineVisit';

export interface RepeatedEffect extends ContrastResult {
  readonly term: string;
  readonly kind: RepeatedTermKind;
  readonly arm: string | null;
  readonly visit: string | null;
}

/** Difference of one arm from the reference arm at one visit. */
export interface VisitDifference extends ContrastResult {
  readonly arm: string;
  readonly visit: string;
  readonly day: number | null;
  /** True for the last scheduled visit. */
  readonly last: boolean;
}

/** Model-based mean of one arm (or all participants, blinded) at one visit, at the baseline covariate's mean. */
export interface VisitMean extends ContrastResult {
  readonly arm: string | null;
  readonly visit: string;
  /** Participants with a value at this visit in this arm. */
  readonly n: number;
}

/** A missingness pattern: the visits observed together and how many participants have exactly those. */
export interface MissingPattern {
  readonly visits: readonly string[];
  readonly n: number;
}

export interface RepeatedFit {
  readonly kind: 'repeated';
  readonly method: FitMethod;
  readonly dfMethod: DfMethod;
  readonly level: number;
  readonly status: FitStatus;
  readonly message: string;
  readonly iterations: number;
  readonly converged: boolean;
  /** Participants with at least one value. */
  readonly nSubjects: number;
  readonly nObservations: number;
  readonly visits: readonly string[];
  readonly arms: readonly string[];
  readonly patterns: readonly MissingPattern[];
  readonly fixedEffects: readonly RepeatedEffect[];
  readonly treatmentEffects: readonly VisitDifference[];
  readonly means: readonly VisitMean[];
  /** Estimated covariance across visits, visits × visits in the order of `visits`. */
  readonly covariance: readonly (readonly number[])[];
  readonly correlation: readonly (readonly number[])[];
  readonly logLik: number;
  readonly aic: number;
  readonly bic: number;
  /** The N in BIC (observations for ML, observations − fixed effects for REML). */
  readonly bicN: number;
  /** Fixed effects + visits·(visits + 1)/2 covariance parameters. */
  readonly nParameters: number;
  /** Between/within degrees of freedom of the design, whatever dfMethod was chosen. */
  readonly containment: { readonly betweenDf: number; readonly withinDf: number };
}
