import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { readCsv } from '../../src/files/readCsv';
import { decodeCsv, utf8Census } from '../../src/files/decodeText';

/** Plain non-blank fields (no quotes, delimiters or line ends), for generated files. Blank records are left out:
 * a CR, an empty record and an LF read as one CRLF, an ambiguity of mixed line ends that no reader can resolve. */
const plainField = fc.stringMatching(/^[A-Za-z0-9.\-][A-Za-z0-9 .\-]{0,5}$/);

describe('readCsv line ends and extra fields', () => {
  it('takes LF, CRLF and a lone CR alike as line ends, mixed in one file, and never merges records (issue item 6)', () => {
    const header = 'id,day,value';
    const records = Array.from({ length: 120 }, (_, k) => `S${k},${k + 1},${k / 2}`);
    const ends = ['\n', '\r\n', '\r'];
    const text = [header, ...records].map((r, k) => r + ends[k % 3]!).join('');
    const read = readCsv(text);
    expect(read.cells.length).toBe(121);
    expect(read.cells.every((r) => r.length === 3)).toBe(true);
    expect(read.cells[120]).toEqual(['S119', '120', '59.5']);
    expect(read.notes).toEqual([]);
  });

  it('keeps a quoted line break inside its field whichever line end it is (RFC 4180 §2, rule 6)', () => {
    expect(readCsv('a,b\r"x\ry",1\r\n"p\r\nq",2\n').cells).toEqual([
      ['a', 'b'],
      ['x\ry', '1'],
      ['p\r\nq', '2'],
    ]);
  });

  it('keeps values past the header and names their first cells in one grouped note (issue item 6)', () => {
    const read = readCsv('id,day\nS1,1\nS2,2,extra\nS3,3,,more\nS4,4,,\n');
    expect(read.cells).toEqual([
      ['id', 'day', '', ''],
      ['S1', '1', '', ''],
      ['S2', '2', 'extra', ''],
      ['S3', '3', '', 'more'],
      ['S4', '4', '', ''],
    ]);
    expect(read.notes).toEqual([{ cell: 'C3', message: expect.stringMatching(/^2 rows have more fields than the header \(2\): C3, D4\. Those values have no column heading/) as unknown }]);
  });

  it('trims trailing columns that are blank in every row, header included', () => {
    expect(readCsv('id,day,,\nS1,1,,\n').cells).toEqual([
      ['id', 'day'],
      ['S1', '1'],
    ]);
  });

  it('reads any generated file the same whichever line ends join its records (property)', () => {
    fc.assert(
      fc.property(
        fc.integer({ min: 1, max: 5 }).chain((w) => fc.tuple(fc.array(fc.array(plainField, { minLength: w, maxLength: w }), { minLength: 1, maxLength: 30 }), fc.array(fc.constantFrom('\n', '\r\n', '\r'), { minLength: 30, maxLength: 30 }))),
        ([rows, ends]) => {
          const named = [rows[0]!.map((_, j) => `h${j}`), ...rows];
          const lf = readCsv(named.map((r) => r.join(',')).join('\n'));
          const mixed = readCsv(named.map((r, k) => r.join(',') + (k < named.length - 1 ? ends[k % ends.length]! : '')).join(''));
          expect(mixed.cells).toEqual(lf.cells);
          expect(mixed.notes).toEqual([]);
          expect(lf.cells.length).toBeLessThanOrEqual(named.length);
        },
      ),
      { numRuns: 200 },
    );
  });

  it('reads 200,000 rows of "NA" (the issue\'s quadratic case) in one linear pass', () => {
    const text = `id,day,value\n${'NA,NA,NA\n'.repeat(200_000)}`;
    const read = readCsv(text);
    expect(read.cells.length).toBe(200_001);
  });
});

describe('decodeCsv', () => {
  const enc = (s: string): number[] => [...new TextEncoder().encode(s)];

  it('decodes UTF-8 with one stray invalid byte as UTF-8 with a replacement character, and says where (issue item 7)', () => {
    // "Zürich" in UTF-8 (RFC 3629: ü is C3 BC), then a lone 0xFF, which never occurs in UTF-8.
    const bytes = Uint8Array.from([...enc('id,site\nS1,Zürich\nS2,Bern'), 0xff, ...enc('\n')]);
    const d = decodeCsv(bytes, 'v.csv');
    expect(d.encoding).toBe('UTF-8');
    expect(d.replaced).toBe(1);
    expect(d.text).toBe('id,site\nS1,Zürich\nS2,Bern\uFFFD\n');
    expect(readCsv(d.text, d.firstReplaced).watched).toBe('B3');
  });

  it('still reads a file with no valid multi-byte sequence as Windows-1252 (0xFC is "ü" there, from memory)', () => {
    const d = decodeCsv(Uint8Array.of(0x4d, 0xfc, 0x6c, 0x6c, 0x65, 0x72), 'b.csv');
    expect(d).toEqual({ text: 'Müller', encoding: 'Windows-1252', replaced: 0, firstReplaced: -1 });
  });

  it('utf8Census agrees with the platform decoder on which bytes are ill-formed (property, WHATWG Encoding: one U+FFFD per maximal ill-formed part)', () => {
    fc.assert(
      fc.property(fc.uint8Array({ maxLength: 40 }), (bytes) => {
        const c = utf8Census(bytes);
        const text = new TextDecoder('utf-8', { ignoreBOM: true }).decode(bytes);
        if (c.invalid === 0) expect(text.includes('\uFFFD')).toBe(false);
        else expect(text.includes('\uFFFD')).toBe(true);
      }),
      { numRuns: 500 },
    );
  });
});
