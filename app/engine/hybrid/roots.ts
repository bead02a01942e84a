/**
 * Bracketed root finding for event location on a step's dense output.
 *
 * `locateCrossing` is the Illinois variant of regula falsi (Dowell & Jarratt, "A modified regula
 * falsi method for computing the root of an equation", BIT 11:168–174, 1971): the secant through
 * the bracket ends, halving the stale end's value when the same end is kept twice, which gives
 * superlinear convergence; trial points stay tol/2 inside the bracket so that it collapses once
 * one end has converged, and a bisection is forced whenever three iterations failed to halve the
 * bracket, so the worst case is a small multiple of bisection's. It keeps g(a) < 0 ≤ g(b) and returns b, the point
 * inside the jump set D = {g ≥ 0}, once b − a ≤ tol.
 */

export interface RootResult {
  /** Located time (g ≥ 0 there), or NaN when g was not finite somewhere. */
  t: number;
  /** g at t. */
  g: number;
  iterations: number;
}

/** Result object reused between calls (no allocation per event). Copy what you need. */
const res: RootResult = { t: NaN, g: NaN, iterations: 0 };

export function locateCrossing(
  g: (t: number) => number,
  a: number,
  ga: number,
  b: number,
  gb: number,
  tol: number,
  maxIter = 200,
): RootResult {
  let iter = 0;
  let side = 0;
  // Bracket widths 1, 2 and 3 iterations back: bisect when three iterations did not halve it.
  let w1 = Infinity,
    w2 = Infinity,
    w3 = Infinity;
  const half = 0.5 * tol;
  while (b - a > tol && iter < maxIter) {
    const width = b - a;
    let c: number;
    if (width > 0.5 * w3) {
      c = a + 0.5 * width;
    } else {
      c = b - (gb * width) / (gb - ga);
      // Keep the trial at least tol/2 inside the bracket: once one end has converged this puts
      // the next point just across the root, and the bracket collapses to within tol.
      if (!(c > a + half)) c = a + half;
      else if (!(c < b - half)) c = b - half;
    }
    w3 = w2;
    w2 = w1;
    w1 = width;
    const gc = g(c);
    iter++;
    if (!Number.isFinite(gc)) {
      res.t = NaN;
      res.g = gc;
      res.iterations = iter;
      return res;
    }
    if (gc >= 0) {
      b = c;
      gb = gc;
      if (side === 1) ga *= 0.5;
      side = 1;
    } else {
      a = c;
      ga = gc;
      if (side === -1) gb *= 0.5;
      side = -1;
    }
  }
  res.t = b;
  res.g = gb;
  res.iterations = iter;
  return res;
}

/**
 * Bisection for the first time a predicate turns false: `holds(a)` is true, `holds(b)` false;
 * returns a time t with holds(t) false and a true point within tol before it.
 */
export function locateExit(
  holds: (t: number) => boolean,
  a: number,
  b: number,
  tol: number,
  maxIter = 200,
): { t: number; iterations: number } {
  let iter = 0;
  while (b - a > tol && iter < maxIter) {
    const c = a + 0.5 * (b - a);
    if (holds(c)) a = c;
    else b = c;
    iter++;
  }
  return { t: b, iterations: iter };
}
