/**
 * A starting value for D = G/σ² by the method of moments from the per-participant sums (the two-stage estimator of
 * Swamy 1970, Econometrica 38:311–323, for random coefficients): each participant with two or more distinct times
 * gets its least-squares intercept and slope b_i; σ² is estimated from the pooled residuals about those lines,
 *   σ̃² = (y'y − Σ (Σy)²/n − Σ S_ty²/S_tt) / (N − participants − lines),
 * and G from the spread of the b_i about their arm's mean less their mean sampling covariance,
 *   G̃ = Σ (b_i − b̄_a)(b_i − b̄_a)'/(lines − arms) − σ̃² mean(C_i⁻¹),
 * with its eigenvalues raised to a small floor so that D̃ is positive definite. Without arms in the grouped layout
 * (or with covariates) the b_i are centred on one mean. Only a start: the likelihood is then maximised from it.
 * Cost: one pass over the participants.
 */
import type { RelativeG } from './profile';
import type { SlopeSums } from './sums';

/**
 * D̃, or null when fewer than three participants have two distinct times or no residual degrees of freedom remain.
 * Example: participants whose lines are exact (no within-participant noise) give σ̃² = 0 and null.
 */
export function momentStart(s: SlopeSums): RelativeG | null {
  const nA = s.group !== null ? s.E.length : 1;
  const g = s.group;
  // Per arm: count, Σb0, Σb1, Σb0², Σb0b1, Σb1²; and Σ C_i⁻¹ over the lines.
  const acc = new Float64Array(6 * nA);
  let ci00 = 0;
  let ci01 = 0;
  let ci11 = 0;
  let lines = 0;
  let between = 0;
  let fitted = 0;
  for (let i = 0; i < s.nP; i++) {
    const n = s.n[i]!;
    const t = s.st[i]!;
    const tt = s.stt[i]!;
    const sy = s.sy[i]!;
    between += (sy * sy) / n;
    const stt = tt - (t * t) / n;
    if (!(n >= 2 && stt > 1e-10 * Math.max(tt, 1e-300))) continue;
    const sty = s.sty[i]! - (t * sy) / n;
    const b1 = sty / stt;
    const b0 = (sy - b1 * t) / n;
    fitted += (sty * sty) / stt;
    const o = g === null ? 0 : 6 * g[i]!;
    acc[o] = acc[o]! + 1;
    acc[o + 1] = acc[o + 1]! + b0;
    acc[o + 2] = acc[o + 2]! + b1;
    acc[o + 3] = acc[o + 3]! + b0 * b0;
    acc[o + 4] = acc[o + 4]! + b0 * b1;
    acc[o + 5] = acc[o + 5]! + b1 * b1;
    // C⁻¹ = [[tt, −t], [−t, n]] / (n · stt).
    const d = n * stt;
    ci00 += tt / d;
    ci01 -= t / d;
    ci11 += n / d;
    lines++;
  }
  const df = s.nObs - s.nP - lines;
  let arms = 0;
  let c00 = 0;
  let c01 = 0;
  let c11 = 0;
  for (let a = 0; a < nA; a++) {
    const o = 6 * a;
    const m = acc[o]!;
    if (m === 0) continue;
    arms++;
    c00 += acc[o + 3]! - (acc[o + 1]! * acc[o + 1]!) / m;
    c01 += acc[o + 4]! - (acc[o + 1]! * acc[o + 2]!) / m;
    c11 += acc[o + 5]! - (acc[o + 2]! * acc[o + 2]!) / m;
  }
  if (lines < 3 || lines - arms < 1 || df < 1) return null;
  const sigma2 = (s.yty - between - fitted) / df;
  if (!(sigma2 > 0) || !Number.isFinite(sigma2)) return null;
  const k = lines - arms;
  const d00 = (c00 / k - (sigma2 * ci00) / lines) / sigma2;
  const d01 = (c01 / k - (sigma2 * ci01) / lines) / sigma2;
  const d11 = (c11 / k - (sigma2 * ci11) / lines) / sigma2;
  if (![d00, d01, d11].every(Number.isFinite)) return null;
  return raiseEigenvalues(d00, d01, d11);
}

/** The symmetric 2 × 2 matrix with its eigenvalues raised to at least 1e-3 of the larger one's size (and 1e-6). */
function raiseEigenvalues(a: number, b: number, c: number): RelativeG {
  const mid = (a + c) / 2;
  const r = Math.hypot((a - c) / 2, b);
  const hi = mid + r;
  const floor = Math.max(1e-3 * Math.abs(hi), 1e-6);
  const l1 = Math.max(hi, floor);
  const l2 = Math.max(mid - r, floor);
  if (l1 === hi && l2 === mid - r) return [a, b, c];
  // Eigenvector of the larger eigenvalue: (b, hi − a) or, when that is zero, (1, 0) or (0, 1).
  let w0 = b;
  let w1 = hi - a;
  const len = Math.hypot(w0, w1);
  if (len > 0) {
    w0 /= len;
    w1 /= len;
  } else if (a >= c) {
    w0 = 1;
    w1 = 0;
  } else {
    w0 = 0;
    w1 = 1;
  }
  return [l1 * w0 * w0 + l2 * w1 * w1, (l1 - l2) * w0 * w1, l1 * w1 * w1 + l2 * w0 * w0];
}
