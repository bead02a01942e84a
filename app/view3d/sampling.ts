/**
 * Reading a run at an arbitrary time: find the bracketing samples and interpolate. The trace's
 * time axis is non-decreasing; in ideal continuous mode a located jump appears as two samples at
 * the same t (before and after). `locateSample` returns the LAST sample with t_i ≤ time, so at a
 * jump instant the post-jump sample wins, and t_{i+1} > time strictly, so alpha never divides by 0.
 */

export interface SampleCursor {
  /** Index of the last sample with t_i ≤ time (clamped to [0, n−1]); −1 for an empty run. */
  i: number;
  /** Index of the next sample (i+1, or i at the end). */
  i1: number;
  /** Fraction of the way from sample i to i1, in [0, 1). */
  alpha: number;
}

export function createCursor(): SampleCursor {
  return { i: -1, i1: -1, alpha: 0 };
}

/**
 * Locate `time` in `t[0..n)`. `cursor.i` from the previous call is used as a hint: scrubbing and
 * playback move a few samples at a time, so the common case is O(1); otherwise binary search.
 * Non-finite or early times clamp to the first sample, late times to the last.
 */
export function locateSample(t: ArrayLike<number>, n: number, time: number, cursor: SampleCursor): SampleCursor {
  if (n <= 0) {
    cursor.i = cursor.i1 = -1;
    cursor.alpha = 0;
    return cursor;
  }
  // Before the start, or NaN: the first sample.
  if (!(time >= t[0]!)) return setCursor(cursor, 0, n, 0);
  if (time >= t[n - 1]!) return setCursor(cursor, n - 1, n, 0);
  let i = cursor.i;
  if (!(i >= 0 && i < n - 1 && t[i]! <= time && t[i + 1]! > time)) {
    if (i >= 0 && i + 2 < n && t[i + 1]! <= time && t[i + 2]! > time) {
      i = i + 1;
    } else {
      // Largest i with t[i] ≤ time; invariant t[lo] ≤ time < t[hi].
      let lo = 0,
        hi = n - 1;
      while (hi - lo > 1) {
        const mid = (lo + hi) >> 1;
        if (t[mid]! <= time) lo = mid;
        else hi = mid;
      }
      i = lo;
    }
  }
  return setCursor(cursor, i, n, (time - t[i]!) / (t[i + 1]! - t[i]!));
}

function setCursor(c: SampleCursor, i: number, n: number, alpha: number): SampleCursor {
  c.i = i;
  c.i1 = i + 1 < n ? i + 1 : i;
  c.alpha = c.i1 === i ? 0 : alpha;
  return c;
}

/**
 * Linear interpolation of a sample-major channel with `stride` values per sample:
 * out[oo + k] = (1−α) a[stride·i + k] + α a[stride·i1 + k], k < stride.
 */
export function lerpChannel(out: { [i: number]: number }, oo: number, a: ArrayLike<number>, stride: number, c: SampleCursor): void {
  const b0 = stride * c.i,
    b1 = stride * c.i1,
    al = c.alpha,
    be = 1 - al;
  for (let k = 0; k < stride; k++) out[oo + k] = be * a[b0 + k]! + al * a[b1 + k]!;
}

/** Number of entries of a time-sorted list with `.t ≤ time` (binary search). */
export function countUpTo(times: ArrayLike<number>, m: number, time: number): number {
  let lo = 0,
    hi = m;
  while (lo < hi) {
    const mid = (lo + hi) >> 1;
    if (times[mid]! <= time) lo = mid + 1;
    else hi = mid;
  }
  return lo;
}
