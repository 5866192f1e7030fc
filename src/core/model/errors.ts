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
