/**
 * Words for the degrees-of-freedom methods, and the note a reader needs when the chosen method has a known weakness:
 * Kenward–Roger after a maximum-likelihood fit (the method is defined for REML; Kenward & Roger 1997, Biometrics
 * 53:983–997), and residual df (N − p), which count every value as independent information.
 */
import type { DfMethod, FitMethod } from '../model/types';

/** Short names, as in the analysis record. */
export const DF_NAMES: Readonly<Record<DfMethod, string>> = {
  'kenward-roger': 'Kenward–Roger',
  satterthwaite: 'Satterthwaite',
  residual: 'Residual',
  containment: 'Between/within (containment)',
};

/** Longer descriptions, as in the model-fit table. */
export const DF_DESCRIPTIONS: Readonly<Record<DfMethod, string>> = {
  'kenward-roger': 'Kenward–Roger, with its adjusted covariance',
  satterthwaite: 'Satterthwaite',
  residual: 'Residual (measurements − fixed effects)',
  containment: 'Between/within: participants − between-participant terms, or measurements − participants − within-participant terms',
};

/**
 * The caution that goes with a choice of estimation and df method, or null when there is none.
 * Example: dfMethodNote('ml', 'kenward-roger') -> "Kenward–Roger degrees of freedom are defined for a REML fit; ...".
 */
export function dfMethodNote(method: FitMethod, dfMethod: DfMethod): string | null {
  if (dfMethod === 'kenward-roger' && method === 'ml') {
    return 'Kenward–Roger degrees of freedom are defined for a REML fit; after a maximum-likelihood fit they are used here as an approximation that is not standard. Prefer REML with Kenward–Roger, or Satterthwaite degrees of freedom with maximum likelihood.';
  }
  if (dfMethod === 'residual') {
    return 'Residual degrees of freedom (measurements − fixed effects) count every value as independent information. For terms that compare participants with each other, such as the arm, they are too many: intervals come out too narrow and p-values too small. The between/within or Kenward–Roger methods avoid this.';
  }
  return null;
}
