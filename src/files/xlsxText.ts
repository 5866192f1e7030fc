/**
 * Text and numbers as SpreadsheetML writes them (ECMA-376 Part 1): XML escaping for character data and attributes,
 * the ST_Xstring escape _xHHHH_ (§22.9.2.19) for characters XML 1.0 cannot hold (control characters, lone surrogates,
 * U+FFFE/U+FFFF) and for a carriage return (which an XML parser would turn into a line feed), with a literal "_xHHHH_"
 * in the text protected by _x005F_; and numbers as xsd:double text. Pure; cost O(characters).
 */

/** Characters that need attention in cell text; a text without any goes through untouched (the common case). */
const SPECIAL = /[&<>"\u0000-\u0008\u000B-\u001F\uD800-\uDFFF\uFFFE\uFFFF]|_(?=x[0-9A-Fa-f]{4}_)/;
const SPECIAL_ALL = /[&<>"]|[\u0000-\u0008\u000B-\u001F\uFFFE\uFFFF]|[\uD800-\uDBFF][\uDC00-\uDFFF]|[\uD800-\uDFFF]|_(?=x[0-9A-Fa-f]{4}_)/g;

const hex4 = (code: number): string => code.toString(16).toUpperCase().padStart(4, '0');

function replaceSpecial(ch: string): string {
  switch (ch) {
    case '&':
      return '&amp;';
    case '<':
      return '&lt;';
    case '>':
      return '&gt;';
    case '"':
      return '&quot;';
    case '_':
      return '_x005F_';
    default:
      // A well-formed surrogate pair is an ordinary character; a lone half and the control characters are escaped.
      return ch.length === 2 ? ch : `_x${hex4(ch.charCodeAt(0))}_`;
  }
}

/**
 * Text for a cell's <t> element, a table column name or an attribute value (quotes escaped too).
 * Example: cellText('a<b\r\u0001_x0041_') → 'a&lt;b_x000D__x0001__x005F_x0041_'
 */
export function cellText(s: string): string {
  return SPECIAL.test(s) ? s.replace(SPECIAL_ALL, replaceSpecial) : s;
}

/** Plain XML escaping for names and attributes we make ourselves (no ST_Xstring escapes).
 * Example: xmlAttr(`O'Neil & "Co"`) → 'O&apos;Neil &amp; &quot;Co&quot;' */
export function xmlAttr(s: string): string {
  return s.replace(/&/g, '&amp;').replace(/</g, '&lt;').replace(/>/g, '&gt;').replace(/"/g, '&quot;').replace(/'/g, '&apos;');
}

/** True when leading or trailing white space must be kept with xml:space="preserve". */
export function needsPreserve(s: string): boolean {
  const a = s.charCodeAt(0);
  const b = s.charCodeAt(s.length - 1);
  return a <= 32 || b <= 32;
}

/**
 * A finite number as xsd:double text, the shortest that reads back as the same double (ECMAScript Number::toString);
 * −0 becomes 0, as a spreadsheet has no negative zero. Example: numberText(1e-300) → '1e-300'
 */
export function numberText(v: number): string {
  return v === 0 ? '0' : String(v);
}
