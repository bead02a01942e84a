/**
 * Rounding DOWN to the digits shown, for bounds a user may type back: the certified gap δ* is an
 * upper bound on the jump threshold δ (δ < δ* is required), so printing it rounded to nearest can
 * show a value that is itself refused (δ* = 0.031249… printed as 0.03125). Printed this way, the
 * number shown is never above the true value (with `strict`, always below it).
 */

/** One unit less in the last of `d` significant digits of the decimal "m.mmm e±x" (exact, on digit strings). */
function stepDown(expText: string, d: number): string {
  const [mant, e] = expText.split('e') as [string, string];
  const negative = mant.startsWith('-');
  let digits = BigInt(mant.replace(/[-.]/g, ''));
  let exp = Number(e);
  // Going down in value: a negative number grows in magnitude.
  digits = negative ? digits + 1n : digits - 1n;
  let text = digits.toString();
  if (text.length > d) {
    // −9.999 → −10.00: one more digit of exponent.
    text = text.slice(0, d);
    exp += 1;
  } else if (digits < 10n ** BigInt(d - 1)) {
    // 1.000 → 0.999…: the largest d-digit decimal below is 9.99…9 one exponent lower.
    text = '9'.repeat(d);
    exp -= 1;
  }
  return `${negative ? '-' : ''}${text[0]}${d > 1 ? `.${text.slice(1)}` : ''}e${exp}`;
}

/**
 * `v` rounded toward −∞ to `digits` significant digits, as text in the app's number style. With
 * `strict`, the printed value is also strictly below `v` (one unit lower when `v` is exactly a
 * `digits`-digit decimal), so it can be typed back where "< v" is required.
 */
export function fmtFloor(v: number, digits = 4, strict = false): string {
  if (!Number.isFinite(v)) return '—';
  if (v === 0 && !strict) return '0';
  const d = Math.max(1, Math.min(15, Math.floor(digits)));
  let s = v.toExponential(d - 1);
  // toExponential rounds to nearest; step down while the printed value is not below v.
  for (let guard = 0; guard < 3 && (Number(s) > v || (strict && Number(s) >= v)); guard++) s = stepDown(Number(s).toExponential(d - 1), d);
  const n = Number(s);
  if (n === 0) return '0';
  const a = Math.abs(n);
  return a >= 1e6 || a < 1e-3 ? n.toExponential(d - 1) : String(n);
}
