/**
 * The results JSON as a sequence of pieces instead of one string: at 1,000,000 rows the compact text is ~60 MB (twice
 * that in memory when any character is outside Latin-1), and building it whole beside the results object was the
 * command line's memory peak. The pieces concatenate to exactly `JSON.stringify(value)` (ECMA-262 JSON.stringify:
 * object members in own-key order, members whose value is undefined, a function or a symbol left out, such array
 * elements written as null, toJSON honoured); each piece is one small value's text or a bracket, joined into
 * pieces of about `chunk` characters so the file is written in a few thousand writes.
 */

/** Yields the compact JSON text of `value` in pieces of about `chunk` characters (the last may be shorter). */
export function* jsonPieces(value: unknown, chunk = 1 << 16): Generator<string> {
  let buffer = '';
  for (const part of parts(value)) {
    buffer += part;
    if (buffer.length >= chunk) {
      yield buffer;
      buffer = '';
    }
  }
  if (buffer.length > 0) yield buffer;
}

/** Values JSON.stringify leaves out of an object (and writes as null in an array). */
function skipped(v: unknown): boolean {
  return v === undefined || typeof v === 'function' || typeof v === 'symbol';
}

function* parts(value: unknown): Generator<string> {
  const v = withToJson(value, '');
  if (v === null || typeof v !== 'object') {
    // Primitives (and the top-level undefined, which JSON.stringify returns as undefined: not a JSON text).
    const text = JSON.stringify(v);
    if (text === undefined) throw new TypeError('the results are not a JSON value');
    yield text;
    return;
  }
  yield* container(v as object);
}

function withToJson(v: unknown, key: string): unknown {
  if (v !== null && typeof v === 'object' && typeof (v as { toJSON?: unknown }).toJSON === 'function') {
    return (v as { toJSON: (k: string) => unknown }).toJSON(key);
  }
  return v;
}

function* container(v: object): Generator<string> {
  // Boxed primitives and other leaves that JSON.stringify handles itself (Number, String, Boolean objects, BigInt).
  if (!(Array.isArray(v) || isPlainEnough(v))) {
    yield JSON.stringify(v);
    return;
  }
  if (Array.isArray(v)) {
    yield '[';
    for (let i = 0; i < v.length; i++) {
      if (i > 0) yield ',';
      const e = withToJson(v[i], String(i));
      if (skipped(e)) yield 'null';
      else if (e === null || typeof e !== 'object') yield JSON.stringify(e);
      else yield* container(e as object);
    }
    yield ']';
    return;
  }
  yield '{';
  let first = true;
  for (const key of Object.keys(v)) {
    const e = withToJson((v as Record<string, unknown>)[key], key);
    if (skipped(e)) continue;
    yield `${first ? '' : ','}${JSON.stringify(key)}:`;
    first = false;
    if (e === null || typeof e !== 'object') yield JSON.stringify(e);
    else yield* container(e as object);
  }
  yield '}';
}

/** Objects written member by member: anything but the boxed primitives, which JSON.stringify unwraps. */
function isPlainEnough(v: object): boolean {
  return !(v instanceof Number || v instanceof String || v instanceof Boolean);
}
