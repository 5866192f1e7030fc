/** Characters Excel does not allow in a sheet name (ECMA-376 Part 1, §18.2.19 and the application's own rule). */
const ILLEGAL = /[\\/?*:[\]]/g;
/** Longest sheet name Excel accepts. */
export const MAX_SHEET_NAME = 31;

/**
 * Turns wanted sheet names into legal, unique ones: illegal characters (\ / ? * : [ ]) become "-", leading and
 * trailing apostrophes and spaces go, names are cut to 31 characters, a blank name becomes "Sheet", and a name
 * already taken (compared without regard to case, as Excel does, including `taken`) gets " (2)", " (3)", ...
 * Cost O(names²) in the worst case, fine for a handful of sheets.
 *
 * Example: uniqueSheetNames(['Visit timing', 'visit timing', 'a/b']) → ['Visit timing', 'visit timing (2)', 'a-b']
 */
export function uniqueSheetNames(wanted: readonly string[], taken: readonly string[] = []): string[] {
  const used = new Set(taken.map((t) => t.toLowerCase()));
  const out: string[] = [];
  for (const w of wanted) {
    let base = w.replace(ILLEGAL, '-').replace(/^[' ]+|[' ]+$/g, '');
    if (base === '' || base.toLowerCase() === 'history') base = base === '' ? 'Sheet' : `${base} sheet`;
    base = base.slice(0, MAX_SHEET_NAME).replace(/[' ]+$/, '');
    let name = base;
    for (let k = 2; used.has(name.toLowerCase()); k++) {
      const suffix = ` (${k})`;
      name = base.slice(0, MAX_SHEET_NAME - suffix.length).replace(/[' ]+$/, '') + suffix;
    }
    used.add(name.toLowerCase());
    out.push(name);
  }
  return out;
}

/** A legal table name (ECMA-376 Part 1, §18.5.1.2 definedName rules): letters, digits and "_", starting with a
 * letter or "_", not readable as a cell reference such as "AB12" or "R1C1"; unique among `used` (case-insensitive). */
export function uniqueTableName(id: string, used: Set<string>): string {
  let base = id.replace(/[^A-Za-z0-9_]/g, '_');
  if (!/^[A-Za-z_]/.test(base)) base = `T_${base}`;
  if (/^[A-Za-z]{1,3}[0-9]+$/.test(base) || /^[RrCc]([0-9]+)?([RrCc][0-9]*)?$/.test(base)) base = `T_${base}`;
  let name = base;
  for (let k = 2; used.has(name.toLowerCase()); k++) name = `${base}_${k}`;
  used.add(name.toLowerCase());
  return name;
}
