import { describe, expect, it } from 'vitest';
import { GridSource } from '../../src/core/intake/cellSource';
import { ReleasableSource } from '../../src/cli/releasableSource';

describe('ReleasableSource', () => {
  it('reads through to its cells until released, then refuses to be read', () => {
    const s = new ReleasableSource(new GridSource([['participant', 'value'], ['P1', 61.5], [null, '']]));
    expect(s.rowCount).toBe(3);
    expect(s.cell(1, 1)).toBe(61.5);
    expect(s.rowCells(0)).toEqual(['participant', 'value']);
    expect(s.isBlankRow(2, 2)).toBe(true);
    s.release();
    expect(s.rowCount).toBe(3);
    expect(() => s.cell(1, 1)).toThrow(/released/);
    expect(() => s.rowCells(0)).toThrow(/released/);
  });
});
