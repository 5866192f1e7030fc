/**
 * The zip writer (src/files/zipWriter.ts) and the CRC-32 it uses, checked against definitions rather than against
 * themselves: the CRC against the bit-by-bit definition of the reflected polynomial 0xEDB88320 (PKWARE APPNOTE 4.4.7;
 * ISO 3309), the archive against the project's own zip reader (src/files/zip.ts, which checks sizes and CRC-32 as it
 * inflates) and against the record layout of APPNOTE 4.3.7, 4.3.12 and 4.3.16.
 */
import { deflateRawSync, gzipSync } from 'node:zlib';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { ByteRows } from '../../src/files/byteRows';
import { crc32Update } from '../../src/files/crc32';
import { inflatePart, zipEntries } from '../../src/files/zip';
import { fromGzip, platformCompressor, ZipWriter, type CompressedPart, type PartWriter } from '../../src/files/zipWriter';

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

/** The bytes of a compressed part, joined. */
const joined = (part: CompressedPart): Buffer => Buffer.concat(part.chunks.map((c) => Buffer.from(c)));

describe('fromGzip (RFC 1952 framing taken off)', () => {
  const data = new TextEncoder().encode('<row r="1"><c r="A1" s="8"><v>1</v></c></row>'.repeat(500));

  it("gives the raw deflate data of Node's zlib (an outside implementation) and the CRC-32 of the bytes, whole or cut into pieces", () => {
    const gz = new Uint8Array(gzipSync(data));
    const raw = deflateRawSync(data);
    for (const cut of [1, 5, 10, 11, gz.length - 8, gz.length - 3, gz.length - 1]) {
      const part = fromGzip([gz.subarray(0, cut), gz.subarray(cut)], data.length);
      expect(joined(part).equals(raw)).toBe(true);
      expect(part.crc).toBe(crcByBits(data));
      expect(part.size).toBe(data.length);
    }
  });

  it('skips the optional header fields its flags announce (FEXTRA, FNAME, FCOMMENT, FHCRC)', () => {
    const gz = new Uint8Array(gzipSync(data));
    const extra = [4, 0, 1, 2, 3, 4]; // XLEN 4, then 4 bytes
    const name = [...new TextEncoder().encode('sheet.xml'), 0];
    const comment = [...new TextEncoder().encode('invented'), 0];
    const headerCrc = [0xab, 0xcd];
    const header = [...gz.subarray(0, 10)];
    header[3] = 4 | 8 | 16 | 2;
    const framed = Uint8Array.from([...header, ...extra, ...name, ...comment, ...headerCrc, ...gz.subarray(10)]);
    const part = fromGzip([framed], data.length);
    expect(joined(part).equals(deflateRawSync(data))).toBe(true);
    expect(part.crc).toBe(crcByBits(data));
  });

  it('refuses what is not one gzip member, or a trailer whose length disagrees', () => {
    const gz = new Uint8Array(gzipSync(data));
    expect(() => fromGzip([gz.subarray(0, 12)], data.length)).toThrow(/gzip/);
    expect(() => fromGzip([Uint8Array.from([0x1f, 0x8c, ...gz.subarray(2)])], data.length)).toThrow(/gzip/);
    expect(() => fromGzip([gz], data.length + 1)).toThrow(/trailer/);
  });

  it("platformCompressor's parts inflate back to what went in (Node's zlib inflate), with the CRC-32 of the definition", async () => {
    const { inflateRawSync } = await import('node:zlib');
    const c = platformCompressor();
    await c.write(data.slice(0, 1000));
    await c.write(data.slice(1000));
    const part = await c.end();
    expect(inflateRawSync(joined(part)).equals(Buffer.from(data))).toBe(true);
    expect(part.crc).toBe(crcByBits(data));
    expect(part.size).toBe(data.length);
    const empty = await platformCompressor().end();
    expect(inflateRawSync(joined(empty)).length).toBe(0);
    expect(empty.crc).toBe(0);
  });
});

describe('ByteRows (markup and text straight to UTF-8 bytes)', () => {
  /** A part that records the bytes handed to it, in order. */
  const recorder = (): { out: PartWriter; bytes: () => Uint8Array } => {
    const pieces: Uint8Array[] = [];
    const encoder = new TextEncoder();
    return {
      out: {
        write: async (text) => void pieces.push(encoder.encode(text)),
        writeBytes: async (b) => void pieces.push(b.slice()),
        end: async () => undefined,
      },
      bytes: () => Buffer.concat(pieces),
    };
  };

  it('writes exactly the UTF-8 of the same text (TextEncoder), for any text, digits and markup, across many rows', async () => {
    await fc.assert(
      fc.asyncProperty(fc.array(fc.tuple(fc.string({ unit: 'binary', maxLength: 40 }), fc.nat(2 ** 31 - 1)), { maxLength: 60 }), async (cells) => {
        const rec = recorder();
        const rows = new ByteRows(rec.out);
        let expected = '';
        for (const [text, n] of cells) {
          rows.room(20);
          rows.ascii('<c s="');
          rows.digits(n);
          rows.ascii('">');
          rows.text(text);
          rows.room(4);
          rows.ascii('</c>');
          await rows.rowDone();
          expected += `<c s="${n}">${text}</c>`;
        }
        await rows.end();
        expect(Buffer.from(rec.bytes()).equals(Buffer.from(new TextEncoder().encode(expected)))).toBe(true);
      }),
      { numRuns: 80 },
    );
  });

  it('hands on full buffers between rows and grows for a row longer than a buffer', async () => {
    const rec = recorder();
    const rows = new ByteRows(rec.out);
    const long = 'é'.repeat(700_000); // 1.4 MB of UTF-8 in one row: more than one buffer
    let expected = '';
    for (let i = 0; i < 3; i++) {
      rows.text(long);
      rows.room(10);
      rows.digits(i);
      await rows.rowDone();
      expected += `${long}${i}`;
    }
    await rows.end();
    expect(Buffer.from(rec.bytes()).toString('utf8')).toBe(expected);
  });
});
