/**
 * The model comparison on the model sheet and in the JSON: every model fitted to the same rows (random intercept;
 * random intercept and slope) with its log-likelihood, AIC and BIC, and the likelihood-ratio test of the random slope
 * with its plain sentence ("participants differ in their rate of change: yes/no at the chosen level").
 */
import type { ModelComparison } from '../model/slope/compare';
import type { ModelKind } from '../model/types';
import { cell, col, para } from './blockParts';
import type { Block } from './types';

const jsonNum = (x: number): number | null => (Number.isFinite(x) ? x : null);

/** The models in words. */
export const MODEL_WORDS: Readonly<Record<ModelKind, string>> = {
  intercept: 'Random intercept',
  slope: 'Random intercept and slope',
  repeated: 'Repeated measures',
  gee: 'GEE',
  logistic: 'Logistic',
};

/** The comparison table, the slope test and its sentence; nothing when there is no comparison. */
export function comparisonBlocks(c: ModelComparison | null | undefined): Block[] {
  if (c === null || c === undefined || c.models.length === 0) return [];
  const blocks: Block[] = [
    {
      kind: 'table',
      id: 'ModelComparison',
      caption: 'Model comparison (same rows, same estimation method; lower AIC and BIC are better)',
      columns: [col('Model', 'text', 30), col('Parameters', 'integer'), col('Log-likelihood', 'decimal3'), col('AIC', 'decimal3'), col('BIC', 'decimal3')],
      rows: c.models.map((m) => [MODEL_WORDS[m.kind], m.nParameters, cell(m.logLik), cell(m.aic), cell(m.bic)]),
    },
  ];
  const t = c.slopeTest;
  if (t !== null) {
    blocks.push({
      kind: 'table',
      id: 'SlopeTest',
      caption: 'Likelihood-ratio test of the random slope (do participants differ in their rate of change?)',
      columns: [col('Statistic', 'decimal3'), col('Reference distribution', 'text', 36), col('p-value', 'pvalue')],
      rows: [[cell(t.statistic), '50:50 mixture of chi-square with 1 and 2 df', cell(t.p)]],
    });
    blocks.push(
      para(
        `${t.sentence} The slope variance cannot be below zero, so under "no difference" the statistic follows the 50:50 mixture of chi-square distributions with 1 and 2 degrees of freedom rather than chi-square with 2 (Self & Liang 1987; Stram & Lee 1994).`,
      ),
    );
  }
  return blocks;
}

/** JSON `model.comparison` and `model.slopeTest`. */
export function comparisonJson(c: ModelComparison | null | undefined): Record<string, unknown> {
  if (c === null || c === undefined) return {};
  return {
    comparison: c.models.map((m) => ({ kind: m.kind, logLik: jsonNum(m.logLik), aic: jsonNum(m.aic), bic: jsonNum(m.bic), nParameters: m.nParameters })),
    slopeTest: c.slopeTest === null ? null : { statistic: jsonNum(c.slopeTest.statistic), df: c.slopeTest.df, p: jsonNum(c.slopeTest.p), differ: c.slopeTest.differ, sentence: c.slopeTest.sentence },
  };
}
