/**
 * Arm checks of unblinded mode (SPEC §3): a subject must stay in one arm, and there must be at least two arms with at
 * least two subjects each among the rows usable for visit timing. Problems are added to the issue list as errors.
 */
import type { IssueList } from './issueList';
import type { TextCodes } from './types';

/**
 * Returns the distinct arms of the timing-usable rows in order of first appearance, and adds errors:
 * 'subject-in-two-arms' for each conflicting cell (the cell that first gave the subject its arm, and every cell of
 * that subject with another arm; rows of any usability count), 'too-few-arms' and 'too-few-subjects-per-arm'.
 * `arm` holds the arm of each row as codes, "" where the arm is blank or unusable. O(rows), on codes.
 * @example checkArms({ codes: Int32Array.of(0, 1), texts: ["A", "B"] }, Int32Array.of(0, 0), ["S1"], Uint8Array.of(1, 1), 3, issues)
 * // ["A", "B"], with two 'subject-in-two-arms' errors (rows 1 and 2 of the data) and the count errors
 */
export function checkArms(
  arm: TextCodes,
  subjectIndex: Int32Array,
  subjectIds: readonly string[],
  usableTiming: Uint8Array,
  armCol: number,
  issues: IssueList,
): string[] {
  const n = arm.codes.length;
  // Code of the arm text → arm number in order of first appearance (-1: not seen yet); "" is never an arm.
  const armOf = new Int32Array(arm.texts.length).fill(-1);
  const armNames: string[] = [];
  const armOfRow = new Int32Array(n).fill(-1);
  const subjectArm = new Int32Array(subjectIds.length).fill(-1);
  const firstRow = new Int32Array(subjectIds.length).fill(-1);
  const conflicted = new Uint8Array(subjectIds.length);
  const otherArm = new Int32Array(subjectIds.length).fill(-1); // the first arm that differs from the subject's first
  let anyConflict = false;
  for (let i = 0; i < n; i++) {
    const s = subjectIndex[i]!;
    const t = arm.codes[i]!;
    if (s < 0 || arm.texts[t] === '') continue;
    let code = armOf[t]!;
    if (code < 0) {
      code = armNames.length;
      armOf[t] = code;
      armNames.push(arm.texts[t]!);
    }
    armOfRow[i] = code;
    if (subjectArm[s] === -1) {
      subjectArm[s] = code;
      firstRow[s] = i;
    } else if (subjectArm[s] !== code) {
      conflicted[s] = 1;
      if (otherArm[s] === -1) otherArm[s] = code;
      anyConflict = true;
    }
  }
  if (anyConflict) {
    for (let i = 0; i < n; i++) {
      const s = subjectIndex[i]!;
      if (s < 0 || conflicted[s] !== 1 || armOfRow[i]! < 0) continue;
      if (i === firstRow[s] || armOfRow[i] !== subjectArm[s]) {
        const other = armOfRow[i] === subjectArm[s] ? otherArm[s]! : subjectArm[s]!;
        issues.at('subject-in-two-arms', 'error', i, armCol, 'arm', arm.texts[arm.codes[i]!]!, null, subjectIds[s]!, armNames[other]!);
      }
    }
  }

  const arms: string[] = [];
  const counts: number[] = [];
  const armIndex = new Int32Array(arm.texts.length).fill(-1);
  const counted = new Uint8Array(subjectIds.length);
  let anyUsable = false;
  for (let i = 0; i < n; i++) {
    if (usableTiming[i] !== 1) continue;
    anyUsable = true;
    const t = arm.codes[i]!;
    const a = arm.texts[t]!;
    if (a === '') continue;
    let k = armIndex[t]!;
    if (k < 0) {
      k = arms.length;
      armIndex[t] = k;
      arms.push(a);
      counts.push(0);
    }
    const s = subjectIndex[i]!;
    if (counted[s] === 0) {
      counted[s] = 1;
      counts[k]! += 1;
    }
  }
  if (!anyUsable) return arms;
  if (arms.length < 2) issues.range('too-few-arms', 'error', 'arm', '', null, String(arms.length));
  arms.forEach((a, k) => {
    if (counts[k]! < 2) issues.range('too-few-subjects-per-arm', 'error', 'arm', a, null, String(counts[k]));
  });
  return arms;
}
