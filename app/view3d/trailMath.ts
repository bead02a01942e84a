/**
 * Geometry of the boresight trail, computed once per run (or per boresight/keep-out change) into
 * flat arrays that become BufferAttributes. Pure functions over typed arrays: no three.js objects,
 * so the tests check them directly against the engine's rotation functions.
 *
 * All directions are unit vectors in the inertial (= scene) frame; the trail object scales them
 * onto the drawn sphere.
 */
import { qRotate } from '../engine/math/rotation';
import type { RunTrace } from '../engine/sim/types';
import { slerpFlat } from './adapter';
import { createCursor, locateSample } from './sampling';
import type { ViewJump } from './types';

const sq = new Float64Array(4);
const sv = new Float64Array(3);
const sr = new Float64Array(3);

/** Normalise a body axis; a zero or non-finite axis gives false and leaves `out` as is. */
export function unitAxis(out: Float64Array, axis: ArrayLike<number>): boolean {
  const x = axis[0]!,
    y = axis[1]!,
    z = axis[2]!;
  const n = Math.hypot(x, y, z);
  if (!(n > 0) || !Number.isFinite(n)) return false;
  out[0] = x / n;
  out[1] = y / n;
  out[2] = z / n;
  return true;
}

/** out[3k..3k+2] = R(q_k) b: the inertial direction of unit body axis b at every sample. */
export function boresightPath<T extends Float32Array | Float64Array>(out: T, q: ArrayLike<number>, n: number, b: ArrayLike<number>): T {
  for (let k = 0; k < n; k++) {
    sq[0] = q[4 * k]!;
    sq[1] = q[4 * k + 1]!;
    sq[2] = q[4 * k + 2]!;
    sq[3] = q[4 * k + 3]!;
    qRotate(sr, sq, b);
    out[3 * k] = sr[0]!;
    out[3 * k + 1] = sr[1]!;
    out[3 * k + 2] = sr[2]!;
  }
  return out;
}

/** Boresight direction at an arbitrary time (slerp between the bracketing samples). */
function boresightAt(out: { [i: number]: number }, oo: number, trace: RunTrace, time: number, b: ArrayLike<number>): void {
  const c = locateSample(trace.t, trace.n, time, cursorScratch);
  if (c.i < 0) {
    out[oo] = b[0]!;
    out[oo + 1] = b[1]!;
    out[oo + 2] = b[2]!;
    return;
  }
  slerpFlat(sq, 0, trace.q, 4 * c.i, trace.q, 4 * c.i1, c.alpha);
  qRotate(sr, sq, b);
  out[oo] = sr[0]!;
  out[oo + 1] = sr[1]!;
  out[oo + 2] = sr[2]!;
}

const cursorScratch = createCursor();

/** Per-sample RGB from a per-sample logic value, through `colorOf(value, rgbOut)`. */
export function trailColors(
  out: Float32Array,
  logic: ArrayLike<number>,
  n: number,
  colorOf: (value: number, rgb: Float64Array) => void,
): Float32Array {
  let last = NaN;
  for (let k = 0; k < n; k++) {
    const v = logic[k]!;
    if (v !== last) {
      colorOf(v, sv);
      last = v;
    }
    out[3 * k] = sv[0]!;
    out[3 * k + 1] = sv[1]!;
    out[3 * k + 2] = sv[2]!;
  }
  return out;
}

/** Boresight direction at each jump's time, 3 per jump (in the order given). */
export function jumpMarkerDirections(out: Float64Array, jumps: readonly ViewJump[], trace: RunTrace, b: ArrayLike<number>): Float64Array {
  for (let m = 0; m < jumps.length; m++) boresightAt(out, 3 * m, trace, jumps[m]!.t, b);
  return out;
}

/**
 * Points along the shorter great circle from unit `a` to unit `b`, `count` ≥ 2 points including
 * both ends, written at out[oo..]. Rotation about k = a×b/|a×b| by s·θ, θ = atan2(|a×b|, a·b).
 * For antipodal ends every great circle is shortest; we rotate about X_I with its component along
 * a removed (Y_I when a is near X_I), a fixed, documented choice. Returns θ (rad).
 */
export function greatCircleArc(
  out: { [i: number]: number },
  oo: number,
  a: ArrayLike<number>,
  b: ArrayLike<number>,
  count: number,
): number {
  const ax = a[0]!,
    ay = a[1]!,
    az = a[2]!;
  let kx = ay * b[2]! - az * b[1]!,
    ky = az * b[0]! - ax * b[2]!,
    kz = ax * b[1]! - ay * b[0]!;
  const s = Math.hypot(kx, ky, kz);
  const c = ax * b[0]! + ay * b[1]! + az * b[2]!;
  const theta = Math.atan2(s, c);
  if (s > 1e-12) {
    kx /= s;
    ky /= s;
    kz /= s;
  } else {
    const ex = Math.abs(ax) < 0.9 ? 1 : 0,
      ey = ex ? 0 : 1;
    const d = ex * ax + ey * ay;
    kx = ex - d * ax;
    ky = ey - d * ay;
    kz = -d * az;
    const nk = Math.hypot(kx, ky, kz);
    kx /= nk;
    ky /= nk;
    kz /= nk;
  }
  // p(φ) = a cos φ + (k × a) sin φ  (k ⊥ a)
  const px = ky * az - kz * ay,
    py = kz * ax - kx * az,
    pz = kx * ay - ky * ax;
  for (let m = 0; m < count; m++) {
    const phi = (theta * m) / (count - 1);
    const cp = Math.cos(phi),
      sp = Math.sin(phi);
    out[oo + 3 * m] = ax * cp + px * sp;
    out[oo + 3 * m + 1] = ay * cp + py * sp;
    out[oo + 3 * m + 2] = az * cp + pz * sp;
  }
  return theta;
}

/** Index of the first sample with t ≥ time (n when none). */
export function firstSampleAtOrAfter(t: ArrayLike<number>, n: number, time: number): number {
  let lo = 0,
    hi = n;
  while (lo < hi) {
    const mid = (lo + hi) >> 1;
    if (t[mid]! < time) lo = mid + 1;
    else hi = mid;
  }
  return lo;
}

/**
 * Samples where the path ENTERS a cone around unit `dir` with half angle `halfAngleRad`: inside
 * at k (angle to dir < half angle, i.e. p·dir > cos half) and outside at k−1. A path that starts
 * inside is marked at sample 0.
 */
export function keepOutEntries(path: ArrayLike<number>, n: number, dir: ArrayLike<number>, halfAngleRad: number): number[] {
  const cosHalf = Math.cos(halfAngleRad);
  const out: number[] = [];
  let prevInside = false;
  for (let k = 0; k < n; k++) {
    const d = path[3 * k]! * dir[0]! + path[3 * k + 1]! * dir[1]! + path[3 * k + 2]! * dir[2]!;
    const inside = d > cosHalf;
    if (inside && !prevInside) out.push(k);
    prevInside = inside;
  }
  return out;
}
