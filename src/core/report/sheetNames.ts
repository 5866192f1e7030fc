/**
 * Legal, unique worksheet and table names, shared by every front end that writes a workbook (the Excel add-in and the
 * .xlsx file writer), so a result sheet or table gets the same name everywhere. Excel's rules for a sheet name
 * (common practice; ECMA-376 Part 1 leaves most of them to the application): 1 to 31 characters, none of
 * \ / ? * : [ ], not starting or ending with an apostrophe, not the reserved name "History", and unique in the
 * workbook without regard to case.
 */

/** The longest sheet name Excel accepts. */
export const MAX_SHEET_NAME_LENGTH = 31;

const ILLEGAL_CHARACTERS = /[\\/?*:[\]]/g;

/** Strips apostrophes and white space from both ends (Excel refuses a leading or trailing apostrophe). */
const trimEnds = (s: string): string => s.replace(/^[\s']+|[\s']+$/g, '');

/**
 * A legal sheet name close to `wanted`: illegal characters become "-", control characters go, apostrophes and
 * spaces at either end go, the name is cut to 31 characters, a blank name becomes "Sheet" and "History" becomes
 * "History sheet". O(length).
 * Example: legalSheetName("Site [A]: 1/2") → "Site -A-- 1-2".
 */
export function legalSheetName(wanted: string): string {
  let name = trimEnds(wanted.replace(ILLEGAL_CHARACTERS, '-').replace(/[\u0000-\u001f]/g, ''));
  if (name === '') name = 'Sheet';
  if (name.toLowerCase() === 'history') name = `${name} sheet`;
  return trimEnds(name.slice(0, MAX_SHEET_NAME_LENGTH));
}

/**
 * A legal sheet name that differs, ignoring case, from every name in `taken`: the legal form of `wanted`, or that
 * name cut short enough to take " (2)", " (3)", ... Cost O(k · n) for k tries over n taken names.
 * Example: uniqueSheetName("Model", ["model", "Model (2)"]) → "Model (3)".
 */
export function uniqueSheetName(wanted: string, taken: Iterable<string>): string {
  const used = new Set<string>();
  for (const t of taken) used.add(t.toLowerCase());
  const base = legalSheetName(wanted);
  if (!used.has(base.toLowerCase())) return base;
  for (let k = 2; ; k++) {
    const suffix = ` (${k})`;
    const name = trimEnds(base.slice(0, MAX_SHEET_NAME_LENGTH - suffix.length)) + suffix;
    if (!used.has(name.toLowerCase())) return name;
  }
}

/**
 * Legal sheet names for several new sheets at once, unique among themselves and against `taken` (each new name
 * counts as taken for the ones after it). Cost O(names²) at worst, fine for a handful of sheets.
 * Example: uniqueSheetNames(["Visit timing", "visit timing", "a/b"]) → ["Visit timing", "visit timing (2)", "a-b"]
 */
export function uniqueSheetNames(wanted: readonly string[], taken: Iterable<string> = []): string[] {
  const used = [...taken];
  return wanted.map((w) => {
    const name = uniqueSheetName(w, used);
    used.push(name);
    return name;
  });
}

/**
 * A legal table name unique (ignoring case) among `taken`: "LP_" and the id with anything but letters, digits and
 * "_" replaced by "_"; then "_2", "_3", ... The prefix keeps the name from reading as a cell reference ("AB12",
 * "R1C1"), which Excel refuses. Example: uniqueTableName("ByVisit", ["LP_ByVisit"]) → "LP_ByVisit_2".
 */
export function uniqueTableName(id: string, taken: Iterable<string>): string {
  const used = new Set<string>();
  for (const t of taken) used.add(t.toLowerCase());
  const base = `LP_${id.replace(/[^A-Za-z0-9_]/g, '_')}`.slice(0, 200);
  if (!used.has(base.toLowerCase())) return base;
  for (let k = 2; ; k++) {
    const name = `${base}_${k}`;
    if (!used.has(name.toLowerCase())) return name;
  }
}
