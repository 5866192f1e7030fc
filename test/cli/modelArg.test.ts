import { describe, expect, it } from 'vitest';
import { HELP_TEXT, parseAnalyzeArgs, UsageError } from '../../src/cli/args';

const BASE = ['--data', 'v.csv', '--schedule', 's.csv'];

describe('--model chooses the main model', () => {
  it('defaults to intercept and takes every model by name', () => {
    expect(parseAnalyzeArgs(BASE).model).toBe('intercept');
    for (const kind of ['slope', 'repeated', 'gee', 'logistic']) expect(parseAnalyzeArgs([...BASE, '--model', kind]).model).toBe(kind);
    expect(parseAnalyzeArgs([...BASE, '--model=intercept']).model).toBe('intercept');
  });

  it('refuses any other name with a usage error listing the available models', () => {
    for (const kind of ['Slope', 'random', 'unstructured']) {
      expect(() => parseAnalyzeArgs([...BASE, '--model', kind])).toThrow(UsageError);
      expect(() => parseAnalyzeArgs([...BASE, '--model', kind])).toThrow(/available models: intercept, slope, repeated, gee, logistic/);
    }
  });

  it('the help lists --model once, with every choice', () => {
    expect(HELP_TEXT.match(/--model KIND/g)).toHaveLength(1);
    const help = HELP_TEXT.replace(/\s+/g, ' ');
    for (const words of ['intercept (random intercept, default)', 'slope (random intercept and slope', 'repeated (adds the visit-by-visit', 'gee (marginal model', 'logistic (random-intercept model for a yes/no answer)']) expect(help).toContain(words);
  });
});
