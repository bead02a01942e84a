/**
 * √(a² + b² + c²) without overflow or underflow, written out: the closed loop forms it at every
 * sample (the error angle, the sensor noise rotation) and the planner's envelope scans at every
 * point of a profile (plan/loads.ts, wheels/envelope.ts), where the built-in Math.hypot is a
 * variadic call that cannot be inlined and allocates for its arguments.
 *
 * Method: scale by the largest magnitude m, sum the squares of the scaled values with Kahan's
 * compensated summation (Kahan, "Further remarks on reducing truncation errors", CACM 8(1):40,
 * 1965), and return m·√sum; non-finite inputs as ECMAScript's Math.hypot (ECMA-262 §21.3.2.18:
 * any ±∞ gives +∞, else any NaN gives NaN, all zeros give +0). The operations and their order are
 * those of V8's Math.hypot (node 20, Electron), so the value is the same double, bit for bit —
 * test/unit/hypot.test.ts checks that against the built-in over millions of inputs; the engine's
 * pinned exports (test/reference/export-pins.test.ts) depend on it.
 */
export function hypot3(a: number, b: number, c: number): number {
  const x = Math.abs(a),
    y = Math.abs(b),
    z = Math.abs(c);
  let m = x > y ? x : y;
  if (z > m) m = z;
  if (m === Infinity || x === Infinity || y === Infinity || z === Infinity) return Infinity;
  // NaN compares false: a NaN input is caught here (after ±∞, as the standard orders them).
  if (!(x === x && y === y && z === z)) return NaN;
  if (m === 0) return 0;
  let sum = 0,
    comp = 0;
  let n = x / m;
  let s = n * n - comp;
  let p = sum + s;
  comp = p - sum - s;
  sum = p;
  n = y / m;
  s = n * n - comp;
  p = sum + s;
  comp = p - sum - s;
  sum = p;
  n = z / m;
  s = n * n - comp;
  p = sum + s;
  sum = p;
  return Math.sqrt(sum) * m;
}
