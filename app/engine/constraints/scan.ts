/**
 * The per-constraint scan of the history check (check.ts): running state, crossings between
 * samples, window edges between samples, interval bookkeeping, and the inner loops over a block.
 * See check.ts for the definitions; margins here are exact (source.ts attitudeMargin) wherever a
 * number is reported, and cosines are compared in the inner loop.
 */
import { attitudeMargin, marginFromAngle, thresholdAngle } from './source';
import type { ConstraintCheck, PreparedConstraint, ViolationInterval } from './types';

/** Per-constraint running state of the scan. */
export interface Track {
  c: PreparedConstraint;
  axis: number;
  sign: number;
  /** sign · cos(threshold): a sample violates when sign · cos θ exceeds it (constant radius). */
  thrScore: number;
  i0: number;
  i1: number;
  a: number;
  b: number;
  best: number;
  bestI: number;
  prevFlag: boolean;
  /** Previous point: a sample index, or −1 for the virtual window start (margin in prevMargin). */
  prevI: number;
  prevMargin: number;
  /** Interpolated margin at the window start when it falls between samples, else NaN. */
  startMargin: number;
  openStart: number;
  openBest: number;
  openBestI: number;
  openEdgeMargin: number;
  intervals: ViolationInterval[];
  series: Float64Array | undefined;
  /** Bound on the source's angular rate plus its radius rate (rad/s; motionBound.ts), for bisect.ts. */
  rate: number;
}

/** First index whose time passes the (monotone) test, or t.length; binary search. */
function firstIndex(t: Float64Array, pass: (x: number) => boolean): number {
  let lo = 0,
    hi = t.length;
  while (lo < hi) {
    const mid = (lo + hi) >> 1;
    if (pass(t[mid]!)) hi = mid;
    else lo = mid + 1;
  }
  return lo;
}

export function makeTrack(c: PreparedConstraint, axis: number, t: Float64Array, series: boolean): Track {
  const n = t.length;
  const a = Math.max(c.windowStartS, t[0]!),
    b = Math.min(c.windowEndS, t[n - 1]!);
  const i0 = firstIndex(t, (x) => x >= a),
    i1 = a <= b ? firstIndex(t, (x) => x > b) : i0;
  const sign = c.kind === 'keep-out' ? 1 : -1;
  // Threshold angles beyond π: a keep-out is then violated everywhere, a keep-in nowhere.
  const thr = thresholdAngle(c, c.source.radiusRad[0]!);
  const cosThr = thr > Math.PI ? -2 : Math.cos(Math.max(0, thr));
  return {
    c,
    axis,
    sign,
    thrScore: sign * cosThr,
    i0,
    i1,
    a,
    b,
    best: -Infinity,
    bestI: -1,
    prevFlag: false,
    prevI: -2,
    prevMargin: NaN,
    startMargin: NaN,
    openStart: NaN,
    openBest: -Infinity,
    openBestI: -1,
    openEdgeMargin: Infinity,
    intervals: [],
    series: series ? new Float64Array(n).fill(NaN) : undefined,
    rate: 0,
  };
}

export function marginAt(tr: Track, t: Float64Array, q: Float64Array, i: number): number {
  return attitudeMargin(q, tr.c, t[i]!, 4 * i);
}

/** Margin at time x between samples i−1 and i, interpolated linearly. */
function marginBetween(tr: Track, t: Float64Array, q: Float64Array, i: number, x: number): number {
  const m0 = marginAt(tr, t, q, i - 1),
    m1 = marginAt(tr, t, q, i);
  return m0 + ((x - t[i - 1]!) / (t[i]! - t[i - 1]!)) * (m1 - m0);
}

/** The virtual point at the window start (when it falls between samples). */
export function startTrack(tr: Track, t: Float64Array, q: Float64Array): void {
  if (!(tr.a <= tr.b)) return;
  if (tr.i0 < t.length && t[tr.i0] === tr.a) return; // the window starts on a sample
  const m = marginBetween(tr, t, q, tr.i0, tr.a);
  tr.prevI = -1;
  tr.prevMargin = m;
  tr.startMargin = m;
  tr.prevFlag = m < 0;
  if (tr.prevFlag) {
    tr.openStart = tr.a;
    tr.openEdgeMargin = m;
  }
}

/** Called when the violation flag changes between the previous point and (tCur, mCur). */
export function transition(tr: Track, t: Float64Array, q: Float64Array, tCur: number, mCur: number, flag: boolean): void {
  let tx = tCur;
  if (tr.prevI !== -2) {
    const tPrev = tr.prevI >= 0 ? t[tr.prevI]! : tr.a;
    const mPrev = tr.prevI >= 0 ? marginAt(tr, t, q, tr.prevI) : tr.prevMargin;
    const den = mPrev - mCur;
    const f = den !== 0 ? Math.min(1, Math.max(0, mPrev / den)) : 0.5;
    tx = tPrev + f * (tCur - tPrev);
  }
  if (flag) {
    tr.openStart = tx;
    tr.openBest = -Infinity;
    tr.openBestI = -1;
    tr.openEdgeMargin = Infinity;
  } else {
    closeInterval(tr, t, q, tx, Infinity);
  }
  tr.prevFlag = flag;
}

function closeInterval(tr: Track, t: Float64Array, q: Float64Array, endS: number, edgeMargin: number): void {
  let m = Math.min(tr.openEdgeMargin, edgeMargin),
    at = m === edgeMargin ? endS : tr.openStart;
  if (tr.openBestI >= 0) {
    const mi = marginAt(tr, t, q, tr.openBestI);
    if (mi < m) {
      m = mi;
      at = t[tr.openBestI]!;
    }
  }
  tr.intervals.push({ startS: tr.openStart, endS, minMarginRad: m, minAtS: at });
  tr.openBestI = -1;
  tr.openBest = -Infinity;
  tr.openEdgeMargin = Infinity;
}

export function scanBlock(
  tr: Track,
  v: Float64Array,
  s: Float64Array,
  rad: Float64Array,
  t: Float64Array,
  q: Float64Array,
  b0: number,
  b1: number,
): void {
  const lo = Math.max(b0, tr.i0),
    hi = Math.min(b1, tr.i1);
  if (lo >= hi) return;
  if (tr.c.source.radiusVaries || tr.series) {
    scanBlockExact(tr, v, s, rad, t, q, b0, lo, hi);
    return;
  }
  const sign = tr.sign,
    thr = tr.thrScore;
  let best = tr.best,
    bestI = tr.bestI,
    flag = tr.prevFlag,
    openBest = tr.openBest,
    openBestI = tr.openBestI;
  for (let i = lo; i < hi; i++) {
    const o = 3 * (i - b0);
    // score = sign · cos θ: larger is worse for both kinds.
    const score = sign * (v[o]! * s[o]! + v[o + 1]! * s[o + 1]! + v[o + 2]! * s[o + 2]!);
    if (score > best) {
      best = score;
      bestI = i;
    }
    const now = score > thr;
    if (now !== flag) {
      tr.openBest = openBest;
      tr.openBestI = openBestI;
      if (i > lo) tr.prevI = i - 1;
      transition(tr, t, q, t[i]!, marginAt(tr, t, q, i), now);
      openBest = tr.openBest;
      openBestI = tr.openBestI;
      flag = now;
    }
    if (now && score > openBest) {
      openBest = score;
      openBestI = i;
    }
  }
  tr.openBest = openBest;
  tr.openBestI = openBestI;
  tr.prevI = hi - 1;
  tr.best = best;
  tr.bestI = bestI;
  tr.prevFlag = flag;
}

/** The scan with one acos per sample: a source radius that varies in time, or the series asked for. */
function scanBlockExact(
  tr: Track,
  v: Float64Array,
  s: Float64Array,
  rad: Float64Array,
  t: Float64Array,
  q: Float64Array,
  b0: number,
  lo: number,
  hi: number,
): void {
  const varies = tr.c.source.radiusVaries,
    series = tr.series,
    sign = tr.sign,
    thr = tr.thrScore;
  let flag = tr.prevFlag;
  for (let i = lo; i < hi; i++) {
    const o = 3 * (i - b0);
    const c = v[o]! * s[o]! + v[o + 1]! * s[o + 1]! + v[o + 2]! * s[o + 2]!;
    const m = marginFromAngle(tr.c, Math.acos(c > 1 ? 1 : c < -1 ? -1 : c), rad[i - b0]!);
    if (series) series[i] = m;
    // score: larger is worse (−margin when the threshold varies, else sign · cos θ).
    const score = varies ? -m : sign * c;
    const now = varies ? m < 0 : score > thr;
    if (score > tr.best) {
      tr.best = score;
      tr.bestI = i;
    }
    if (now !== flag) {
      if (i > lo) tr.prevI = i - 1;
      transition(tr, t, q, t[i]!, marginAt(tr, t, q, i), now);
      flag = now;
    }
    if (now && score > tr.openBest) {
      tr.openBest = score;
      tr.openBestI = i;
    }
  }
  tr.prevI = hi - 1;
  tr.prevFlag = flag;
}

export function finishTrack(tr: Track, t: Float64Array, q: Float64Array): ConstraintCheck {
  const n = t.length;
  let minM = tr.startMargin,
    minAt = tr.a;
  if (tr.a <= tr.b) {
    if (!(tr.i1 > 0 && t[tr.i1 - 1] === tr.b) && tr.i1 < n) {
      // The virtual window end, between samples i1 − 1 and i1.
      const mb = marginBetween(tr, t, q, tr.i1, tr.b);
      if (mb < 0 !== tr.prevFlag) transition(tr, t, q, tr.b, mb, mb < 0);
      if (tr.prevFlag) closeInterval(tr, t, q, tr.b, mb);
      if (!(mb >= minM)) {
        minM = mb;
        minAt = tr.b;
      }
    } else if (tr.prevFlag) {
      closeInterval(tr, t, q, tr.b, Infinity);
    }
  }
  if (tr.bestI >= 0) {
    const m = marginAt(tr, t, q, tr.bestI);
    if (!(m >= minM)) {
      minM = m;
      minAt = t[tr.bestI]!;
    }
  }
  if (Number.isNaN(minM)) minAt = NaN;
  let violated = 0;
  for (const iv of tr.intervals) violated += iv.endS - iv.startS;
  const out: ConstraintCheck = {
    name: tr.c.name,
    kind: tr.c.kind,
    minMarginRad: minM,
    minAtS: minAt,
    samplesChecked: Math.max(0, tr.i1 - tr.i0),
    intervals: tr.intervals,
    violatedS: violated,
  };
  if (tr.series) out.marginRad = tr.series;
  return out;
}
