import type { TextCodes } from '../intake/types';

/**
 * Per-subject grouping taken from a per-row text column (arm or site): each subject gets the first non-blank value
 * among its rows; subjects with none get `blankName`. Groups are listed in order of first appearance. O(rows).
 * Example: rows (S1,"A"), (S2,""), (S1,"A") with blankName "(none)" → names ["A", "(none)"], group [0, 1].
 */
export function subjectGroups(
  subjectIndex: Int32Array,
  nSubjects: number,
  column: readonly string[] | TextCodes,
  blankName: string,
): { readonly names: readonly string[]; readonly group: Int32Array } {
  // Work on codes: each distinct text is trimmed once, each row costs two typed-array reads.
  const coded = Array.isArray(column) ? null : (column as TextCodes);
  const codes = coded !== null ? coded.codes : null;
  const texts = coded !== null ? coded.texts.map((t) => t.trim()) : null;
  const plain = coded === null ? (column as readonly string[]) : null;
  const value = new Int32Array(nSubjects).fill(-1); // code of the subject's first non-blank text (plain: the row)
  for (let i = 0; i < subjectIndex.length; i++) {
    const s = subjectIndex[i]!;
    if (s < 0 || value[s] !== -1) continue;
    if (codes !== null) {
      const c = codes[i]!;
      if (texts![c] !== '') value[s] = c;
    } else if ((plain![i] ?? '').trim() !== '') value[s] = i;
  }
  const names: string[] = [];
  const pos = new Map<string, number>();
  const group = new Int32Array(nSubjects);
  for (let s = 0; s < nSubjects; s++) {
    const k = value[s]!;
    const name = k < 0 ? blankName : texts !== null ? texts[k]! : plain![k]!.trim();
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
