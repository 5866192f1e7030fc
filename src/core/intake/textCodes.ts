/**
 * Text columns of the intake table as codes (TextCodes): readTable gives them; for a table made by hand (tests) they
 * are made from the per-row texts. Later layers group and match rows by code, so they make no per-row strings.
 */
import type { IntakeTable, TextCodes } from './types';

/**
 * Codes of per-row texts: each distinct text once, in order of first appearance. O(rows) map look-ups.
 * @example codesOfTexts(["A", "B", "A"]) // { codes: Int32Array [0, 1, 0], texts: ["A", "B"] }
 */
export function codesOfTexts(column: readonly string[]): TextCodes {
  const codes = new Int32Array(column.length);
  const texts: string[] = [];
  const at = new Map<string, number>();
  for (let i = 0; i < column.length; i++) {
    const t = column[i] ?? '';
    let k = at.get(t);
    if (k === undefined) {
      k = texts.length;
      at.set(t, k);
      texts.push(t);
    }
    codes[i] = k;
  }
  return { codes, texts };
}

/** The table's visit, site or arm column as codes; null when the column is not there. */
export function textCodesOf(table: IntakeTable, role: 'visit' | 'site' | 'arm'): TextCodes | null {
  const given = role === 'visit' ? table.visitCodes : role === 'site' ? table.siteCodes : table.armCodes;
  if (given !== undefined) return given;
  const column = table[role];
  return column === null ? null : codesOfTexts(column);
}

/** One string reference per row: texts[codes[i]]. O(rows). */
export function textsOfCodes(c: TextCodes): string[] {
  const out = new Array<string>(c.codes.length);
  for (let i = 0; i < out.length; i++) out[i] = c.texts[c.codes[i]!]!;
  return out;
}
