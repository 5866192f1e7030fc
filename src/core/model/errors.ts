/**
 * Typed errors of the model layer. Misuse (wrong shapes, impossible options, a design that cannot be estimated)
 * throws one of these with a fixed message format; numerical outcomes are result fields instead.
 */

/** Input that the model cannot accept: wrong lengths, out-of-range indices, missing values, bad options. */
export class ModelInputError extends Error {
  readonly code = 'model-input' as const;
  constructor(message: string) {
    super(`Model input: ${message}`);
    this.name = 'ModelInputError';
  }
}

/** The fixed-effects design has linearly dependent columns; `columns` names the columns involved. */
export class RankDeficiencyError extends Error {
  readonly code = 'rank-deficient' as const;
  readonly columns: readonly string[];
  constructor(columns: readonly string[]) {
    super(`Model design: the columns ${columns.map((c) => `"${c}"`).join(', ')} are linearly dependent; remove one of them.`);
    this.name = 'RankDeficiencyError';
    this.columns = columns;
  }
}

/** Why the data cannot give a trustworthy model (see DegenerateDataError). */
export type DegenerateReason = 'one-subject' | 'one-measurement-each' | 'no-variation' | 'below-resolution' | 'out-of-range' | 'unsound-result';

/**
 * The data are valid but cannot give a trustworthy model: one participant only, one measurement per participant, values that do not vary, variation below
 * the floating-point resolution of the values, magnitudes whose variances would overflow or underflow, or a fit whose
 * numbers fail the checks every reported model must pass (variances ≥ 0, lower ≤ estimate ≤ upper, 0 < p ≤ 1).
 * A property of the data, like RankDeficiencyError: the pipeline reports no model and shows `message` as the reason.
 */
export class DegenerateDataError extends Error {
  readonly code = 'degenerate-data' as const;
  readonly reason: DegenerateReason;
  constructor(reason: DegenerateReason, message: string) {
    super(message);
    this.name = 'DegenerateDataError';
    this.reason = reason;
  }
}
