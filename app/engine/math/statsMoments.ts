/**
 * Moments of the finite values of a campaign channel, part of the mergeable statistics of stats.ts
 * (its header states the exactness rule): `Moments` streams in one process (Welford; merged by
 * Chan–Golub–LeVeque, correct to round-off), `ExactMoments` keeps exact sums (exactSum.ts) so
 * that shards merge to the same bits in any split and order. Non-finite values are counted, not
 * summed; −0 is stored as +0.
 */
import type { ExactSum } from './exactSum';
import { exactAdd, exactAddSquare, exactCanonical, exactMerge, exactZero, ratioToNumber } from './exactSum';

/** Count, mean and M2 = Σ(x − mean)² of the finite values seen; min/max null when n = 0. */
export interface Moments {
  n: number;
  mean: number;
  m2: number;
  min: number | null;
  max: number | null;
  /** Non-finite values offered and left out. */
  nonFinite: number;
}

export function momentsEmpty(): Moments {
  return { n: 0, mean: 0, m2: 0, min: null, max: null, nonFinite: 0 };
}

/**
 * Add one value (B. P. Welford, "Note on a method for calculating corrected sums of squares and
 * products", Technometrics 4(3):419–420, 1962): δ = x − mean; mean += δ/n; M2 += δ·(x − mean).
 * In place; returns m.
 */
export function momentsAdd(m: Moments, x: number): Moments {
  if (!Number.isFinite(x)) {
    m.nonFinite++;
    return m;
  }
  const v = x + 0; // −0 → +0
  m.n++;
  const d = v - m.mean;
  m.mean += d / m.n;
  m.m2 += d * (v - m.mean);
  m.min = m.min === null ? v : Math.min(m.min, v);
  m.max = m.max === null ? v : Math.max(m.max, v);
  return m;
}

/** Canonical operand order, so that merge(a, b) and merge(b, a) compute the same thing. */
function momentsBefore(a: Moments, b: Moments): boolean {
  if (a.n !== b.n) return a.n > b.n;
  if (a.mean !== b.mean) return a.mean < b.mean;
  return a.m2 <= b.m2;
}

/**
 * out = a ∪ b (out may alias a or b), by the pairwise update of T. F. Chan, G. H. Golub and
 * R. J. LeVeque ("Updating formulae and a pairwise algorithm for computing sample variances",
 * Stanford CS report STAN-CS-79-773, 1979; "Algorithms for computing the sample variance: analysis
 * and recommendations", Am. Stat. 37(3):242–247, 1983), eq. (2.1):
 *   n = nA + nB,  δ = mean_B − mean_A,  mean = mean_A + δ·nB/n,  M2 = M2_A + M2_B + δ²·nA·nB/n.
 * What is bit-identical: n, min, max and nonFinite always; merge(a, b) and merge(b, a) (operands
 * are put in a canonical order first). What is not: regrouping — (a ∪ b) ∪ c and a ∪ (b ∪ c)
 * differ in mean and M2 by round-off (relative error of order n·ε at worst, typically far less).
 * Use `ExactMoments` where bits must not depend on the split.
 */
export function momentsMerge(out: Moments, a: Moments, b: Moments): Moments {
  const [p, q] = momentsBefore(a, b) ? [a, b] : [b, a];
  const pn = p.n,
    pMean = p.mean,
    pM2 = p.m2,
    qn = q.n,
    qMean = q.mean,
    qM2 = q.m2;
  const min = p.min === null ? q.min : q.min === null ? p.min : Math.min(p.min, q.min);
  const max = p.max === null ? q.max : q.max === null ? p.max : Math.max(p.max, q.max);
  const nonFinite = p.nonFinite + q.nonFinite;
  const n = pn + qn;
  out.n = n;
  out.min = min;
  out.max = max;
  out.nonFinite = nonFinite;
  if (qn === 0) {
    out.mean = pMean;
    out.m2 = pM2;
  } else {
    const d = qMean - pMean;
    out.mean = pMean + (d * qn) / n + 0;
    out.m2 = pM2 + qM2 + (d * d * pn * qn) / n;
  }
  return out;
}

/** Sample variance M2/(n − 1); null for n < 2. */
export function momentsVariance(m: Moments): number | null {
  return m.n < 2 ? null : m.m2 / (m.n - 1);
}

/**
 * Moments kept as exact sums Σx and Σx² (exactSum.ts): merging is exact addition, so the state —
 * and everything computed from it — is bit-identical for any split and merge order.
 */
export interface ExactMoments {
  n: number;
  sum: ExactSum;
  sumSq: ExactSum;
  min: number | null;
  max: number | null;
  nonFinite: number;
}

export function exactMomentsEmpty(): ExactMoments {
  return { n: 0, sum: exactZero(), sumSq: exactZero(), min: null, max: null, nonFinite: 0 };
}

/** Add one value, exactly; in place, returns e. */
export function exactMomentsAdd(e: ExactMoments, x: number): ExactMoments {
  if (!Number.isFinite(x)) {
    e.nonFinite++;
    return e;
  }
  const v = x + 0;
  e.n++;
  exactAdd(e.sum, v);
  exactAddSquare(e.sumSq, v);
  e.min = e.min === null ? v : Math.min(e.min, v);
  e.max = e.max === null ? v : Math.max(e.max, v);
  return e;
}

/** out = a ∪ b, exactly (out may alias a or b; otherwise out shares nothing with them). */
export function exactMomentsMerge(out: ExactMoments, a: ExactMoments, b: ExactMoments): ExactMoments {
  const min = a.min === null ? b.min : b.min === null ? a.min : Math.min(a.min, b.min);
  const max = a.max === null ? b.max : b.max === null ? a.max : Math.max(a.max, b.max);
  const n = a.n + b.n,
    nonFinite = a.nonFinite + b.nonFinite;
  const sum = exactMerge(exactZero(), a.sum, b.sum);
  const sumSq = exactMerge(exactZero(), a.sumSq, b.sumSq);
  out.n = n;
  out.sum = sum;
  out.sumSq = sumSq;
  out.min = min;
  out.max = max;
  out.nonFinite = nonFinite;
  return out;
}

/**
 * The moments of the exact state, each rounded once: mean = Σx/n and
 * M2 = (n·Σx² − (Σx)²)/n, evaluated in exact integer arithmetic before the one rounding (so
 * there is no cancellation, unlike the textbook one-pass formula in floating point). A pure
 * function of the state: identical bits for identical states.
 */
export function exactMomentsToMoments(e: ExactMoments): Moments {
  if (e.n === 0) return { n: 0, mean: 0, m2: 0, min: null, max: null, nonFinite: e.nonFinite };
  const n = BigInt(e.n);
  // Canonical forms, so the result is a function of the values alone (not of how they were built).
  const { m: sm, e: se } = exactCanonical(e.sum);
  const { m: qm, e: qe } = exactCanonical(e.sumSq);
  // n·Q·2^qe − S²·2^(2·se), over the common exponent.
  const base = qm === 0n ? 2 * se : Math.min(qe, 2 * se);
  const a = qm === 0n ? 0n : (n * qm) << BigInt(qe - base);
  const b = (sm * sm) << BigInt(2 * se - base);
  const num = a - b;
  return {
    n: e.n,
    mean: ratioToNumber(sm, se, n) + 0,
    m2: num <= 0n ? 0 : ratioToNumber(num, base, n),
    min: e.min,
    max: e.max,
    nonFinite: e.nonFinite,
  };
}
