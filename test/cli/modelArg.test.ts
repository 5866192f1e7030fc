import { describe, expect, it } from 'vitest';
import { HELP_TEXT, parseAnalyzeArgs, UsageError } from '../../src/cli/args';

const BASE = ['--data', 'v.csv', '--schedule', 's.csv'];

describe('--model chooses the main model', () => {
  it('defaults to intercept and takes slope', () => {
    expect(parseAnalyzeArgs(BASE).model).toBe('intercept');
    expect(parseAnalyzeArgs([...BASE, '--model', 'slope']).model).toBe('slope');
    expect(parseAnalyzeArgs([...BASE, '--model=intercept']).model).toBe('intercept');
  });

  it('refuses the kinds not available yet, and anything else, with a usage error listing the available models', () => {
    for (const kind of ['repeated', 'gee', 'logistic', 'Slope', 'random']) {
      expect(() => parseAnalyzeArgs([...BASE, '--model', kind])).toThrow(UsageError);
      expect(() => parseAnalyzeArgs([...BASE, '--model', kind])).toThrow(/available models: intercept, slope/);
    }
  });

  it('the help lists --model with both choices', () => {
    expect(HELP_TEXT).toMatch(/--model KIND\s+intercept \(random intercept, default\) or slope/);
  });
});
