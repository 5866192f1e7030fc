/**
 * Decimal rounding on the number's decimal digits rather than on its binary value, the way a spreadsheet shows a
 * number under a fixed-decimal format code: the value is first read to 15 significant digits (a double holds 15 decimal
 * digits faithfully, IEEE 754-2008 §5.12.2), then rounded half away from zero at the wanted place. So 1.005 shows as
 * "1.01" with two decimals (its binary value is 1.00499999999999989…, which `toFixed(2)` rounds to "1.00").
 * That spreadsheets round the displayed 15-digit value half away from zero is from memory.
 */

/** The 15 significant digits of |x| and the power of ten of the first one: 1234.5 → { digits: "123450000000000", exponent: 3 }. */
function digitsOf(x: number): { digits: string; exponent: number } {
  const [mantissa, exp] = Math.abs(x).toExponential(14).split('e');
  return { digits: (mantissa ?? '0').replace('.', ''), exponent: Number(exp) };
}

/** Adds one to a string of decimal digits ("0999" → "1000", "99" → "100"). */
function increment(digits: string): string {
  const out = digits.split('');
  for (let i = out.length - 1; i >= 0; i--) {
    if (out[i] !== '9') {
      out[i] = String(Number(out[i]) + 1);
      return out.join('');
    }
    out[i] = '0';
  }
  return `1${out.join('')}`;
}

/**
 * |x| rounded half away from zero to `decimals` places, as the digit string of |x| × 10^decimals without leading zeros
 * ("0" for zero). O(digits). Example: scaledDigits(1.005, 2) → "101"; scaledDigits(0.0004, 2) → "0".
 */
function scaledDigits(x: number, decimals: number): string {
  if (x === 0) return '0';
  const { digits, exponent } = digitsOf(x);
  const keep = exponent + 1 + decimals; // digits of `digits` that stand at or before the last kept place
  if (keep < 0) return '0';
  if (keep >= digits.length) return (digits + '0'.repeat(keep - digits.length)).replace(/^0+(?=\d)/, '');
  const head = digits.slice(0, keep);
  const up = (digits[keep] ?? '0') >= '5';
  const rounded = up ? increment(head === '' ? '0' : head) : head === '' ? '0' : head;
  return rounded.replace(/^0+(?=\d)/, '');
}

/**
 * x with exactly `decimals` decimals (0 to 100), rounded half away from zero on its 15-significant-digit decimal
 * value; a result that rounds to zero has no minus sign; non-finite x gives "". Cost O(decimals + 15).
 * Examples: fixedText(1.005, 2) → "1.01"; fixedText(-0.0004, 2) → "0.00"; fixedText(0.00062, 7) → "0.0006200";
 * fixedText(2.5, 0) → "3"; fixedText(-2.5, 0) → "-3".
 */
export function fixedText(x: number, decimals: number): string {
  if (!Number.isFinite(x)) return '';
  const d = Math.max(0, Math.min(100, Math.trunc(decimals)));
  const scaled = scaledDigits(x, d);
  const padded = scaled.padStart(d + 1, '0');
  const whole = padded.slice(0, padded.length - d);
  const text = d === 0 ? whole : `${whole}.${padded.slice(padded.length - d)}`;
  return x < 0 && /[1-9]/.test(scaled) ? `-${text}` : text;
}

/**
 * The power of ten of the first significant digit of x once x is rounded to `significant` digits (the carry of
 * 9.9996 → 10.00 counted): exponentAfterRounding(9.9996, 4) → 1; exponentAfterRounding(0.00062, 4) → -4. x ≠ 0, finite.
 */
export function exponentAfterRounding(x: number, significant: number): number {
  const { exponent } = digitsOf(x);
  const scaled = scaledDigits(x, significant - 1 - exponent);
  return scaled.length > significant ? exponent + 1 : exponent;
}

/**
 * |x| rounded half away from zero to `significant` digits: the digits and the power of ten of the first.
 * Example: significantDigits(-0.000000123456, 4) → { digits: "1235", exponent: -7 }; significantDigits(9.9996, 4) →
 * { digits: "1000", exponent: 1 }. x ≠ 0, finite.
 */
export function significantDigits(x: number, significant: number): { digits: string; exponent: number } {
  const exponent = exponentAfterRounding(x, significant);
  const digits = scaledDigits(x, significant - 1 - exponent);
  return { digits: digits.slice(0, significant).padEnd(significant, '0'), exponent };
}
