/**
 * Mergeable statistics for Monte Carlo campaigns: share intervals, moments, fixed-bin histograms
 * and a worst-case list, each with `add` (one value) and `merge` (two partial results), so a
 * campaign can run as K shards on a batch scheduler and be summarised afterwards. Plain data in,
 * plain data out; `statsJson.ts` writes and reads every type as JSON, numbers round-tripping.
 *
 * THE EXACTNESS RULE (why a campaign split into K shards merges to the same bytes as one process):
 * shard files carry only state whose merge is exact — integer counts (histograms, shares, n),
 * exact sums (`ExactMoments`: Σx and Σx² kept as exact binary numbers, exactSum.ts), order
 * statistics (min, max) and a selection under a total order (top-k by score, then case index).
 * Each of these merges associatively and commutatively without rounding, so the state after
 * merging does not depend on where the cuts fell, on the order of the cases inside a shard, or on
 * the order or tree in which shards are merged. Every rounded quantity — mean, variance, quantile
 * estimates, share intervals — is computed once, from the merged state, when the summary is
 * written. (Alternatives considered: Welford/Chan moments per fixed block of case indices would
 * make shard cuts fall on block boundaries or carry raw values for the partial blocks at each cut;
 * exact sums impose nothing on the split.)
 *
 * `Moments` (Welford / Chan–Golub–LeVeque) is the plain streaming form for use inside one process:
 * merging is exact in exact arithmetic and correct to round-off in floating point, but NOT
 * bit-identical under regrouping (see `momentsMerge`).
 *
 * Non-finite inputs are never mixed into sums: moments count them in `nonFinite` and leave them out;
 * histograms put −∞ under, +∞ over and NaN in `invalid`. −0 is stored as +0 everywhere (JSON has
 * no −0, and −0 and +0 would otherwise make min/max depend on order of arrival).
 */
import type { Issue, Result } from '../errors';
import { fail, ok } from '../errors';
import type { ExactSum } from './exactSum';
import { exactAdd, exactAddSquare, exactCanonical, exactMerge, exactZero, ratioToNumber } from './exactSum';

// ---------------------------------------------------------------------------------------------
// Shares with 95 % intervals

/**
 * z = Φ⁻¹(0.975), the two-sided 95 % normal quantile: the double nearest to
 * 1.959963984540054235524594430520551527955550077869548... That value was obtained by Newton's
 * method on Φ(z) = 0.975 in 60-digit decimal arithmetic (Python's decimal module), with
 * Φ(z) = ½(1 + erf(z/√2)), erf from its Maclaurin series and π from Machin's formula.
 * test/reference/stats-intervals.test.ts repeats the computation independently with mathjs
 * BigNumbers and checks this constant against it. (The often-quoted 1.959963984540054 is the
 * neighbouring double, one ulp low; Python's statistics.NormalDist().inv_cdf(0.975) returns
 * 1.9599639845400536, three ulps low.)
 */
export const Z95 = 1.9599639845400543;

export type IntervalMethod = 'wilson' | 'rule-of-three' | 'no-cases';

/** A share k/n with its 95 % interval [low, high]; all in 0…1. */
export interface ShareInterval {
  share: number;
  low: number;
  high: number;
  method: IntervalMethod;
}

function checkCounts(k: number, n: number): void {
  if (!Number.isSafeInteger(k) || !Number.isSafeInteger(n) || k < 0 || n < 0 || k > n)
    throw new RangeError(`share counts must be whole numbers with 0 ≤ k ≤ n (got k = ${k}, n = ${n})`);
}

/**
 * Wilson score interval (E. B. Wilson, "Probable inference, the law of succession, and statistical
 * inference", J. Am. Stat. Assoc. 22(158):209–212, 1927): the p whose score test
 * |k/n − p| ≤ z·√(p(1 − p)/n) accepts, i.e.
 *   centre = (k + z²/2)/(n + z²),  half = z/(n + z²)·√(k(n − k)/n + z²/4).
 * Ends clamped to [0, 1] (and exactly 0 for k = 0, 1 for k = n). n must be ≥ 1.
 */
export function wilsonInterval(k: number, n: number, z: number = Z95): { low: number; high: number } {
  checkCounts(k, n);
  if (n === 0) throw new RangeError('the Wilson interval needs at least one trial');
  const z2 = z * z;
  const centre = (k + z2 / 2) / (n + z2);
  const half = (z / (n + z2)) * Math.sqrt((k * (n - k)) / n + z2 / 4);
  return {
    low: k === 0 ? 0 : Math.max(0, centre - half),
    high: k === n ? 1 : Math.min(1, centre + half),
  };
}

/**
 * The share k/n as reported in every summary, with a 95 % interval:
 * - 0 < k < n: the Wilson score interval (two-sided 95 %, z = Z95);
 * - k = 0: [0, 3/n], the "rule of three" (J. A. Hanley & A. Lippman-Hand, "If nothing goes wrong,
 *   is everything all right? Interpreting zero numerators", JAMA 249(13):1743–1745, 1983): the
 *   exact one-sided 95 % upper bound 1 − 0.05^(1/n) ≈ −ln(0.05)/n = 2.996/n; good from n ≈ 30 on,
 *   conservative by about 0.15 % + 1.5/n relative, and capped at 1 for n < 3;
 * - k = n: the same rule applied to the complement, [1 − 3/n, 1], so the interval of the
 *   complementary share is always the mirror image (both Wilson and this rule are symmetric);
 * - n = 0: share 0 with the uninformative interval [0, 1] (method 'no-cases').
 * (At k = 0 the Wilson interval would give z²/(n + z²) = 0.0370 for n = 100, a one-sided 97.5 %
 * bound; the issue asks for 3/n.)
 */
export function shareInterval(k: number, n: number): ShareInterval {
  checkCounts(k, n);
  if (n === 0) return { share: 0, low: 0, high: 1, method: 'no-cases' };
  if (k === 0) return { share: 0, low: 0, high: Math.min(1, 3 / n), method: 'rule-of-three' };
  if (k === n) return { share: 1, low: Math.max(0, 1 - 3 / n), high: 1, method: 'rule-of-three' };
  const w = wilsonInterval(k, n);
  return { share: k / n, low: w.low, high: w.high, method: 'wilson' };
}

// ---------------------------------------------------------------------------------------------
// Moments: streaming (Welford / Chan et al.) and exact

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

// ---------------------------------------------------------------------------------------------
// Fixed-bin histograms

/**
 * Counts over declared bin edges (strictly increasing, finite): bin k holds [edges[k],
 * edges[k + 1]); the last bin is closed at its top edge. Below the first edge → `underflow`
 * (including −∞), above the last → `overflow` (including +∞), NaN → `invalid`. Counts are
 * integers, so merging is exact.
 */
export interface Histogram {
  edges: number[];
  counts: number[];
  underflow: number;
  overflow: number;
  invalid: number;
}

/** `bins` equal bins over [lo, hi]: edges lo + (hi − lo)·k/bins, the last exactly hi. */
export function uniformEdges(lo: number, hi: number, bins: number): number[] {
  const edges = Array.from({ length: bins + 1 }, (_, k) => lo + ((hi - lo) * k) / bins);
  edges[bins] = hi;
  return edges;
}

/** Problems with a list of edges (empty when fine). */
export function edgeIssues(edges: readonly number[], path = 'edges'): Issue[] {
  const out: Issue[] = [];
  if (edges.length < 2) out.push({ path, rule: 'min-length', message: `${path} needs at least two edges (one bin)` });
  edges.forEach((x, k) => {
    if (typeof x !== 'number' || !Number.isFinite(x))
      out.push({ path: `${path}[${k}]`, rule: 'finite', message: `${path}[${k}] must be a finite number` });
    else if (k > 0 && !(x > edges[k - 1]!))
      out.push({ path: `${path}[${k}]`, rule: 'increasing', message: `${path} must be strictly increasing (edge ${k} is ${x})` });
  });
  return out;
}

export function histogramCreate(edges: readonly number[]): Result<Histogram> {
  const bad = edgeIssues(edges);
  if (bad.length) return fail(bad);
  return ok({ edges: edges.map((x) => x + 0), counts: new Array<number>(edges.length - 1).fill(0), underflow: 0, overflow: 0, invalid: 0 });
}

/** Count one value; in place, returns h. */
export function histogramAdd(h: Histogram, x: number): Histogram {
  const e = h.edges;
  const last = e.length - 1;
  if (Number.isNaN(x)) h.invalid++;
  else if (x < e[0]!) h.underflow++;
  else if (x > e[last]!) h.overflow++;
  else {
    // Largest k with e[k] ≤ x, within 0…last − 1 (x = e[last] falls in the last bin).
    let lo = 0,
      hi = last - 1;
    while (lo < hi) {
      const mid = (lo + hi + 1) >>> 1;
      if (e[mid]! <= x) lo = mid;
      else hi = mid - 1;
    }
    h.counts[lo]!++;
  }
  return h;
}

function sameEdges(a: readonly number[], b: readonly number[]): boolean {
  return a.length === b.length && a.every((x, k) => x === b[k]);
}

/** a ∪ b as a new histogram; the edges must be identical. */
export function histogramMerge(a: Histogram, b: Histogram): Result<Histogram> {
  if (!sameEdges(a.edges, b.edges))
    return fail([{ path: 'edges', rule: 'same-bins', message: 'histograms with different bin edges cannot be merged' }]);
  return ok({
    edges: [...a.edges],
    counts: a.counts.map((c, k) => c + b.counts[k]!),
    underflow: a.underflow + b.underflow,
    overflow: a.overflow + b.overflow,
    invalid: a.invalid + b.invalid,
  });
}

/** Values counted in range or beyond it (NaN excluded). */
export function histogramTotal(h: Histogram): number {
  return h.counts.reduce((s, c) => s + c, h.underflow + h.overflow);
}

export interface HistogramQuantile {
  p: number;
  /** Nearest rank: the r-th smallest value, r = max(1, ⌈p·total⌉). */
  rank: number;
  total: number;
  where: 'below' | 'in-range' | 'above';
  /** The bin holding the ranked value: it lies in [low, high]; null beyond the edges. */
  low: number | null;
  high: number | null;
  /** Inside a bin: low + (high − low)·(j − ½)/c for the j-th of the bin's c values; null beyond the edges. */
  estimate: number | null;
  /** high − low: the estimate is within this of the true nearest-rank quantile; null beyond the edges. */
  resolution: number | null;
}

/**
 * The nearest-rank p-quantile (R. J. Hyndman & Y. Fan, "Sample quantiles in statistical packages",
 * Am. Stat. 50(4):361–365, 1996, definition 1: the inverse of the empirical distribution
 * function), located to its bin. Deterministic; null when the histogram is empty. p in [0, 1].
 */
export function histogramQuantile(h: Histogram, p: number): HistogramQuantile | null {
  if (!(p >= 0 && p <= 1)) throw new RangeError(`quantile level must be in [0, 1] (got ${p})`);
  const total = histogramTotal(h);
  if (total === 0) return null;
  const rank = Math.max(1, Math.ceil(p * total));
  const beyond = (where: 'below' | 'above') => ({ p, rank, total, where, low: null, high: null, estimate: null, resolution: null });
  if (rank <= h.underflow) return beyond('below');
  let before = h.underflow;
  for (let k = 0; k < h.counts.length; k++) {
    const c = h.counts[k]!;
    if (rank <= before + c) {
      const low = h.edges[k]!,
        high = h.edges[k + 1]!;
      const j = rank - before;
      return { p, rank, total, where: 'in-range', low, high, estimate: low + ((high - low) * (j - 0.5)) / c, resolution: high - low };
    }
    before += c;
  }
  return beyond('above');
}

// ---------------------------------------------------------------------------------------------
// Worst cases: a bounded, mergeable top-k

/** One candidate: its case index (`key`, a whole number ≥ 0), its score (higher = worse) and data. */
export interface TopItem<P = unknown> {
  key: number;
  score: number;
  payload: P;
}

/**
 * The k highest-scoring items, sorted by score descending, then key ascending (a total order on
 * distinct keys, so the list is unique whatever the order of arrival). At most k items are kept.
 * Scores may be ±∞; NaN scores are refused at `topKAdd`.
 */
export interface TopK<P = unknown> {
  k: number;
  items: TopItem<P>[];
}

export function topKCreate<P = unknown>(k: number): TopK<P> {
  if (!Number.isSafeInteger(k) || k < 1) throw new RangeError(`top-k needs k ≥ 1 (got ${k})`);
  return { k, items: [] };
}

/** True when a ranks before b. */
function topBefore(a: TopItem<unknown>, b: TopItem<unknown>): boolean {
  return a.score > b.score || (a.score === b.score && a.key < b.key);
}

/**
 * Offer one item; returns true when it was kept. O(log k) to find its place, O(k) to insert; an
 * item below a full list is rejected in O(1). Keys must be unique (one entry per case).
 */
export function topKAdd<P>(t: TopK<P>, item: TopItem<P>): boolean {
  if (Number.isNaN(item.score)) throw new RangeError(`top-k score of case ${item.key} is NaN`);
  if (!Number.isSafeInteger(item.key) || item.key < 0) throw new RangeError(`top-k key must be a whole number ≥ 0 (got ${item.key})`);
  const it = { key: item.key, score: item.score + 0, payload: item.payload };
  const xs = t.items;
  if (xs.length === t.k && !topBefore(it, xs[xs.length - 1]!)) return false;
  let lo = 0,
    hi = xs.length;
  while (lo < hi) {
    const mid = (lo + hi) >>> 1;
    if (topBefore(xs[mid]!, it)) lo = mid + 1;
    else hi = mid;
  }
  xs.splice(lo, 0, it);
  if (xs.length > t.k) xs.pop();
  return true;
}

/**
 * Top-k of a ∪ b (a new list sharing the payload objects). Exact: equals the top-k of all the
 * items ever offered to a and b, as long as every key was offered to one side only. k must match;
 * a key kept on both sides is refused (a case counted twice; a key that one side already dropped
 * cannot be seen here: checking case coverage is the caller's job).
 */
export function topKMerge<P>(a: TopK<P>, b: TopK<P>): Result<TopK<P>> {
  if (a.k !== b.k) return fail([{ path: 'k', rule: 'same-k', message: `top-k lists of different k (${a.k}, ${b.k}) cannot be merged` }]);
  const keys = new Set(a.items.map((x) => x.key));
  const twice = b.items.find((x) => keys.has(x.key));
  if (twice)
    return fail([{ path: 'items', rule: 'unique-key', message: `case ${twice.key} appears in both top-k lists (counted twice?)` }]);
  const out: TopItem<P>[] = [];
  let i = 0,
    j = 0;
  while (out.length < a.k && (i < a.items.length || j < b.items.length)) {
    const x = a.items[i],
      y = b.items[j];
    if (y === undefined || (x !== undefined && topBefore(x, y))) {
      out.push(x!);
      i++;
    } else {
      out.push(y);
      j++;
    }
  }
  return ok({ k: a.k, items: out });
}
