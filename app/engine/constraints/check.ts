/**
 * Check an attitude history (or a planned reference) against attitude constraints: per constraint
 * the smallest margin and when, the violation intervals with crossing times, and optionally the
 * margin series (margins and intervals: types.ts header).
 *
 * The margin between samples is taken as the linear interpolation of the sample margins: a
 * crossing between samples i−1 and i is at t_{i−1} + Δt · m_{i−1} / (m_{i−1} − m_i), and a
 * window edge between samples gets the interpolated margin there. Only the window counts.
 *
 * Speed: the history is processed in blocks of BLOCK samples. Per block, each distinct body axis
 * is rotated into inertial axes once and each distinct source is interpolated once; per
 * constraint the inner loop compares the cosine of the angle with the cosine of the threshold
 * (no acos), so a constant-radius constraint costs a dot product per sample. Exact margins
 * (atan2 form, source.ts) are computed only at crossings, window edges and extremes. A source
 * whose radius varies in time, or a request for the series, takes one acos per sample. Scratch
 * blocks are made per call; nothing is allocated per sample.
 */
import { fail, IssueList, ok, type Issue, type Result } from '../errors';
import { attitudeMargin, marginFromAngle, sampleInterval, sourceAtInterval, thresholdAngle } from './source';
import type { AttitudeConstraint, AttitudeHistory, ConstraintCheck, HistoryCheck, PreparedConstraint, ViolationInterval } from './types';
import { prepareConstraints } from './validate';
import { readHistory } from './history';

/** Samples per block of the check. */
export const BLOCK = 1024;

export interface CheckOptions {
  /** Also return the margin series of each constraint (one acos per sample and constraint). */
  series?: boolean;
}

/** Validate the history and constraints, then check. Bad input: every problem listed. */
export function checkAttitudeHistory(
  history: AttitudeHistory,
  constraints: readonly AttitudeConstraint[],
  options: CheckOptions = {},
): Result<HistoryCheck> {
  const list = new IssueList();
  const h = readHistory(list, history);
  const prep = prepareConstraints(constraints);
  if (!prep.ok) list.items.push(...prep.errors);
  if (!list.empty || !h || !prep.ok) return fail(list.items);
  const warnings = spanWarnings(h.t, prep.value);
  return ok(checkPreparedHistory(h.t, h.q, prep.value, options), warnings);
}

/**
 * Check a planned reference: `attitudeAt(t, outQ)` writes qInertialFromBody at time t; it is
 * sampled at t0S, t0S + stepS, … and at t1S.
 */
export function checkReference(
  attitudeAt: (t: number, outQ: Float64Array) => void,
  t0S: number,
  t1S: number,
  stepS: number,
  constraints: readonly AttitudeConstraint[],
  options: CheckOptions = {},
): Result<HistoryCheck> {
  if (!(Number.isFinite(t0S) && Number.isFinite(t1S) && t1S >= t0S && stepS > 0 && Number.isFinite(stepS))) {
    return fail([{ path: 'reference', rule: 'sampling', message: 'checkReference needs finite t0S ≤ t1S and a step > 0 s' }]);
  }
  const m = Math.ceil((t1S - t0S) / stepS - 1e-9);
  const n = m + 1;
  const t = new Float64Array(n),
    q = new Float64Array(4 * n),
    qi = new Float64Array(4);
  for (let i = 0; i < n; i++) {
    t[i] = i === m ? t1S : t0S + i * stepS;
    attitudeAt(t[i]!, qi);
    q.set(qi, 4 * i);
  }
  return checkAttitudeHistory({ timesS: t, qInertialFromBody: q }, constraints, options);
}

/** Warnings where the history runs outside a sampled source's span (its end direction is held). */
function spanWarnings(t: Float64Array, cs: readonly PreparedConstraint[]): Issue[] {
  const out: Issue[] = [];
  const seen = new Set<number>();
  const t0 = t[0]!,
    t1 = t[t.length - 1]!;
  cs.forEach((c, k) => {
    const T = c.source.timesS;
    if (T.length < 2 || seen.has(c.sourceIndex)) return;
    seen.add(c.sourceIndex);
    if (t0 < T[0]! || t1 > T[T.length - 1]!) {
      out.push({
        path: `constraints[${k}].source.timesS`,
        rule: 'source-span',
        message: `The history (${t0} s to ${t1} s) runs outside the source samples of "${c.name}" (${T[0]} s to ${T[T.length - 1]} s); the end direction is held there.`,
      });
    }
  });
  return out;
}

/** Per-constraint running state of the scan. */
interface Track {
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
}

/** The check on validated data (q of any non-zero norm, 4 per sample). */
export function checkPreparedHistory(
  t: Float64Array,
  q: Float64Array,
  cs: readonly PreparedConstraint[],
  options: CheckOptions = {},
): HistoryCheck {
  const n = t.length;
  const axes: Float64Array[] = [];
  const tracks = cs.map((c) => makeTrack(c, axisIndex(axes, c.axisBody), t, options.series === true));
  const axisBuf = axes.map(() => new Float64Array(3 * BLOCK));
  const sources = new Map<number, { src: PreparedConstraint['source']; dir: Float64Array; rad: Float64Array; j: number }>();
  for (const c of cs) {
    if (!sources.has(c.sourceIndex))
      sources.set(c.sourceIndex, { src: c.source, dir: new Float64Array(3 * BLOCK), rad: new Float64Array(BLOCK), j: 0 });
  }
  for (const s of sources.values()) if (s.src.timesS.length < 2) fillFixed(s.dir, s.rad, s.src);
  for (const tr of tracks) startTrack(tr, t, q);
  for (let b0 = 0; b0 < n; b0 += BLOCK) {
    const b1 = Math.min(n, b0 + BLOCK);
    let needed = false;
    for (const tr of tracks) if (tr.i0 < b1 && tr.i1 > b0) needed = true;
    if (!needed) continue;
    axes.forEach((ax, k) => rotateBlock(axisBuf[k]!, q, b0, b1, ax));
    for (const s of sources.values()) if (s.src.timesS.length >= 2) s.j = sourceBlock(s.dir, s.rad, s.src, t, b0, b1, s.j);
    for (const tr of tracks) {
      const s = sources.get(tr.c.sourceIndex)!;
      scanBlock(tr, axisBuf[tr.axis]!, s.dir, s.rad, t, q, b0, b1);
    }
  }
  const results = tracks.map((tr) => finishTrack(tr, t, q));
  let minimum = NaN;
  for (const r of results) if (!(r.minMarginRad >= minimum)) minimum = Number.isNaN(r.minMarginRad) ? minimum : r.minMarginRad;
  return { constraints: results, minimumMarginRad: minimum, clear: results.every((r) => r.intervals.length === 0) };
}

function axisIndex(axes: Float64Array[], a: Float64Array): number {
  const k = axes.findIndex((b) => b[0] === a[0] && b[1] === a[1] && b[2] === a[2]);
  if (k >= 0) return k;
  axes.push(a);
  return axes.length - 1;
}

function makeTrack(c: PreparedConstraint, axis: number, t: Float64Array, series: boolean): Track {
  const n = t.length;
  const a = Math.max(c.windowStartS, t[0]!),
    b = Math.min(c.windowEndS, t[n - 1]!);
  let i0 = 0;
  while (i0 < n && t[i0]! < a) i0++;
  let i1 = i0;
  while (i1 < n && t[i1]! <= b) i1++;
  if (!(a <= b)) i1 = i0;
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
  };
}

function marginAt(tr: Track, t: Float64Array, q: Float64Array, i: number): number {
  return attitudeMargin(q.subarray(4 * i, 4 * i + 4), tr.c, t[i]!);
}

/** Margin at time x between samples i−1 and i, interpolated linearly. */
function marginBetween(tr: Track, t: Float64Array, q: Float64Array, i: number, x: number): number {
  const m0 = marginAt(tr, t, q, i - 1),
    m1 = marginAt(tr, t, q, i);
  return m0 + ((x - t[i - 1]!) / (t[i]! - t[i - 1]!)) * (m1 - m0);
}

/** The virtual point at the window start (when it falls between samples). */
function startTrack(tr: Track, t: Float64Array, q: Float64Array): void {
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
function transition(tr: Track, t: Float64Array, q: Float64Array, tCur: number, mCur: number, flag: boolean): void {
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

function scanBlock(
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

function finishTrack(tr: Track, t: Float64Array, q: Float64Array): ConstraintCheck {
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

/** Body axis a rotated into inertial axes for samples [b0, b1): out[3(i−b0)..] = R(q_i) a. */
function rotateBlock(out: Float64Array, q: Float64Array, b0: number, b1: number, a: Float64Array): void {
  const ax = a[0]!,
    ay = a[1]!,
    az = a[2]!;
  for (let i = b0, o = 0; i < b1; i++, o += 3) {
    const x = q[4 * i]!,
      y = q[4 * i + 1]!,
      z = q[4 * i + 2]!,
      w = q[4 * i + 3]!;
    const k = 2 / (x * x + y * y + z * z + w * w);
    const tx = k * (y * az - z * ay),
      ty = k * (z * ax - x * az),
      tz = k * (x * ay - y * ax);
    out[o] = ax + w * tx + (y * tz - z * ty);
    out[o + 1] = ay + w * ty + (z * tx - x * tz);
    out[o + 2] = az + w * tz + (x * ty - y * tx);
  }
}

function fillFixed(dir: Float64Array, rad: Float64Array, src: PreparedConstraint['source']): void {
  for (let o = 0; o < dir.length; o += 3) dir.set(src.directions.subarray(0, 3), o);
  rad.fill(src.radiusRad[0]!);
}

/**
 * Interpolated source directions (and radii) for samples [b0, b1); j is the running interval
 * cursor. The same formulas as source.ts sourceAtInterval, written out in one loop per kind.
 */
function sourceBlock(
  dir: Float64Array,
  rad: Float64Array,
  src: PreparedConstraint['source'],
  t: Float64Array,
  b0: number,
  b1: number,
  j: number,
): number {
  const T = src.timesS,
    D = src.directions,
    A = src.arcAngleRad,
    P = src.arcBasis,
    last = T.length - 2;
  if (b0 === 0) j = sampleInterval(T, t[0]!);
  if (src.radiusVaries) {
    for (let i = b0, o = 0; i < b1; i++, o += 3) {
      const ti = t[i]!;
      while (j < last && T[j + 1]! <= ti) j++;
      rad[i - b0] = sourceAtInterval(dir, o, src, j, ti);
    }
    return j;
  }
  let t0 = T[j]!,
    t1 = T[j + 1]!,
    inv = 1 / (t1 - t0),
    k = 3 * j;
  for (let i = b0, o = 0; i < b1; i++, o += 3) {
    const ti = t[i]!;
    if (ti >= t1 && j < last) {
      while (j < last && T[j + 1]! <= ti) j++;
      t0 = T[j]!;
      t1 = T[j + 1]!;
      inv = 1 / (t1 - t0);
      k = 3 * j;
    }
    let u = (ti - t0) * inv;
    u = u < 0 ? 0 : u > 1 ? 1 : u;
    const ax = D[k]!,
      ay = D[k + 1]!,
      az = D[k + 2]!;
    if (src.greatCircle) {
      const x = u * A[j]!;
      let cu: number, su: number;
      if (x <= 0.25) {
        const x2 = x * x;
        su = x * (1 - (x2 / 6) * (1 - (x2 / 20) * (1 - (x2 / 42) * (1 - x2 / 72))));
        cu = 1 - (x2 / 2) * (1 - (x2 / 12) * (1 - (x2 / 30) * (1 - (x2 / 56) * (1 - x2 / 90))));
      } else {
        cu = Math.cos(x);
        su = Math.sin(x);
      }
      dir[o] = ax * cu + P[k]! * su;
      dir[o + 1] = ay * cu + P[k + 1]! * su;
      dir[o + 2] = az * cu + P[k + 2]! * su;
    } else {
      const x = ax + u * (D[k + 3]! - ax),
        y = ay + u * (D[k + 4]! - ay),
        z = az + u * (D[k + 5]! - az);
      const r = 1 / Math.sqrt(x * x + y * y + z * z);
      dir[o] = x * r;
      dir[o + 1] = y * r;
      dir[o + 2] = z * r;
    }
  }
  rad.fill(src.radiusRad[0]!, 0, b1 - b0);
  return j;
}
