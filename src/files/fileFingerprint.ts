/**
 * The input fingerprint of a file the user gave (the command line's --data, a file picked on the page): SHA-256
 * (FIPS 180-4) of the file's bytes exactly as read, in lower-case hex, computed by the platform's own SHA-256 (the Web
 * Crypto API, `crypto.subtle.digest`, present in browsers, in workers and in Node 20 as Node's built-in crypto). Hashing
 * the bytes is what identifies a file (`sha256sum` of the file gives the same digest) and costs about 0.1 s for
 * 100 MB, where the canonical cell form (src/core/report/fingerprint.ts, kept for the add-in, whose input is cells)
 * costs seconds at a million rows. O(bytes).
 *
 * Example: await fileFingerprint(new TextEncoder().encode('abc')) → "ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad"
 */
export async function fileFingerprint(bytes: Uint8Array): Promise<string> {
  // The digest API takes views of plain ArrayBuffers only; a view of shared memory is copied first.
  const view = bytes.buffer instanceof ArrayBuffer ? (bytes as Uint8Array<ArrayBuffer>) : new Uint8Array(bytes);
  const digest = new Uint8Array(await globalThis.crypto.subtle.digest('SHA-256', view));
  let hex = '';
  for (const b of digest) hex += b.toString(16).padStart(2, '0');
  return hex;
}
