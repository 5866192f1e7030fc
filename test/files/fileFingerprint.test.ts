import { createHash } from 'node:crypto';
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { fileFingerprint } from '../../src/files/fileFingerprint';
import { Sha256 } from '../../src/core/report/sha256';

const bytes = (s: string): Uint8Array => new TextEncoder().encode(s);

describe('fileFingerprint (SHA-256 of a file\'s bytes by the platform\'s Web Crypto)', () => {
  it('gives the FIPS 180-4 example digests ("abc", the 448-bit message, the empty message; from memory, as in sha256.test.ts)', async () => {
    expect(await fileFingerprint(bytes('abc'))).toBe('ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad');
    expect(await fileFingerprint(bytes('abcdbcdecdefdefgefghfghighijhijkijkljklmklmnlmnomnopnopq'))).toBe(
      '248d6a61d20638b8e5c026930c3e6039a33ce45964ff2167f6ecedd419db06c1',
    );
    expect(await fileFingerprint(new Uint8Array(0))).toBe('e3b0c44298fc1c149afbf4c8996fb92427ae41e4649b934ca495991b7852b855');
  });

  it('agrees with our own SHA-256 and with node:crypto on random bytes, including a view into a larger buffer', async () => {
    await fc.assert(
      fc.asyncProperty(fc.uint8Array({ maxLength: 300 }), fc.nat(5), async (data, skip) => {
        const padded = new Uint8Array(data.length + skip);
        padded.set(data, skip);
        const view = padded.subarray(skip);
        const ours = new Sha256().update(data).hex();
        expect(await fileFingerprint(view)).toBe(ours);
        expect(createHash('sha256').update(data).digest('hex')).toBe(ours);
      }),
    );
  });
});
