/**
 * The history check without margin series (check.ts): per constraint, only the samples that can
 * decide a reported number are evaluated; the rest are proved not to matter.
 *
 * Bound: between samples a < j the margin changes by at most B(a, j) = (Φ_j − Φ_a) + w (t_j − t_a)
 * (motionBound.ts: Φ bounds the attitude's rotation, w the source's angular rate plus its radius rate).
 * So between two evaluated samples a < b every margin lies within
 *   LB(a, b) = (m_a + m_b − B(a, b)) / 2  …  UB(a, b) = (m_a + m_b + B(a, b)) / 2,
 * where the two cones of slope B from either end meet (B is additive along the samples). A
 * stretch (a, b) is left unevaluated only when
 *   (1) its samples cannot change side: both ends clear and LB > 0, or both violated and UB < 0;
 *   (2) none of them can be a reported minimum: LB is above the smallest margin found so far — of
 *       the whole history for a clear stretch, of its violation interval for a violated one.
 * Otherwise it is split at its middle sample, as in Lipschitz branch and bound (S. A. Piyavskii,
 * USSR Comput. Math. Math. Phys. 12(4), 1972; B. O. Shubert, SIAM J. Numer. Anal. 9(3), 1972;
 * both from memory). Condition (1) is settled first for every stretch (pass 1), so that the
 * violation intervals are known before the minima are sought (pass 2, smallest bound first).
 *
 * Exactness: the evaluated samples are then fed in time order to the same per-sample steps as the
 * dense scan (scan.ts), with the same arithmetic (kernels.ts). Every skipped sample is at least
 * GUARD_RAD from zero and from the minimum it could have taken, so it would have changed no flag
 * and no minimum: the check reports the same intervals, minima and times as the dense scan.
 * A constraint costs O(log n) evaluations per crossing and per local minimum instead of n.
 */
import { rotateOne, sourceOne } from './kernels';
import { marginFromAngle } from './source';
import { marginAt, transition, type Track } from './scan';

/** Clearance of every bound decision (rad): far above the rounding of cosines near the threshold. */
const GUARD_RAD = 1e-7;
/** Spacing of the first, regular evaluations (samples). */
const COARSE = 4096;

const v = new Float64Array(3),
  s = new Float64Array(3);

/** Score (sign · cos θ, or −margin for a varying radius), flag and margin of one sample. */
interface Eval {
  score: number;
  flag: boolean;
  margin: number;
}
const ev: Eval = { score: 0, flag: false, margin: 0 };

function evaluate(tr: Track, t: Float64Array, q: Float64Array, axis: Float64Array, i: number): Eval {
  rotateOne(v, q, i, axis);
  const r = sourceOne(s, tr.c.source, t[i]!);
  const dot = v[0]! * s[0]! + v[1]! * s[1]! + v[2]! * s[2]!;
  if (tr.c.source.radiusVaries) {
    // As scanBlockExact: margin by acos, flag and score from it.
    const m = marginFromAngle(tr.c, Math.acos(dot > 1 ? 1 : dot < -1 ? -1 : dot), r);
    ev.margin = m;
    ev.score = -m;
    ev.flag = m < 0;
    return ev;
  }
  const cx = v[1]! * s[2]! - v[2]! * s[1]!,
    cy = v[2]! * s[0]! - v[0]! * s[2]!,
    cz = v[0]! * s[1]! - v[1]! * s[0]!;
  ev.margin = marginFromAngle(tr.c, Math.atan2(Math.sqrt(cx * cx + cy * cy + cz * cz), dot), r);
  ev.score = tr.sign * dot;
  ev.flag = ev.score > tr.thrScore;
  return ev;
}

/** Evaluated samples of one track: index, margin, score, flag (plain growable arrays). */
class Samples {
  idx: number[] = [];
  mar: number[] = [];
  score: number[] = [];
  flg: boolean[] = [];
  add(i: number, e: Eval): void {
    this.idx.push(i);
    this.mar.push(e.margin);
    this.score.push(e.score);
    this.flg.push(e.flag);
  }
  /** These and `more`, sorted by index (a permutation sort; the counts are small). */
  sorted(more?: Samples): Samples {
    const n0 = this.idx.length,
      n = n0 + (more ? more.idx.length : 0);
    const from = (k: number): [Samples, number] => (k < n0 ? [this, k] : [more!, k - n0]);
    const key = Float64Array.from({ length: n }, (_, k) => {
      const [src, j] = from(k);
      return src.idx[j]!;
    });
    const order = Int32Array.from({ length: n }, (_, k) => k).sort((a, b) => key[a]! - key[b]!);
    const out = new Samples();
    for (const k of order) {
      const [src, j] = from(k);
      out.idx.push(src.idx[j]!);
      out.mar.push(src.mar[j]!);
      out.score.push(src.score[j]!);
      out.flg.push(src.flg[j]!);
    }
    return out;
  }
}

/** Fields of one stretch on the flat work stack of pass 2. */
const A = 0,
  B_ = 1,
  MA = 2,
  MB = 3,
  ID = 4,
  LB = 5,
  WIDTH = 6;

export function scanTrackBisect(tr: Track, t: Float64Array, q: Float64Array, phi: Float64Array, axis: Float64Array): void {
  const lo = tr.i0,
    hi = tr.i1;
  if (lo >= hi) return;
  const w = tr.rate;
  const bound = (a: number, b: number) => phi[b]! - phi[a]! + w * (t[b]! - t[a]!);
  const evals = new Samples();
  for (let i = lo; i < hi - 1; i += COARSE) evals.add(i, evaluate(tr, t, q, axis, i));
  evals.add(hi - 1, evaluate(tr, t, q, axis, hi - 1));

  // Pass 1: split every stretch that might change side.
  const stack: number[] = [];
  for (let k = 0; k + 1 < evals.idx.length; k++) stack.push(k, k + 1);
  while (stack.length) {
    const kb = stack.pop()!,
      ka = stack.pop()!;
    const a = evals.idx[ka]!,
      b = evals.idx[kb]!;
    if (b - a <= 1) continue;
    const ma = evals.mar[ka]!,
      mb = evals.mar[kb]!,
      fa = evals.flg[ka]!,
      B = bound(a, b);
    const safe = fa === evals.flg[kb]! && (fa ? (ma + mb + B) / 2 < -GUARD_RAD : (ma + mb - B) / 2 > GUARD_RAD);
    if (safe) continue;
    const mid = (a + b) >> 1;
    const km = evals.idx.length;
    evals.add(mid, evaluate(tr, t, q, axis, mid));
    stack.push(ka, km, km, kb);
  }

  // Pass 2: minima, of the whole history (interval id −1) and of each violation interval.
  const first = evals.sorted();
  const n = first.idx.length;
  const intervalBest: number[] = [];
  const ids = new Int32Array(n).fill(-1);
  let globalBest = Infinity;
  for (let k = 0; k < n; k++) {
    const m = first.mar[k]!;
    globalBest = Math.min(globalBest, m);
    if (!first.flg[k]) continue;
    if (k === 0 || !first.flg[k - 1]) intervalBest.push(Infinity);
    const id = intervalBest.length - 1;
    ids[k] = id;
    intervalBest[id] = Math.min(intervalBest[id]!, m);
  }
  const work: number[] = [];
  const push = (a: number, b: number, ma: number, mb: number, id: number) => {
    if (b - a > 1) work.push(a, b, ma, mb, id, (ma + mb - bound(a, b)) / 2);
  };
  // Largest lower bound first on the stack, so the smallest is split first.
  const initial = Int32Array.from({ length: Math.max(0, n - 1) }, (_, k) => k);
  const lbOf = (k: number) => (first.mar[k]! + first.mar[k + 1]! - bound(first.idx[k]!, first.idx[k + 1]!)) / 2;
  const lbs = Float64Array.from(initial, lbOf);
  initial.sort((x, y) => lbs[y]! - lbs[x]!);
  for (const k of initial) push(first.idx[k]!, first.idx[k + 1]!, first.mar[k]!, first.mar[k + 1]!, ids[k]!);
  const extra = new Samples();
  while (work.length) {
    const o = work.length - WIDTH;
    const a = work[o + A]!,
      b = work[o + B_]!,
      ma = work[o + MA]!,
      mb = work[o + MB]!,
      id = work[o + ID]!,
      lb = work[o + LB]!;
    work.length = o;
    const floor = id >= 0 ? intervalBest[id]! : Math.max(0, globalBest);
    if (lb > floor + GUARD_RAD) continue;
    const mid = (a + b) >> 1;
    const e = evaluate(tr, t, q, axis, mid);
    const m = e.margin;
    extra.add(mid, e);
    globalBest = Math.min(globalBest, m);
    if (id >= 0) intervalBest[id] = Math.min(intervalBest[id]!, m);
    const lbLeft = (ma + m - bound(a, mid)) / 2,
      lbRight = (m + mb - bound(mid, b)) / 2;
    if (lbLeft > lbRight) {
      push(a, mid, ma, m, id);
      push(mid, b, m, mb, id);
    } else {
      push(mid, b, m, mb, id);
      push(a, mid, ma, m, id);
    }
  }

  // The dense scan's steps over the evaluated samples, in time order.
  const all = first.sorted(extra);
  for (let k = 0; k < all.idx.length; k++) {
    const i = all.idx[k]!,
      score = all.score[k]!,
      flag = all.flg[k]!;
    if (score > tr.best) {
      tr.best = score;
      tr.bestI = i;
    }
    if (flag !== tr.prevFlag) {
      if (i > lo) tr.prevI = i - 1;
      transition(tr, t, q, t[i]!, marginAt(tr, t, q, i), flag);
    }
    if (flag && score > tr.openBest) {
      tr.openBest = score;
      tr.openBestI = i;
    }
  }
  tr.prevI = hi - 1;
}
