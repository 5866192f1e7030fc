import { createHash } from 'node:crypto';
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { HashUsageError, Sha256, sha256Hex } from '../../../src/core/report/sha256';
import { CellFingerprint, fingerprintCells, serialiseCell } from '../../../src/core/report/fingerprint';

// The expected digests are the NIST example vectors for FIPS 180-4 SHA-256 ("abc", the 448-bit message, one million
// "a"), written here from memory; each is also checked against the platform's own SHA-256 (node:crypto), an
// independent implementation, so a slip of memory would show as a failure rather than pass unnoticed.
const platform = (s: string): string => createHash('sha256').update(Buffer.from(s, 'utf8')).digest('hex');

describe('sha256 (NIST FIPS 180-4 example vectors)', () => {
  it('hashes "abc" to the one-block example digest (FIPS 180-4 / NIST SHA-256 example, one-block message)', () => {
    expect(sha256Hex('abc')).toBe('ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad');
    expect(platform('abc')).toBe('ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad');
  });

  it('hashes the 448-bit two-block example message (NIST SHA-256 example, two-block message)', () => {
    expect(sha256Hex('abcdbcdecdefdefgefghfghighijhijkijkljklmklmnlmnomnopnopq')).toBe(
      '248d6a61d20638b8e5c026930c3e6039a33ce45964ff2167f6ecedd419db06c1',
    );
    expect(platform('abcdbcdecdefdefgefghfghighijhijkijkljklmklmnlmnomnopnopq')).toBe('248d6a61d20638b8e5c026930c3e6039a33ce45964ff2167f6ecedd419db06c1');
  });

  it('hashes one million "a" fed in pieces (NIST long-message example)', () => {
    const h = new Sha256();
    const piece = 'a'.repeat(1000);
    for (let i = 0; i < 1000; i++) h.updateText(piece);
    expect(h.hex()).toBe('cdc76e5c9914fb9281a1c7e284d73e67f1809a48a497200e046d39ccc7112cd0');
    expect(platform('a'.repeat(1_000_000))).toBe('cdc76e5c9914fb9281a1c7e284d73e67f1809a48a497200e046d39ccc7112cd0');
  });

  it('hashes the empty message (FIPS 180-4 padding of a zero-length message; digest from memory, cross-checked below)', () => {
    expect(sha256Hex('')).toBe('e3b0c44298fc1c149afbf4c8996fb92427ae41e4649b934ca495991b7852b855');
    expect(platform('')).toBe('e3b0c44298fc1c149afbf4c8996fb92427ae41e4649b934ca495991b7852b855');
  });

  it('agrees with the platform SHA-256 on random UTF-8 text, including astral characters (independent implementation)', () => {
    fc.assert(
      fc.property(fc.string({ unit: 'binary', maxLength: 200 }), (s) => {
        expect(sha256Hex(s)).toBe(platform(s));
      }),
      { numRuns: 100 },
    );
  });

  it('update on bytes equals updateText on the same UTF-8 text (padding boundaries 55, 56, 63, 64 bytes)', () => {
    for (const n of [55, 56, 63, 64, 65, 119, 120]) {
      const s = 'x'.repeat(n);
      const bytes = new Uint8Array(Buffer.from(s, 'utf8'));
      expect(new Sha256().update(bytes).hex()).toBe(createHash('sha256').update(s).digest('hex'));
    }
  });
});

describe('Sha256 misuse', () => {
  it('refuses to add to or digest a finished hash, with a typed error', () => {
    const h = new Sha256().updateText('abc');
    h.hex();
    expect(() => h.hex()).toThrow(HashUsageError);
    expect(() => h.updateText('d')).toThrow(HashUsageError);
  });
});

describe('fingerprintCells', () => {
  it('tags types so 1 and "1" differ, treats the three blanks alike, and counts trailing blanks', () => {
    expect(fingerprintCells([[1]])).not.toBe(fingerprintCells([['1']]));
    expect(fingerprintCells([[null, 'a']])).toBe(fingerprintCells([[undefined, 'a']]));
    expect(fingerprintCells([['', 'a']])).toBe(fingerprintCells([[null, 'a']]));
    expect(fingerprintCells([['a']])).not.toBe(fingerprintCells([['a', null]]));
    expect(fingerprintCells([['a;b']])).not.toBe(fingerprintCells([['a', 'b']]));
    expect(fingerprintCells([[true]])).not.toBe(fingerprintCells([[1]]));
  });

  it('is the SHA-256 of the documented serialisation (exact identity)', () => {
    expect(serialiseCell('ab')).toBe('s2:ab');
    expect(fingerprintCells([[1, '1'], [null, false]])).toBe(sha256Hex('LP-FP1\nn1;s1:1;\ne;b0;\n'));
  });

  it('gives the same digest when rows are added in blocks', () => {
    const rows = Array.from({ length: 50 }, (_, i) => [`S${i}`, i * 1.5, i % 3 === 0 ? null : 'x']);
    const blocked = new CellFingerprint().addRows(rows.slice(0, 17)).addRows(rows.slice(17, 40)).addRows(rows.slice(40)).hex();
    expect(blocked).toBe(fingerprintCells(rows));
  });

  it('does not mutate the grid', () => {
    const rows = [['a', 1]];
    fingerprintCells(rows);
    expect(rows).toEqual([['a', 1]]);
  });
});
