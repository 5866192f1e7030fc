/**
 * Whether an xsd:boolean attribute value is true. The workbookPr date1904 attribute is typed xsd:boolean in the
 * ECMA-376 schema, and W3C XML Schema Part 2 (§3.2.2 boolean, section number from memory) gives it four legal
 * spellings, "true", "false", "1" and "0", with surrounding white space collapsed.
 * Example: xsdBoolean(' true ') → true; xsdBoolean('0') → false
 */
export function xsdBoolean(value: string): boolean {
  const v = value.trim();
  return v === '1' || v === 'true';
}
