/** The command line's --model, --responder-below and --responder-above (README "Command line"). */
import { describe, expect, it } from 'vitest';
import { HELP_TEXT, parseAnalyzeArgs, UsageError } from '../../src/cli/args';
import { buildMapping } from '../../src/cli/mapping';

const BASE = ['--data', 'v.csv', '--schedule', 's.csv'];

describe('--model and the yes/no threshold', () => {
  it('reads the model and one threshold', () => {
    expect(parseAnalyzeArgs([...BASE, '--model', 'gee']).model).toBe('gee');
    const a = parseAnalyzeArgs([...BASE, '--model=logistic', '--responder-below', '45']);
    expect(a.model).toBe('logistic');
    expect(a.responder).toEqual({ below: 45 });
    expect(parseAnalyzeArgs([...BASE, '--model', 'logistic', '--responder-above=-1.5']).responder).toEqual({ above: -1.5 });
    expect(parseAnalyzeArgs(BASE).model).toBe('intercept');
  });

  it('refuses an unknown model, two thresholds, a threshold that is not a number, and a threshold without --model logistic', () => {
    expect(() => parseAnalyzeArgs([...BASE, '--model', 'other'])).toThrow(UsageError);
    expect(() => parseAnalyzeArgs([...BASE, '--model', 'logistic', '--responder-below', '4', '--responder-above', '5'])).toThrow(/not both/);
    expect(() => parseAnalyzeArgs([...BASE, '--model', 'logistic', '--responder-below', 'low'])).toThrow(/must be a number/);
    expect(() => parseAnalyzeArgs([...BASE, '--responder-below', '45'])).toThrow(/only apply with --model logistic/);
  });

  it('maps a responder column with --map responder=Header, and the help names the options', () => {
    const headers = ['USUBJID', 'ADT', 'AVAL', 'CRIT1FL'];
    const m = buildMapping({ subject: 0, date: 1, value: 2, covariates: [] }, headers, [['responder', 'CRIT1FL']], [], 0);
    expect(m.responder).toBe(3);
    for (const flag of ['--model KIND', '--responder-below X', '--responder-above X', 'responder (a 0/1 yes/no column']) expect(HELP_TEXT).toContain(flag);
  });
});
