/**
 * Skipping of quiet stretches in the history check (check.ts). Between samples i and k the angle
 * between a body axis and a source, less the source radius, changes by at most
 *   B(i, k) = (Φ_k − Φ_i) + (ω_s + ρ̇) (t_k − t_i),
 * where Φ is the running sum of the rotation angle between consecutive attitudes (a body vector
 * turns by no more than the attitude does, and rotation angles obey the triangle inequality on
 * SO(3)), ω_s bounds the source's angular rate and ρ̇ its radius rate. A block of samples whose
 * first margin m satisfies m − B > max(0, best known minimum) — B taken over the whole block, a
 * looser bound than over the block's part inside the window — can neither violate nor hold the
 * minimum, so its scan is skipped. The known minimum starts from a coarse pass (every
 * COARSE_STRIDE-th sample) and falls as the scan finds lower margins. Exactness is unchanged:
 * skipped samples provably change no reported number (ties of the minimum aside).
 *
 * Consecutive rotation angle: with d = |q_i · q_k| / (|q_i||q_k|), sin(θ/2) = √(1 − d²) and
 * θ ≤ π sin(θ/2) on [0, π] (sin x ≥ 2x/π on [0, π/2]), so θ ≤ π √(1 − d²): no acos per sample.
 */
import { attitudeMargin } from './source';
import type { Track } from './scan';
import type { PreparedSource } from './types';

/** Stride of the coarse pass that seeds the known minimum. */
const COARSE_STRIDE = 256;

/**
 * Per block of `block` samples, a bound on the rotation angle the attitude travels inside it:
 * out[k] = Σ over consecutive pairs within block k of π √(1 − d²). One pass, no per-sample array.
 */
export function blockRotationBounds(q: Float64Array, n: number, block: number): Float64Array {
  const out = new Float64Array(Math.ceil(n / block));
  for (let k = 0, b0 = 0; b0 < n; k++, b0 += block) {
    const b1 = Math.min(n, b0 + block);
    let px = q[4 * b0]!,
      py = q[4 * b0 + 1]!,
      pz = q[4 * b0 + 2]!,
      pw = q[4 * b0 + 3]!,
      pn = px * px + py * py + pz * pz + pw * pw,
      sum = 0;
    for (let i = b0 + 1; i < b1; i++) {
      const x = q[4 * i]!,
        y = q[4 * i + 1]!,
        z = q[4 * i + 2]!,
        w = q[4 * i + 3]!;
      const nn = x * x + y * y + z * z + w * w;
      const d = x * px + y * py + z * pz + w * pw;
      const c2 = (d * d) / (nn * pn);
      sum += c2 < 1 ? Math.sqrt(1 - c2) : 0;
      px = x;
      py = y;
      pz = z;
      pw = w;
      pn = nn;
    }
    out[k] = Math.PI * sum;
  }
  return out;
}

/**
 * Bound on how fast the source's direction (rad/s) plus its radius (rad/s) change. Great circle:
 * Ω_j / Δt_j; linear blend: 2 tan(Ω_j / 2) / Δt_j (its angular speed peaks mid-interval at
 * Ω-weighted sin Ω / |blend|², |blend|² ≥ (1 + cos Ω)/2).
 */
export function sourceRateBound(src: PreparedSource): number {
  const T = src.timesS,
    A = src.arcAngleRad,
    R = src.radiusRad;
  let w = 0;
  for (let j = 0; j + 1 < T.length; j++) {
    const dt = T[j + 1]! - T[j]!;
    const ang = src.greatCircle ? A[j]! : 2 * Math.tan(0.5 * A[j]!);
    const dr = src.radiusVaries ? Math.abs(R[j + 1]! - R[j]!) : 0;
    w = Math.max(w, (ang + dr) / dt);
  }
  return w;
}

/** Smallest exact margin over every COARSE_STRIDE-th sample of the track's window (Infinity if none). */
export function coarseMinimum(tr: Track, t: Float64Array, q: Float64Array): number {
  let m = Infinity;
  for (let i = tr.i0; i < tr.i1; i += COARSE_STRIDE) m = Math.min(m, attitudeMargin(q, tr.c, t[i]!, 4 * i));
  return m;
}

/**
 * Whether the track's samples in [b0, b1) can be skipped (see the header); `turn` bounds the
 * attitude's rotation over the block. When they can, the track's previous point moves to the
 * block's last sample.
 */
export function canSkip(tr: Track, turn: number, t: Float64Array, q: Float64Array, b0: number, b1: number): boolean {
  const lo = Math.max(b0, tr.i0),
    hi = Math.min(b1, tr.i1);
  if (lo >= hi) return true;
  if (tr.series || tr.prevFlag) return false;
  let floor = tr.knownMin;
  if (tr.bestI >= 0 && tr.bestI !== tr.bestMarginI) {
    tr.bestMarginI = tr.bestI;
    tr.bestMargin = attitudeMargin(q, tr.c, t[tr.bestI]!, 4 * tr.bestI);
  }
  if (tr.bestI >= 0) floor = Math.min(floor, tr.bestMargin);
  const m = attitudeMargin(q, tr.c, t[lo]!, 4 * lo);
  const bound = turn + tr.rate * (t[hi - 1]! - t[lo]!);
  if (!(m - bound > Math.max(0, floor))) return false;
  tr.prevI = hi - 1;
  return true;
}
