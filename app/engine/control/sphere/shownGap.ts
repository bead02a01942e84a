/**
 * The certified gap as shown to a user: δ* less its numerical error bound, rounded DOWN to the
 * digits printed, so that every δ below the printed number is admissible (a rounded-up figure
 * could name a δ the certificate refuses). Used by `slewsmith certify` and the app's badge.
 */

/** floor((δ* − tol)·10^digits)/10^digits, as text with `digits` decimals (never negative). */
export function gapShownDown(deltaStar: number, tolerance: number, digits: number): string {
  const s = 10 ** digits;
  const lower = Math.max(0, deltaStar - Math.max(0, tolerance));
  return (Math.floor(lower * s) / s).toFixed(digits);
}
