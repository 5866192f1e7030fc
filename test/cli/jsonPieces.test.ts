import { readFileSync } from 'node:fs';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { jsonPieces } from '../../src/cli/jsonPieces';

// Reference: the platform's own JSON.stringify (ECMA-262 §25.5.2); the pieces must join to exactly its text.
const joined = (v: unknown, chunk?: number): string => [...jsonPieces(v, chunk)].join('');

describe('jsonPieces', () => {
  it('joins to JSON.stringify on any JSON-like value, at any piece size', () => {
    fc.assert(
      fc.property(fc.anything({ withObjectString: true, withNullPrototype: true, withBoxedValues: true, withSparseArray: true }), fc.integer({ min: 1, max: 200 }), (v, chunk) => {
        const text = JSON.stringify(v);
        if (text === undefined) return;
        expect(joined(v, chunk)).toBe(text);
      }),
      { numRuns: 2000 },
    );
  });

  it('leaves out undefined members, writes undefined elements as null and honours toJSON, as JSON.stringify does', () => {
    const v = { a: undefined, b: [undefined, () => 1, 2], c: new Date(Date.UTC(2026, 11, 2)), d: { toJSON: (k: string) => `key ${k}` }, e: -0, f: NaN, g: 'é – “x”' };
    expect(joined(v, 3)).toBe(JSON.stringify(v));
  });

  it('cuts a large value into many pieces that still join to JSON.stringify', () => {
    // The bundled (invented) demo listing as an array of row objects: large enough for many pieces.
    const text = readFileSync(new URL('../../demo/egfr-visits.csv', import.meta.url), 'utf8');
    const sample = { text, lines: text.split('\n').map((l, i) => ({ i, l, n: l.length / 7 })) };
    const pieces = [...jsonPieces(sample, 1024)];
    expect(pieces.length).toBeGreaterThan(50);
    expect(pieces.join('')).toBe(JSON.stringify(sample));
  });
});
