/**
 * The zip writer (src/files/zipWriter.ts) and the CRC-32 it uses, checked against definitions rather than against
 * themselves: the CRC against the bit-by-bit definition of the reflected polynomial 0xEDB88320 (PKWARE APPNOTE 4.4.7;
 * ISO 3309), the archive against the project's own zip reader (src/files/zip.ts, which checks sizes and CRC-32 as it
 * inflates) and against the record layout of APPNOTE 4.3.7, 4.3.12 and 4.3.16.
 */
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { crc32Update } from '../../src/files/crc32';
import { inflatePart, zipEntries } from '../../src/files/zip';
import { ZipWriter } from '../../src/files/zipWriter';

/** CRC-32 straight from its definition, one bit at a time (slow, obviously right). */
function crcByBits(bytes: Uint8Array): number {
  let c = 0xffffffff;
  for (const b of bytes) {
    c ^= b;
    for (let k = 0; k < 8; k++) c = c & 1 ? (c >>> 1) ^ 0xedb88320 : c >>> 1;
  }
  return ~c >>> 0;
}

async function readPart(zip: Uint8Array, name: string): Promise<string> {
  const e = zipEntries(zip).get(name);
  if (e === undefined) throw new Error(`no part ${name}`);
  const chunks: Uint8Array[] = [];
  await inflatePart(zip, e, 1 << 30, { used: 0, total: 1 << 30 }, (c) => chunks.push(c.slice()), 'part');
  return new TextDecoder().decode(Buffer.concat(chunks));
}

describe('crc32Update (eight bytes a step)', () => {
  it('equals the bit-by-bit definition for any bytes, whole or in pieces', () => {
    fc.assert(
      fc.property(fc.uint8Array({ maxLength: 300 }), fc.nat(300), (bytes, cut) => {
        const at = Math.min(cut, bytes.length);
        expect(crc32Update(0, bytes)).toBe(crcByBits(bytes));
        expect(crc32Update(crc32Update(0, bytes.subarray(0, at)), bytes.subarray(at))).toBe(crcByBits(bytes));
      }),
      { numRuns: 300 },
    );
  });
});

describe('ZipWriter', () => {
  it('writes parts that the zip reader inflates back whole, with matching sizes and CRC-32, across many pieces', async () => {
    const z = new ZipWriter();
    const p = z.part('xl/big.xml');
    const pieces: string[] = [];
    // About 3 MB of text in 100,000 pieces: many compressed chunks, non-ASCII included.
    for (let i = 0; i < 100_000; i++) pieces.push(`<r n="${i}">é€😀${i % 7}</r>`);
    for (const s of pieces) await p.write(s);
    await p.end();
    await z.text('[Content_Types].xml', '<Types/>');
    await z.text('empty.xml', '');
    const zip = z.finish();
    expect([...zipEntries(zip).keys()]).toEqual(['xl/big.xml', '[Content_Types].xml', 'empty.xml']);
    expect(await readPart(zip, 'xl/big.xml')).toBe(pieces.join(''));
    expect(await readPart(zip, '[Content_Types].xml')).toBe('<Types/>');
    expect(await readPart(zip, 'empty.xml')).toBe('');
    expect(zip.length).toBeLessThan(pieces.join('').length / 4); // deflate, not stored
  });

  it('lays out the records of the zip format: local header, central directory, end record (APPNOTE 4.3.7, 4.3.12, 4.3.16)', async () => {
    const z = new ZipWriter();
    await z.text('a.txt', 'hello');
    const zip = z.finish();
    const view = new DataView(zip.buffer, zip.byteOffset, zip.byteLength);
    expect(view.getUint32(0, true)).toBe(0x04034b50);
    expect(view.getUint16(6, true)).toBe(1 << 11); // UTF-8 names, no data descriptor
    expect(view.getUint16(8, true)).toBe(8); // deflate
    expect(view.getUint32(14, true)).toBe(crcByBits(new TextEncoder().encode('hello')));
    expect(view.getUint32(22, true)).toBe(5);
    const end = zip.length - 22;
    expect(view.getUint32(end, true)).toBe(0x06054b50);
    expect(view.getUint16(end + 10, true)).toBe(1);
    expect(view.getUint32(view.getUint32(end + 16, true), true)).toBe(0x02014b50);
  });

  it('refuses to open a part while another is open', () => {
    const z = new ZipWriter();
    z.part('a');
    expect(() => z.part('b')).toThrow(/still open/);
  });
});
