/**
 * Intrinsic Euler sequences (all 12 Tait–Bryan and proper sequences) to and from quaternions,
 * radians; the convention is rotation.ts's: sequence "ZYX" with angles (a, b, c) is
 * R = R_z(a) R_y(b) R_x(c), each rotation about an axis of the frame already rotated.
 */
import type { Vec3 } from './mat3';
import { m3Create } from './mat3';
import type { Quat } from './quaternion';
import { qCreate, qMultiply, qToMat3 } from './quaternion';

export const EULER_SEQUENCES = [
  'XYZ',
  'XZY',
  'YXZ',
  'YZX',
  'ZXY',
  'ZYX', // Tait–Bryan
  'XYX',
  'XZX',
  'YXY',
  'YZY',
  'ZXZ',
  'ZYZ', // proper Euler
] as const;
export type EulerSequence = (typeof EULER_SEQUENCES)[number];

function axisIndex(c: string): number {
  return c === 'X' ? 0 : c === 'Y' ? 1 : 2;
}

/** Elementary rotation quaternion about body axis `i` (0, 1, 2). */
function qElementary(out: Quat, i: number, angleRad: number): Quat {
  out[0] = out[1] = out[2] = 0;
  out[i] = Math.sin(0.5 * angleRad);
  out[3] = Math.cos(0.5 * angleRad);
  return out;
}

/** q = q_i(a1) ⊗ q_j(a2) ⊗ q_k(a3) for the intrinsic sequence "ijk" (R = R_i R_j R_k). */
export function qFromEuler(out: Quat, seq: EulerSequence, a1: number, a2: number, a3: number): Quat {
  const e1 = qElementary(qCreate(), axisIndex(seq[0]!), a1);
  const e2 = qElementary(qCreate(), axisIndex(seq[1]!), a2);
  const e3 = qElementary(qCreate(), axisIndex(seq[2]!), a3);
  qMultiply(out, e1, e2);
  return qMultiply(out, out, e3);
}

/** Levi-Civita symbol ε_ijk for distinct 0-based indices. */
function levi(i: number, j: number, k: number): number {
  return ((i - j) * (j - k) * (k - i)) / 2;
}

/**
 * Euler angles of an intrinsic sequence from a quaternion, radians. Angle 1 and 3 in (−π, π];
 * angle 2 in [−π/2, π/2] (Tait–Bryan) or [0, π] (proper). At gimbal lock the third angle is set
 * to 0 and the first carries the whole rotation. Derived from the matrix R = R_i(a)R_j(b)R_k(c):
 * Tait–Bryan R_ik = ε sin b, tan a = −ε R_jk / R_kk, tan c = −ε R_ij / R_ii; proper (i, j, i),
 * l the third axis: R_ii = cos b, tan a = R_ji / (−ε R_li), tan c = R_ij / (ε R_il).
 */
export function qToEuler(out: Vec3, seq: EulerSequence, q: ArrayLike<number>): Vec3 {
  const m = qToMat3(m3Create(), q);
  const R = (r: number, c: number) => m[3 * c + r]!;
  const i = axisIndex(seq[0]!),
    j = axisIndex(seq[1]!),
    k = axisIndex(seq[2]!);
  let a: number, b: number, c: number;
  if (i !== k) {
    const eps = levi(i, j, k);
    const cb = Math.hypot(R(i, i), R(i, j));
    b = Math.atan2(eps * R(i, k), cb);
    if (cb > 1e-12) {
      a = Math.atan2(-eps * R(j, k), R(k, k));
      c = Math.atan2(-eps * R(i, j), R(i, i));
    } else {
      c = 0;
      a = Math.atan2(eps * R(k, j), R(j, j));
    }
  } else {
    const l = 3 - i - j;
    const eps = levi(i, j, l);
    const sb = Math.hypot(R(i, j), R(i, l));
    b = Math.atan2(sb, R(i, i));
    if (sb > 1e-12) {
      a = Math.atan2(R(j, i), -eps * R(l, i));
      c = Math.atan2(R(i, j), eps * R(i, l));
    } else {
      c = 0;
      a = Math.atan2(eps * R(l, j), R(j, j));
    }
  }
  out[0] = a;
  out[1] = b;
  out[2] = c;
  return out;
}
