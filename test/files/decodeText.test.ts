import { describe, expect, it } from 'vitest';
import { decodeCsvBytes } from '../../src/files/decodeText';
import { FileFormatError } from '../../src/files/errors';
import { readCsvText } from '../../src/files/readCsv';

describe('decodeCsvBytes', () => {
  it('reads valid UTF-8 as UTF-8 and keeps the byte-order mark for the CSV reader to strip', () => {
    const bytes = Uint8Array.of(0xef, 0xbb, 0xbf, 0x4d, 0xc3, 0xbc, 0x0a); // BOM, "Mü" in UTF-8 (RFC 3629), newline
    const text = decodeCsvBytes(bytes, 'a.csv');
    expect(text).toBe('\ufeffM\u00fc\n');
    expect(readCsvText(text)).toEqual([['M\u00fc']]);
  });

  it('falls back to Windows-1252 when the bytes are not valid UTF-8 (0xFC is "ü" in that code page, from memory)', () => {
    expect(decodeCsvBytes(Uint8Array.of(0x4d, 0xfc, 0x6c, 0x6c, 0x65, 0x72), 'b.csv')).toBe('M\u00fcller');
  });

  it('refuses a zip archive and binary data with a FileFormatError that names the file', () => {
    // "PK\x03\x04" opens every zip local file header (the zip format's own signature; common practice).
    expect(() => decodeCsvBytes(Uint8Array.of(0x50, 0x4b, 0x03, 0x04, 0x14), 'c.csv')).toThrow(FileFormatError);
    expect(() => decodeCsvBytes(Uint8Array.of(0x50, 0x4b, 0x03, 0x04, 0x14), 'c.csv')).toThrow(/"c\.csv" is a zip archive/);
    expect(() => decodeCsvBytes(Uint8Array.of(0x61, 0x2c, 0x00, 0x62), 'd.csv')).toThrow(/"d\.csv" is not CSV text: it holds binary data \(a zero byte at byte 3\)/);
  });

  it('reads UTF-16 text with its byte-order mark, as a spreadsheet saves "Unicode text", tab-separated', () => {
    const text = '\ufeffUSUBJID\tAVAL\nM\u00fc-1\t3\n';
    const le = new Uint8Array(text.length * 2);
    for (let i = 0; i < text.length; i++) {
      le[2 * i] = text.charCodeAt(i) & 0xff; // little-endian code units (exact: all characters here are in the BMP)
      le[2 * i + 1] = text.charCodeAt(i) >> 8;
    }
    const be = le.map((_, i) => le[i % 2 === 0 ? i + 1 : i - 1]!);
    for (const bytes of [le, be]) {
      expect(readCsvText(decodeCsvBytes(bytes, 'u.txt'))).toEqual([
        ['USUBJID', 'AVAL'],
        ['M\u00fc-1', '3'],
      ]);
    }
  });
});
