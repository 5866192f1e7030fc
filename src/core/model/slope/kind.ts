/** Which model a fit is. */
import type { ModelFit, ModelKind, SlopeFit } from '../types';

/** True for a random intercept and slope fit (it carries `kind: 'slope'`). */
export function isSlopeFit(fit: ModelFit): fit is SlopeFit {
  return (fit as Partial<SlopeFit>).kind === 'slope';
}

/** The kind of a fit: 'slope' for the slope model, else 'intercept'. */
export function modelKindOf(fit: ModelFit): ModelKind {
  return isSlopeFit(fit) ? 'slope' : 'intercept';
}
