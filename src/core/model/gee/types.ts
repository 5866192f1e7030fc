/** Types of the GEE engine: the marginal model with the random-intercept model's fixed effects (Liang & Zeger 1986). */
import type { ArmContrast } from '../armContrast';
import type { ContrastDay, TermKind, Term, TimeUnit } from '../types';

/** Working correlation within a participant: exchangeable (one common correlation) or independence (none). */
export type WorkingStructure = 'exchangeable' | 'independence';

export interface GeeOptions {
  /** Confidence level, 0 < level < 1. */
  readonly level: number;
  readonly timeUnit: TimeUnit;
  /** Default 'exchangeable'. */
  readonly structure?: WorkingStructure;
  /** Largest number of alternations between β and the correlation (default 100). */
  readonly maxIterations?: number;
  /** Days at which each arm's difference from the reference arm is given (robust covariance); default none. */
  readonly contrastDays?: readonly ContrastDay[];
}

/** One fixed effect with its three standard errors; z, interval and p use the robust SE and the normal distribution. */
export interface GeeEffect {
  readonly term: string;
  readonly kind: TermKind;
  readonly arm: string | null;
  readonly estimate: number;
  /** Robust (sandwich) SE, Liang & Zeger 1986. */
  readonly se: number;
  /** Model-based SE: scale × (Σ X_i'R_i⁻¹X_i)⁻¹, right only when the working correlation is right. */
  readonly seModel: number;
  /** Bias-corrected sandwich SE of Mancl & DeRouen 2001; null when a participant's leverage makes it undefined. */
  readonly seSmallSample: number | null;
  readonly z: number;
  readonly lower: number;
  readonly upper: number;
  readonly p: number;
}

export interface GeeFit {
  readonly kind: 'gee';
  /** 'converged', or 'failed' when the alternation did not settle or the correlation left its allowed range. */
  readonly status: 'converged' | 'failed';
  readonly message: string;
  readonly level: number;
  readonly timeUnit: TimeUnit;
  readonly nSubjects: number;
  readonly nObservations: number;
  readonly terms: readonly Term[];
  readonly arms: readonly string[];
  readonly workingCorrelation: { readonly structure: WorkingStructure; readonly correlation: number };
  /** Moment estimate of the common variance, Σ r² / (N − p). */
  readonly scale: number;
  readonly iterations: number;
  readonly fixedEffects: readonly GeeEffect[];
  /** Fewest participants in any arm (all participants when blinded). */
  readonly minParticipantsPerArm: number;
  /** Row-major p × p covariances of β̂: robust, model-based, bias-corrected (null when undefined). */
  readonly covariance: { readonly robust: readonly number[]; readonly model: readonly number[]; readonly smallSample: readonly number[] | null };
  /** Each arm's difference from the reference arm at each contrast day, with the robust SE (empty when blinded). */
  readonly treatmentEffects: readonly ArmContrast[];
}
