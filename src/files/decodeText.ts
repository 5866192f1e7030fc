import { FileFormatError } from './errors';

/** The four bytes that open every zip archive, and so every .xlsx workbook ("PK\x03\x04", the zip local file header). */
const ZIP_MAGIC = [0x50, 0x4b, 0x03, 0x04] as const;

/**
 * Turns the bytes of a CSV file into text: UTF-16 when the bytes open with a UTF-16 byte-order mark, UTF-8 when they
 * are valid UTF-8 (a byte-order mark is kept for the CSV reader to strip), else Windows-1252, the code page spreadsheet programs on Windows commonly save "CSV" in
 * (common practice), so "Müller" saved that way stays "Müller" instead of turning into replacement characters.
 * Cost O(bytes).
 *
 * Example: decodeCsvBytes(Uint8Array.of(0x4d, 0xfc)) → "Mü"
 * @throws FileFormatError when the bytes are a zip archive (an .xlsx workbook with the wrong extension) or hold a NUL
 * byte without a UTF-16 byte-order mark (binary data), naming the file as `label`.
 */
export function decodeCsvBytes(bytes: Uint8Array, label: string): string {
  if (ZIP_MAGIC.every((b, k) => bytes[k] === b)) {
    throw new FileFormatError(`"${label}" is a zip archive such as an .xlsx workbook, not CSV text; give it the .xlsx extension or save it as CSV.`);
  }
  // A UTF-16 byte-order mark (Unicode Standard, ch. 23.8, from memory): spreadsheet programs save "Unicode text"
  // this way, tab-separated; the CSV reader takes the tab from the header line.
  if (bytes[0] === 0xff && bytes[1] === 0xfe) return new TextDecoder('utf-16le').decode(bytes);
  if (bytes[0] === 0xfe && bytes[1] === 0xff) return new TextDecoder('utf-16be').decode(bytes);
  const nul = bytes.indexOf(0);
  if (nul >= 0) {
    throw new FileFormatError(`"${label}" is not CSV text: it holds binary data (a zero byte at byte ${nul + 1}). Save the data as CSV (UTF-8) or .xlsx.`);
  }
  try {
    return new TextDecoder('utf-8', { fatal: true, ignoreBOM: true }).decode(bytes);
  } catch {
    return new TextDecoder('windows-1252').decode(bytes);
  }
}
