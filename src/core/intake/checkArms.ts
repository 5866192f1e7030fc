/**
 * Arm checks of unblinded mode (SPEC §3): a subject must stay in one arm, and there must be at least two arms with at
 * least two subjects each among the rows usable for visit timing. Problems are added to the issue list as errors.
 */
import type { IssueList } from './issueList';

/**
 * Returns the distinct arms of the timing-usable rows in order of first appearance, and adds errors:
 * 'subject-in-two-arms' for each conflicting cell (the cell that first gave the subject its arm, and every cell of
 * that subject with another arm; rows of any usability count), 'too-few-arms' and 'too-few-subjects-per-arm'.
 * `arm` holds "" where the arm is blank or unusable. O(rows).
 * @example checkArms(["A", "B"], Int32Array.of(0, 0), ["S1"], Uint8Array.of(1, 1), 3, issues)
 * // ["A", "B"], with two 'subject-in-two-arms' errors (rows 1 and 2 of the data) and the count errors
 */
export function checkArms(
  arm: readonly string[],
  subjectIndex: Int32Array,
  subjectIds: readonly string[],
  usableTiming: Uint8Array,
  armCol: number,
  issues: IssueList,
): string[] {
  const n = arm.length;
  const armCode = new Map<string, number>();
  const armOfRow = new Int32Array(n).fill(-1);
  const subjectArm = new Int32Array(subjectIds.length).fill(-1);
  const firstRow = new Int32Array(subjectIds.length).fill(-1);
  const conflicted = new Uint8Array(subjectIds.length);
  const otherArm = new Int32Array(subjectIds.length).fill(-1); // the first arm that differs from the subject's first
  let anyConflict = false;
  for (let i = 0; i < n; i++) {
    const s = subjectIndex[i]!;
    const a = arm[i]!;
    if (s < 0 || a === '') continue;
    let code = armCode.get(a);
    if (code === undefined) {
      code = armCode.size;
      armCode.set(a, code);
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
    const armNames = [...armCode.keys()]; // codes were given in insertion order
    for (let i = 0; i < n; i++) {
      const s = subjectIndex[i]!;
      if (s < 0 || conflicted[s] !== 1 || armOfRow[i]! < 0) continue;
      if (i === firstRow[s] || armOfRow[i] !== subjectArm[s]) {
        const other = armOfRow[i] === subjectArm[s] ? otherArm[s]! : subjectArm[s]!;
        issues.at('subject-in-two-arms', 'error', i, armCol, 'arm', arm[i]!, null, subjectIds[s]!, armNames[other]!);
      }
    }
  }

  const arms: string[] = [];
  const counts: number[] = [];
  const armIndex = new Map<string, number>();
  const counted = new Uint8Array(subjectIds.length);
  let anyUsable = false;
  for (let i = 0; i < n; i++) {
    if (usableTiming[i] !== 1) continue;
    anyUsable = true;
    const a = arm[i]!;
    if (a === '') continue;
    let k = armIndex.get(a);
    if (k === undefined) {
      k = arms.length;
      armIndex.set(a, k);
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
