/** Plain-language pieces of the model report: number phrasing, status words and the opening summary paragraph. */
import { isSlopeFit } from '../model/slope/kind';
import type { ModelFit, FitStatus } from '../model/types';
import type { Mode } from '../intake/types';
import { DF_NAMES } from './dfNotes';
import { formatCell, shownNumber } from './formats';

/** Status words shown in the sheets (JSON keeps the status keys). */
export const FIT_STATUS_WORDS: Readonly<Record<FitStatus, string>> = {
  converged: 'Converged',
  boundary: 'Converged at the zero boundary (no between-participant variation detected)',
  failed: 'Did not converge — do not use these estimates',
};

/**
 * The verdict line of the model-fit table: the status word, then the engine's message when it says something the
 * word does not (never "Converged. Converged."). Example: a converged fit -> "Converged. The likelihood has its
 * maximum inside the allowed range: ...".
 */
export function fitVerdict(fit: Pick<ModelFit, 'status' | 'message'>): string {
  const word = statusWords(fit);
  const norm = (s: string): string => s.toLowerCase().replace(/[^a-z]+/g, ' ').trim();
  const msg = fit.message.trim();
  if (msg === '' || norm(msg) === norm(word) || norm(word).startsWith(norm(msg))) return `${word}.`;
  return `${word}. ${msg}`;
}

const UNIT_WORDS = { month: 'month', week: 'week', day: 'day' } as const;

/** A number for a sentence: the same text a 'significant' table cell shows (4 significant digits by magnitude,
 * formats.ts), so a sentence and its table agree; "n/a" when not finite. Example: num(4.0512) → "4.051". */
export function num(x: number): string {
  return shownNumber(x);
}

/** A p-value for a sentence, as a 'pvalue' cell shows it: "p < 0.0001" or "p = 0.0123". */
export function pPhrase(p: number): string {
  if (!Number.isFinite(p)) return 'p not available';
  return p < 0.0001 ? 'p < 0.0001' : `p = ${formatCell(p, 'pvalue')}`;
}

const methodWords = (fit: ModelFit): string =>
  `fitted by ${fit.method === 'reml' ? 'restricted maximum likelihood (REML)' : 'maximum likelihood'} with ${
    fit.dfMethod === 'residual' ? 'residual' : fit.dfMethod === 'containment' ? 'between/within' : DF_NAMES[fit.dfMethod]
  } degrees of freedom`;

/**
 * The paragraph that opens the model sheet: what was fitted, on how many participants and measurements, then the treatment
 * difference at the last scheduled visit (unblinded) or the overall change over time (blinded), the two sources of
 * variation with the ICC, the fit verdict and a pointer to the cautions that follow. Example (blinded): "A random-intercept linear mixed model ... intraclass correlation 0.62 ...".
 */
export function modelSummaryText(fit: ModelFit, mode: Mode): string {
  const unit = UNIT_WORDS[fit.timeUnit];
  const pct = Math.round(fit.level * 100);
  const armed = mode === 'unblinded' && fit.terms.some((t) => t.kind === 'arm');
  const what = armed
    ? `the outcome on arm, time (in ${unit}s from the actual visit day) and arm × time`
    : `the outcome on time (in ${unit}s from the actual visit day), pooled over all participants`;
  const covs = fit.terms.filter((t) => t.kind === 'covariate').length;
  let text =
    `${isSlopeFit(fit) ? 'A linear mixed model with a random intercept and slope' : 'A random-intercept linear mixed model'}, ${methodWords(fit)}, regressed ${what}${covs > 0 ? ', adjusted for the chosen covariates' : ''}, ` +
    `with each participant's own ${isSlopeFit(fit) ? 'level and rate of change as random effects' : 'level as a random intercept'}. It used ${fit.nObservations} measurements from ${fit.nSubjects} participants. `;
  if (fit.status === 'failed') return text + `The fit did not converge: ${fit.message} Read the cautions on the summary sheet.`;
  if (armed) {
    const last = lastVisitEffects(fit);
    for (const te of last) {
      text +=
        `At ${te.label} (study day ${te.day}) the mean of ${te.arm} differed from ${fit.arms[0] ?? 'the reference arm'} by ${num(te.estimate)} ` +
        `(${pct}% confidence interval ${num(te.lower)} to ${num(te.upper)}; ${pPhrase(te.p)}). `;
    }
    for (const sd of fit.slopeDifferences) {
      text += `The change per ${unit} in ${sd.arm} differed by ${num(sd.estimate)} (${num(sd.lower)} to ${num(sd.upper)}). `;
    }
  } else {
    const slope = fit.fixedEffects.find((f) => f.kind === 'time');
    if (slope) text += `On average the outcome changed by ${num(slope.estimate)} per ${unit} (${pct}% confidence interval ${num(slope.lower)} to ${num(slope.upper)}). `;
  }
  const v = fit.variance;
  text +=
    `Participants differ from one another with a standard deviation of ${num(Math.sqrt(v.subject))} and measurements within a participant vary with a standard deviation of ${num(Math.sqrt(v.residual))}; ` +
    `the intraclass correlation is ${num(v.icc)} (${pct}% confidence interval ${num(v.iccLower)} to ${num(v.iccUpper)}), ` +
    `the share of the total variation that lies between participants. `;
  text += `Fit: ${statusWords(fit).toLowerCase()}. `;
  text += 'Read this with the cautions on the summary sheet: an interim look is not a final analysis, and repeated looks inflate the chance of a false-positive finding.';
  return text;
}

/** The status in words; a random intercept and slope fit at its boundary has a singular covariance matrix, not a zero variance. */
export function statusWords(fit: Pick<ModelFit, 'status'>): string {
  if (fit.status === 'boundary' && isSlopeFit(fit as ModelFit)) return SLOPE_BOUNDARY_WORDS;
  return FIT_STATUS_WORDS[fit.status];
}

export const SLOPE_BOUNDARY_WORDS = 'Converged at the boundary (the between-participant covariance matrix is singular)';

/** Treatment differences at the latest contrast day, one per non-reference arm. */
export function lastVisitEffects(fit: ModelFit): ModelFit['treatmentEffects'] {
  if (fit.treatmentEffects.length === 0) return [];
  const lastDay = Math.max(...fit.treatmentEffects.map((t) => t.day));
  return fit.treatmentEffects.filter((t) => t.day === lastDay);
}
