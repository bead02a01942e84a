/**
 * Which samples of a long run a DISPLAY trace keeps (pipeline/displayTrace.ts makes the trace):
 * a subset, copied bit for bit, that plots, the 3D view and the sky view draw like a full trace.
 *
 * Kept, with `stride` k (our own choice, no source; the rule is what lets a plot of the subset show
 * what a plot of every sample shows at screen resolution):
 *  - the first and the last sample, and every k-th sample (0, k, 2k, …): the regular grid;
 *  - in each bucket [b·k, (b+1)·k) of the grid, the samples holding the largest and the smallest
 *    errorAngle and the largest wheel momentum |h_i| over the wheels, so peaks survive thinning;
 *  - both samples around every change of the jump counter j, the segment or the logic value, so
 *    every jump, segment switch and logic switch is drawn where it happened.
 * At most 4 samples per bucket plus the last come from the first two rules; the third adds two per
 * change (a run that switches on every sample keeps every sample).
 */
import type { RunTrace } from './types';

/** Bucket extremes and the grid: samples per bucket at most (grid, errorAngle max and min, |h| max). */
export const DISPLAY_SAMPLES_PER_BUCKET = 4;

/** The kept sample indices, increasing, for grid stride `stride` (≥ 1). */
export function displayIndices(tr: RunTrace, stride: number): Int32Array {
  const n = tr.n;
  if (n === 0) return new Int32Array(0);
  const k = Math.max(1, Math.floor(stride));
  const N = tr.nWheels;
  const keep = new Uint8Array(n);
  const e = tr.errorAngle;
  const h = tr.hWheel;
  keep[0] = 1;
  keep[n - 1] = 1;
  for (let b = 0; b < n; b += k) {
    const end = Math.min(n, b + k);
    let iMax = b,
      iMin = b,
      iH = b,
      hMax = -1;
    for (let i = b; i < end; i++) {
      const v = e[i]!;
      if (v > e[iMax]!) iMax = i;
      if (v < e[iMin]!) iMin = i;
      for (let w = 0; w < N; w++) {
        const a = Math.abs(h[N * i + w]!);
        if (a > hMax) {
          hMax = a;
          iH = i;
        }
      }
    }
    keep[b] = 1;
    keep[iMax] = 1;
    keep[iMin] = 1;
    keep[iH] = 1;
  }
  const j = tr.j,
    seg = tr.segment,
    logic = tr.logic;
  for (let i = 1; i < n; i++) {
    if (j[i] !== j[i - 1] || seg[i] !== seg[i - 1] || logic[i] !== logic[i - 1]) {
      keep[i - 1] = 1;
      keep[i] = 1;
    }
  }
  let m = 0;
  for (let i = 0; i < n; i++) m += keep[i]!;
  const idx = new Int32Array(m);
  for (let i = 0, c = 0; i < n; i++) if (keep[i]) idx[c++] = i;
  return idx;
}
