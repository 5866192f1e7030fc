/**
 * Per-subject grouping taken from a per-row text column (arm or site): each subject gets the first non-blank value
 * among its rows; subjects with none get `blankName`. Groups are listed in order of first appearance. O(rows).
 * Example: rows (S1,"A"), (S2,""), (S1,"A") with blankName "(none)" → names ["A", "(none)"], group [0, 1].
 */
export function subjectGroups(
  subjectIndex: Int32Array,
  nSubjects: number,
  column: readonly string[],
  blankName: string,
): { readonly names: readonly string[]; readonly group: Int32Array } {
  const value: string[] = new Array<string>(nSubjects).fill('');
  for (let i = 0; i < subjectIndex.length; i++) {
    const s = subjectIndex[i]!;
    const v = (column[i] ?? '').trim();
    if (s >= 0 && value[s] === '' && v !== '') value[s] = v;
  }
  const names: string[] = [];
  const pos = new Map<string, number>();
  const group = new Int32Array(nSubjects);
  for (let s = 0; s < nSubjects; s++) {
    const name = value[s] === '' ? blankName : value[s]!;
    let g = pos.get(name);
    if (g === undefined) {
      g = names.length;
      pos.set(name, g);
      names.push(name);
    }
    group[s] = g;
  }
  return { names, group };
}
