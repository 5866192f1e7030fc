/**
 * The one pass over the rows for the random intercept and slope model: per participant the sums of the random-effects
 * design Z_i = [1, t_ij] — n_i = Σ1, Σt, Σt², and Z_i'y_i = (Σy, Σty) — plus the pooled X'X, X'y, y'y, and the
 * cross-products B_i = Z_i'X_i (2 × p) that the 2 × 2 Woodbury algebra needs (Henderson & Searle 1981 for the identity
 * (I + ZDZ')⁻¹ = I − Z D (I + Z'Z D)⁻¹ Z').
 *
 * When the design has no covariates and each participant stays in one arm, every row of X_i is Z_i's row times a fixed
 * 2 × p matrix E_a of the participant's arm a (intercept and arm indicator from the 1, time and arm × time from t), so
 * B_i = C_i E_a with C_i = Z_i'Z_i: the pass then keeps only the five sums per participant ("grouped"), and every
 * pooled quantity is Σ_a E_a'(Σ_{i in a} 2 × 2 piece)E_a, O(1) per participant. Otherwise B_i is kept (2p numbers per
 * participant) and the pieces cost O(p²) per participant ("general").
 * Cost: O(n) (grouped) or O(n p²) (general) for the rows; memory O(participants) or O(participants · p).
 */
import { buildDesign, type Design } from '../design';
import { applyScaling, type Scaling } from '../scaling';
import { sufficientStats } from '../sufficient';
import type { ModelData } from '../types';

export interface SlopeSums {
  readonly p: number;
  /** Number of observations. */
  readonly nObs: number;
  /** Participants with at least one observation, and for each (compact index) its index in the data. */
  readonly nP: number;
  readonly subjectOf: Int32Array;
  /** Per participant (compact index): Σ1, Σt, Σt², Σy, Σty. */
  readonly n: Float64Array;
  readonly st: Float64Array;
  readonly stt: Float64Array;
  readonly sy: Float64Array;
  readonly sty: Float64Array;
  /**
   * Grouped: the arm per participant and E_a per arm (2 × p, row-major); null for the general layout. Grouped
   * participants are stored arm by arm (arm a's are armStart[a] .. armStart[a + 1] − 1, in subject order within the
   * arm), so the per-arm sums of every pass keep their totals in local variables.
   */
  readonly group: Int32Array | null;
  readonly armStart: Int32Array | null;
  readonly E: readonly Float64Array[];
  /** General: B_i = Z_i'X_i per participant (2 × p, row-major, participant-major); null when grouped. */
  readonly B: Float64Array | null;
  readonly xtx: Float64Array;
  readonly xty: Float64Array;
  readonly yty: number;
}

/** E_a of arm a: row 0 = intercept (+ arm a's indicator), row 1 = time (+ arm a's time term). */
function armMatrix(design: Design, a: number): Float64Array {
  const p = design.p;
  const e = new Float64Array(2 * p);
  e[0] = 1;
  e[p + design.timeCol] = 1;
  if (a > 0 && design.armCol >= 0) {
    e[design.armCol + a - 1] = 1;
    e[p + design.armTimeCol + a - 1] = 1;
  }
  return e;
}

/**
 * The sums of the (scaled) data. Rows are taken as they come: a participant's rows need not be together.
 * Example: one participant, y = [1, 3] at t = [0, 1], no arms -> n [2], st [1], stt [1], sy [4], sty [3].
 */
export function slopeSums(data: ModelData, design: Design, scaling?: Scaling): SlopeSums {
  const { y, time, subject } = data;
  // With `scaling` the data are as given and each row is scaled as it is read, exactly as applyScaling would (same
  // operations, so the same numbers), without the scaled copy; the general layout makes the copy (it reads rows
  // through the design).
  const yc = scaling?.yCentre ?? 0;
  const ys = scaling?.yScale ?? 1;
  const tc = scaling?.tCentre ?? 0;
  const ts = scaling?.tScale ?? 1;
  const scaled = scaling !== undefined;
  const nRows = y.length;
  const nS = data.nSubjects;
  const p = design.p;
  const n = new Float64Array(nS);
  const st = new Float64Array(nS);
  const stt = new Float64Array(nS);
  const sy = new Float64Array(nS);
  const sty = new Float64Array(nS);
  const groupedDesign = design.timeCol >= 0 && data.covariates.length === 0 && p === (design.armCol >= 0 ? 2 * design.nArms : 2);
  const arm = design.armCol >= 0 ? data.armIndex : null;
  const groupOf = new Int32Array(groupedDesign ? nS : 0).fill(-1);
  // The grouped layout needs every participant in one arm; a participant in two arms sends the data to the general
  // one. That check rides along in the same pass.
  // y'y comes back in a one-number typed array: a number field written after the loop would change the literal's
  // hidden class (a small integer 0 becoming a double) and throw the pass's compiled code away at every fit.
  const acc: RowAccumulators = { n, st, stt, sy, sty, yty: new Float64Array(1) };
  let grouped = groupedDesign;
  if (grouped && arm !== null) grouped = rowSumsCheckingArms(data, acc, yc, ys, tc, ts, arm, design.nArms, groupOf);
  else rowSums(data, acc, yc, ys, tc, ts);
  const yty = acc.yty[0]!;
  if (grouped && arm === null) groupOf.fill(0);
  if (!grouped && scaled) {
    const copy = applyScaling(data, scaling);
    return slopeSums(copy, buildDesign(copy, false));
  }
  const group = grouped ? groupOf : null;
  let nP = 0;
  for (let k = 0; k < nS; k++) if (n[k]! > 0) nP++;
  if (group !== null) {
    const nArms = design.armCol >= 0 ? design.nArms : 1;
    const E = Array.from({ length: nArms }, (_, a) => armMatrix(design, a));
    // Participants arm by arm (a stable counting sort of the subjects present), copied into place in one loop that
    // also totals C_i and r_i per arm.
    const armStart = new Int32Array(nArms + 1);
    for (let k = 0; k < nS; k++) if (n[k]! > 0) armStart[group[k]! + 1] = armStart[group[k]! + 1]! + 1;
    for (let a = 0; a < nArms; a++) armStart[a + 1] = armStart[a + 1]! + armStart[a]!;
    const next = armStart.slice(0, nArms);
    const subjectOf = new Int32Array(nP);
    const g = new Int32Array(nP);
    const cols: Columns = { subjectOf, n: new Float64Array(nP), st: new Float64Array(nP), stt: new Float64Array(nP), sy: new Float64Array(nP), sty: new Float64Array(nP) };
    const { n: n2, st: st2, stt: stt2, sy: sy2, sty: sty2 } = cols;
    // X'X = Σ_a E_a'(Σ C_i)E_a and X'y = Σ_a E_a'(Σ r_i): no row-level p × p work.
    const C = new Float64Array(nArms * 3);
    const R = new Float64Array(nArms * 2);
    for (let k = 0; k < nS; k++) {
      const nk = n[k]!;
      if (!(nk > 0)) continue;
      const a = group[k]!;
      const i = next[a]!;
      next[a] = i + 1;
      subjectOf[i] = k;
      g[i] = a;
      n2[i] = nk;
      st2[i] = st[k]!;
      stt2[i] = stt[k]!;
      sy2[i] = sy[k]!;
      sty2[i] = sty[k]!;
      C[3 * a] = C[3 * a]! + nk;
      C[3 * a + 1] = C[3 * a + 1]! + st[k]!;
      C[3 * a + 2] = C[3 * a + 2]! + stt[k]!;
      R[2 * a] = R[2 * a]! + sy[k]!;
      R[2 * a + 1] = R[2 * a + 1]! + sty[k]!;
    }
    const xtx = new Float64Array(p * p);
    const xty = new Float64Array(p);
    for (let a = 0; a < nArms; a++) {
      addSandwich(xtx, E[a]!, C[3 * a]!, C[3 * a + 1]!, C[3 * a + 1]!, C[3 * a + 2]!, p);
      addTransposed(xty, E[a]!, R[2 * a]!, R[2 * a + 1]!, p);
    }
    return sumsObject(p, nRows, nP, yty, cols, g, armStart, E, null, xtx, xty);
  }

  const subjectOf = new Int32Array(nP);
  for (let k = 0, i = 0; k < nS; k++) if (n[k]! > 0) subjectOf[i++] = k;
  const pick = (v: Float64Array): Float64Array => {
    if (nP === nS) return v;
    const out = new Float64Array(nP);
    for (let i = 0; i < nP; i++) out[i] = v[subjectOf[i]!]!;
    return out;
  };
  const base: Columns = { subjectOf, n: pick(n), st: pick(st), stt: pick(stt), sy: pick(sy), sty: pick(sty) };

  // General layout: the intercept model's pass gives X'X, X'y; one more pass gives B_i = Σ_j [x_ij; t_ij x_ij].
  const general = sufficientStats(y, subject, nS, design, time);
  const Bfull = new Float64Array(nS * 2 * p);
  const x = new Float64Array(p);
  for (let r = 0; r < nRows; r++) {
    design.fillRow(r, x);
    const t = time[r]!;
    const off = subject[r]! * 2 * p;
    for (let j = 0; j < p; j++) {
      const xj = x[j]!;
      if (xj === 0) continue;
      Bfull[off + j] = Bfull[off + j]! + xj;
      Bfull[off + p + j] = Bfull[off + p + j]! + t * xj;
    }
  }
  let B = Bfull;
  if (nP !== nS) {
    B = new Float64Array(nP * 2 * p);
    for (let i = 0; i < nP; i++) B.set(Bfull.subarray(subjectOf[i]! * 2 * p, (subjectOf[i]! + 1) * 2 * p), i * 2 * p);
  }
  return sumsObject(p, nRows, nP, yty, base, null, null, [], B, general.xtx, general.xty);
}

interface Columns {
  readonly subjectOf: Int32Array;
  readonly n: Float64Array;
  readonly st: Float64Array;
  readonly stt: Float64Array;
  readonly sy: Float64Array;
  readonly sty: Float64Array;
}

/**
 * The sums as one object literal written out in full (no spread), so every SlopeSums has the same hidden class and the
 * compiled passes over it stay valid from one fit to the next (a spread gave each fit's sums a new one).
 */
function sumsObject(
  p: number,
  nObs: number,
  nP: number,
  yty: number,
  c: Columns,
  group: Int32Array | null,
  armStart: Int32Array | null,
  E: readonly Float64Array[],
  B: Float64Array | null,
  xtx: Float64Array,
  xty: Float64Array,
): SlopeSums {
  return { p, nObs, nP, subjectOf: c.subjectOf, n: c.n, st: c.st, stt: c.stt, sy: c.sy, sty: c.sty, group, armStart, E, B, xtx, xty, yty };
}

interface RowAccumulators {
  readonly n: Float64Array;
  readonly st: Float64Array;
  readonly stt: Float64Array;
  readonly sy: Float64Array;
  readonly sty: Float64Array;
  readonly yty: Float64Array;
}

/**
 * The row pass: per participant Σ1, Σt, Σt², Σy, Σty of t' = (t − tc)/ts and y' = (y − yc)/ys (tc = yc = 0 and
 * ts = ys = 1 leave the data as they are: x − 0 and x / 1 are exact), and y'y. Kept small so the engine optimises it.
 */
function rowSums(data: ModelData, acc: RowAccumulators, yc: number, ys: number, tc: number, ts: number): void {
  const { y, time, subject } = data;
  const { n, st, stt, sy, sty } = acc;
  let yty = 0;
  for (let r = 0; r < y.length; r++) {
    const s = subject[r]!;
    const t = (time[r]! - tc) / ts;
    const v = (y[r]! - yc) / ys;
    n[s] = n[s]! + 1;
    st[s] = st[s]! + t;
    stt[s] = stt[s]! + t * t;
    sy[s] = sy[s]! + v;
    sty[s] = sty[s]! + t * v;
    yty += v * v;
  }
  acc.yty[0] = yty;
}

/** rowSums that also records each participant's arm in groupOf; false when an arm is out of range or a participant has two. */
function rowSumsCheckingArms(data: ModelData, acc: RowAccumulators, yc: number, ys: number, tc: number, ts: number, arm: Int32Array, nArms: number, groupOf: Int32Array): boolean {
  const { y, time, subject } = data;
  const { n, st, stt, sy, sty } = acc;
  let yty = 0;
  let ok = true;
  for (let r = 0; r < y.length; r++) {
    const s = subject[r]!;
    const t = (time[r]! - tc) / ts;
    const v = (y[r]! - yc) / ys;
    n[s] = n[s]! + 1;
    st[s] = st[s]! + t;
    stt[s] = stt[s]! + t * t;
    sy[s] = sy[s]! + v;
    sty[s] = sty[s]! + t * v;
    yty += v * v;
    const a = arm[r]!;
    const g = groupOf[s]!;
    if (g !== a || g === -1) {
      if (g === -1 && a >= 0 && a < nArms) groupOf[s] = a;
      else ok = false;
    }
  }
  acc.yty[0] = yty;
  return ok;
}

/** out += E' S E for a 2 × 2 matrix S = [[s00, s01], [s10, s11]] and E 2 × p (row-major). Cost O(p²). */
export function addSandwich(out: Float64Array, E: Float64Array, s00: number, s01: number, s10: number, s11: number, p: number): void {
  for (let i = 0; i < p; i++) {
    const e0i = E[i]!;
    const e1i = E[p + i]!;
    if (e0i === 0 && e1i === 0) continue;
    const a0 = e0i * s00 + e1i * s10;
    const a1 = e0i * s01 + e1i * s11;
    const row = i * p;
    for (let j = 0; j < p; j++) out[row + j] = out[row + j]! + a0 * E[j]! + a1 * E[p + j]!;
  }
}

/** out += E' v for a 2-vector v. Cost O(p). */
export function addTransposed(out: Float64Array, E: Float64Array, v0: number, v1: number, p: number): void {
  for (let j = 0; j < p; j++) out[j] = out[j]! + E[j]! * v0 + E[p + j]! * v1;
}
