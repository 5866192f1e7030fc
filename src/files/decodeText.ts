import { FileFormatError } from './errors';

/** The four bytes that open every zip archive, and so every .xlsx workbook ("PK\x03\x04", the zip local file header). */
const ZIP_MAGIC = [0x50, 0x4b, 0x03, 0x04] as const;

/** The text of a CSV file and how it was decoded. */
export interface DecodedText {
  readonly text: string;
  /** The encoding used, as the analysis record names it. */
  readonly encoding: 'UTF-8' | 'UTF-16LE' | 'UTF-16BE' | 'Windows-1252';
  /** Invalid UTF-8 sequences replaced by U+FFFD, and the character index in `text` of the first (-1 when none). */
  readonly replaced: number;
  readonly firstReplaced: number;
}

/**
 * Counts the well-formed multi-byte UTF-8 sequences and the ill-formed ones (Unicode Standard, Table 3-7, well-formed
 * UTF-8 byte sequences, from memory), and the byte offset of the first ill-formed one. Cost O(bytes).
 */
export function utf8Census(bytes: Uint8Array): { valid: number; invalid: number; firstInvalid: number } {
  let valid = 0;
  let invalid = 0;
  let firstInvalid = -1;
  const n = bytes.length;
  const cont = (k: number, lo = 0x80, hi = 0xbf): boolean => k < n && bytes[k]! >= lo && bytes[k]! <= hi;
  let i = 0;
  while (i < n) {
    const b = bytes[i]!;
    if (b < 0x80) {
      i++;
      continue;
    }
    let len = 0;
    if (b >= 0xc2 && b <= 0xdf) len = cont(i + 1) ? 2 : 0;
    else if (b >= 0xe0 && b <= 0xef) {
      const lo = b === 0xe0 ? 0xa0 : 0x80;
      const hi = b === 0xed ? 0x9f : 0xbf;
      len = cont(i + 1, lo, hi) && cont(i + 2) ? 3 : 0;
    } else if (b >= 0xf0 && b <= 0xf4) {
      const lo = b === 0xf0 ? 0x90 : 0x80;
      const hi = b === 0xf4 ? 0x8f : 0xbf;
      len = cont(i + 1, lo, hi) && cont(i + 2) && cont(i + 3) ? 4 : 0;
    }
    if (len === 0) {
      if (firstInvalid < 0) firstInvalid = i;
      invalid++;
      i++;
    } else {
      valid++;
      i += len;
    }
  }
  return { valid, invalid, firstInvalid };
}

/**
 * Turns the bytes of a CSV file into text and says how: UTF-16 when the bytes open with a UTF-16 byte-order mark;
 * UTF-8 when they are valid UTF-8 (a byte-order mark is kept for the CSV reader to strip); Windows-1252, the code page
 * spreadsheet programs on Windows commonly save "CSV" in (common practice), only when the bytes are clearly that:
 * more ill-formed UTF-8 sequences than well-formed multi-byte ones ("Müller" saved that way has one ill-formed
 * sequence and no well-formed one). Otherwise the bytes are UTF-8 with a few damaged bytes: they are decoded as
 * UTF-8, each ill-formed sequence becomes U+FFFD, and the count and first position are returned for a warning.
 * Cost O(bytes).
 *
 * Example: decodeCsv(Uint8Array.of(0x4d, 0xfc), 'a.csv') → { text: 'Mü', encoding: 'Windows-1252', replaced: 0, firstReplaced: -1 }
 * @throws FileFormatError when the bytes are a zip archive (an .xlsx workbook with the wrong extension) or hold a NUL
 * byte without a UTF-16 byte-order mark (binary data), naming the file as `label`.
 */
export function decodeCsv(bytes: Uint8Array, label: string): DecodedText {
  if (ZIP_MAGIC.every((b, k) => bytes[k] === b)) {
    throw new FileFormatError(`"${label}" is a zip archive such as an .xlsx workbook, not CSV text; give it the .xlsx extension or save it as CSV.`);
  }
  const clean = { replaced: 0, firstReplaced: -1 };
  // A UTF-16 byte-order mark (Unicode Standard, ch. 23.8, from memory): spreadsheet programs save "Unicode text"
  // this way, tab-separated; the CSV reader takes the tab from the header line.
  if (bytes[0] === 0xff && bytes[1] === 0xfe) return { text: new TextDecoder('utf-16le').decode(bytes), encoding: 'UTF-16LE', ...clean };
  if (bytes[0] === 0xfe && bytes[1] === 0xff) return { text: new TextDecoder('utf-16be').decode(bytes), encoding: 'UTF-16BE', ...clean };
  const nul = bytes.indexOf(0);
  if (nul >= 0) {
    throw new FileFormatError(`"${label}" is not CSV text: it holds binary data (a zero byte at byte ${nul + 1}). Save the data as CSV (UTF-8) or .xlsx.`);
  }
  // Valid UTF-8, the usual case, is decoded by the platform in one call (a strict decoder throws on the first
  // ill-formed sequence); only then are the sequences counted, to choose between Windows-1252 and repaired UTF-8.
  try {
    return { text: new TextDecoder('utf-8', { ignoreBOM: true, fatal: true }).decode(bytes), encoding: 'UTF-8', ...clean };
  } catch {
    // not valid UTF-8: decided below
  }
  const census = utf8Census(bytes);
  if (census.invalid === 0) return { text: new TextDecoder('utf-8', { ignoreBOM: true }).decode(bytes), encoding: 'UTF-8', ...clean };
  if (census.invalid > census.valid) return { text: new TextDecoder('windows-1252').decode(bytes), encoding: 'Windows-1252', ...clean };
  const utf8 = new TextDecoder('utf-8', { ignoreBOM: true });
  return {
    text: utf8.decode(bytes),
    encoding: 'UTF-8',
    replaced: census.invalid,
    firstReplaced: utf8.decode(bytes.subarray(0, census.firstInvalid)).length,
  };
}

/** The text of decodeCsv alone. Example: decodeCsvBytes(Uint8Array.of(0x4d, 0xfc), 'a.csv') → "Mü" */
export function decodeCsvBytes(bytes: Uint8Array, label: string): string {
  return decodeCsv(bytes, label).text;
}
