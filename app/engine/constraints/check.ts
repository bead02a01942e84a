/**
 * Check an attitude history (or a planned reference) against attitude constraints: per constraint
 * the smallest margin and when, the violation intervals with crossing times, and optionally the
 * margin series (margins and intervals: types.ts header).
 *
 * The margin between samples is taken as the linear interpolation of the sample margins: a
 * crossing between samples i−1 and i is at t_{i−1} + Δt · m_{i−1} / (m_{i−1} − m_i), and a
 * window edge between samples gets the interpolated margin there. Only the window counts.
 *
 * Speed: without the series, each constraint is checked on the history's own samples by bisection
 * with a bound on the motion between them (bisect.ts, motionBound.ts): only the samples that can decide
 * a crossing or a minimum are evaluated, and the report is the same as from every sample. With
 * the series, every sample is evaluated, in blocks of BLOCK samples: per block each distinct body
 * axis is rotated once and each distinct source interpolated once, and the inner loop compares
 * the cosine of the angle with the cosine of the threshold. Exact margins (atan2 form, source.ts)
 * are computed only at crossings, window edges and extremes. Scratch is made per call; nothing
 * is allocated per sample.
 */
import { fail, IssueList, ok, type Issue, type Result } from '../errors';
import { fillFixed, rotateBlock, sourceBlock } from './blocks';
import { scanTrackBisect } from './bisect';
import { finishTrack, makeTrack, scanBlock, startTrack, type Track } from './scan';
import { rotationPrefix, sourceRateBound } from './motionBound';
import type { AttitudeConstraint, AttitudeHistory, HistoryCheck, PreparedConstraint } from './types';
import { prepareConstraints } from './validate';
import { readHistory } from './history';

/** Samples per block of the check. */
const BLOCK = 256;

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

/**
 * The check on validated data (q of any non-zero norm, 4 per sample). Without series, each
 * constraint is scanned by bisection (bisect.ts: only the samples that decide a reported number
 * are evaluated); with series, every sample is evaluated in blocks.
 */
export function checkPreparedHistory(
  t: Float64Array,
  q: Float64Array,
  cs: readonly PreparedConstraint[],
  options: CheckOptions = {},
): HistoryCheck {
  const n = t.length;
  const axes: Float64Array[] = [];
  const series = options.series === true;
  const tracks = cs.map((c) => makeTrack(c, axisIndex(axes, c.axisBody), t, series));
  for (const tr of tracks) {
    startTrack(tr, t, q);
    tr.rate = sourceRateBound(tr.c.source);
  }
  if (series) denseScan(tracks, axes, t, q);
  else if (tracks.length) {
    const phi = rotationPrefix(q, n);
    for (const tr of tracks) scanTrackBisect(tr, t, q, phi, axes[tr.axis]!);
  }
  const results = tracks.map((tr) => finishTrack(tr, t, q));
  let minimum = NaN;
  for (const r of results) if (!(r.minMarginRad >= minimum)) minimum = Number.isNaN(r.minMarginRad) ? minimum : r.minMarginRad;
  return { constraints: results, minimumMarginRad: minimum, clear: results.every((r) => r.intervals.length === 0) };
}

/** Every sample of every track, in blocks of BLOCK samples (the series path). */
function denseScan(tracks: Track[], axes: Float64Array[], t: Float64Array, q: Float64Array): void {
  const n = t.length;
  const axisBuf = axes.map(() => new Float64Array(3 * BLOCK));
  // Distinct sources, indexed by sourceIndex (0 … m−1 by construction in prepareConstraints).
  const m = tracks.reduce((a, tr) => Math.max(a, tr.c.sourceIndex + 1), 0);
  const src: (PreparedConstraint['source'] | undefined)[] = new Array(m);
  for (const tr of tracks) src[tr.c.sourceIndex] = tr.c.source;
  const dirBuf = src.map(() => new Float64Array(3 * BLOCK)),
    radBuf = src.map(() => new Float64Array(BLOCK)),
    cursor = new Int32Array(m);
  src.forEach((s, k) => s && s.timesS.length < 2 && fillFixed(dirBuf[k]!, radBuf[k]!, s));
  const axisNeeded = new Uint8Array(axes.length).fill(1);
  for (let b0 = 0; b0 < n; b0 += BLOCK) {
    const b1 = Math.min(n, b0 + BLOCK);
    rotateBlock(axisBuf, q, b0, b1, axes, axisNeeded);
    for (let k = 0; k < m; k++) {
      const s = src[k];
      if (s && s.timesS.length >= 2) cursor[k] = sourceBlock(dirBuf[k]!, radBuf[k]!, s, t, b0, b1, cursor[k]!);
    }
    for (const tr of tracks) scanBlock(tr, axisBuf[tr.axis]!, dirBuf[tr.c.sourceIndex]!, radBuf[tr.c.sourceIndex]!, t, q, b0, b1);
  }
}

function axisIndex(axes: Float64Array[], a: Float64Array): number {
  const k = axes.findIndex((b) => b[0] === a[0] && b[1] === a[1] && b[2] === a[2]);
  if (k >= 0) return k;
  axes.push(a);
  return axes.length - 1;
}
