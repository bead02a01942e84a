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
 * bit-identical under regrouping (see `momentsMerge`). `PairwiseMoments` (statsPairwise.ts) makes
 * it so: the same pairwise update applied over a fixed binary tree of case indices, so every
 * partial result is a function of the cases it covers, never of the split — the form the study
 * summaries use (a shard carries O(log n) partial blocks).
 *
 * Non-finite inputs are never mixed into sums: moments count them in `nonFinite` and leave them out;
 * histograms put −∞ under, +∞ over and NaN in `invalid`. −0 is stored as +0 everywhere (JSON has
 * no −0, and −0 and +0 would otherwise make min/max depend on order of arrival).
 *
 * Shares are here; moments, histograms and the top-k live in statsMoments.ts, statsHistogram.ts
 * and statsTopK.ts and are re-exported, so this stays the one module to import.
 */
export * from './statsMoments';
export * from './statsHistogram';
export * from './statsTopK';
export * from './statsPairwise';

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

/**
 * A share as the study summaries report it (CLI, app, summary.json): the count, the share, the
 * two-sided 95 % Wilson score interval (`wilsonInterval`) always, and — when nothing happened —
 * the rule-of-three bound beside it, so "0 of n" is read for what it proves: with 0 events in n
 * independent cases the event probability is below 3/n at 95 % confidence (one-sided; Hanley &
 * Lippman-Hand 1983, see `shareInterval`). The Wilson upper end at 0 events, z²/(n + z²) ≈ 3.84/n,
 * is the one-sided 97.5 % bound; both are given and named.
 */
export interface ShareReport {
  count: number;
  of: number;
  /** count/of, 0 when of = 0. */
  share: number;
  /** Wilson score interval, 95 % two-sided; [0, 1] when of = 0. */
  low: number;
  high: number;
  /** min(1, 3/of) when count = 0 < of (rule of three, one-sided 95 %); null otherwise. */
  ruleOfThreeHigh: number | null;
}

export function shareReport(count: number, of: number): ShareReport {
  checkCounts(count, of);
  if (of === 0) return { count, of, share: 0, low: 0, high: 1, ruleOfThreeHigh: null };
  const w = wilsonInterval(count, of);
  return { count, of, share: count / of, low: w.low, high: w.high, ruleOfThreeHigh: count === 0 ? Math.min(1, 3 / of) : null };
}
