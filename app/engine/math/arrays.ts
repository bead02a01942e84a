/**
 * Whole-array checks shared by the integrators, the closed loops and the validators.
 */

/** True when every element of x is a finite number (no NaN, no ±Infinity); true for an empty array. */
export function allFinite(x: ArrayLike<number>): boolean {
  for (let i = 0; i < x.length; i++) if (!Number.isFinite(x[i])) return false;
  return true;
}
