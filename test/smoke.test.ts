import { describe, expect, it } from 'vitest';
import { DAYS_PER_UNIT } from '../src/core/pipeline/types';

describe('time units', () => {
  it('a month is 365.25 / 12 days (common practice)', () => {
    expect(DAYS_PER_UNIT.month).toBe(365.25 / 12);
  });
});
