/**
 * Stepping through a run's samples and jumps, and reading the hybrid time (t, j) at a playback
 * time. Pure functions over the trace arrays, so the scrubber and tests share them.
 */

/** Index of the last sample with t[k] ≤ time (0 when time is before the first sample). */
export function sampleIndexAt(t: ArrayLike<number>, n: number, time: number): number {
  if (n <= 0) return -1;
  if (!(time >= t[0]!)) return 0;
  let lo = 0;
  let hi = n - 1;
  while (lo < hi) {
    const mid = (lo + hi + 1) >> 1;
    if (t[mid]! <= time) lo = mid;
    else hi = mid - 1;
  }
  return lo;
}

/** Time of the neighbouring sample (direction +1 or −1), clamped to the run. */
export function stepSample(t: ArrayLike<number>, n: number, time: number, direction: 1 | -1): number {
  if (n <= 0) return time;
  const k = sampleIndexAt(t, n, time);
  if (direction > 0) {
    // A time between samples steps to the next sample, not two ahead.
    const next = t[k]! > time ? k : k + 1;
    return t[Math.min(n - 1, next)]!;
  }
  const prev = t[k]! < time ? k : k - 1;
  return t[Math.max(0, prev)]!;
}

/** Time of the next (or previous) jump strictly after (before) `time`; null when there is none. */
export function stepJump(jumpTimes: readonly number[], time: number, direction: 1 | -1): number | null {
  // A tolerance so that stepping from a jump lands on the next one, not the same.
  const eps = 1e-9 * Math.max(1, Math.abs(time));
  if (direction > 0) {
    for (const tj of jumpTimes) if (tj > time + eps) return tj;
    return null;
  }
  for (let i = jumpTimes.length - 1; i >= 0; i--) if (jumpTimes[i]! < time - eps) return jumpTimes[i]!;
  return null;
}
