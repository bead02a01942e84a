/**
 * Printing an upper bound so that the printed number is still below it: a certified gap δ* admits
 * 0 < δ < δ*, so a δ* of 0.031249… must not print as 0.03125 (which a user would then type and
 * have refused). `decimalsBelow(x, d)` is the largest number with d decimals strictly below x, as
 * text; rounding to nearest would print x itself or a value above it.
 */
export function decimalsBelow(x: number, decimals: number): string {
  if (!Number.isFinite(x)) return String(x);
  const scale = 10 ** decimals;
  let k = Math.ceil(x * scale) - 1;
  // x·scale is rounded; step down while the printed value is not strictly below x.
  while (k / scale >= x) k--;
  while ((k + 1) / scale < x) k++;
  return (k / scale).toFixed(decimals);
}
