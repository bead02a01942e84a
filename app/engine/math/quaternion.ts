/**
 * Quaternion algebra and conversions: Hamilton products, rotation of vectors, matrices (Shepperd),
 * axis-angle, rotation vectors (exp/log maps), propagation by a body rate, slerp, uniform random
 * attitudes and the kinematics q̇ = ½ q ⊗ (ω, 0). The convention (scalar-last, qInertialFromBody)
 * is stated in rotation.ts, which re-exports everything here; import from there.
 *
 * Functions follow `fn(out, ...)` and return `out`; inputs are read into locals first so `out`
 * may alias an input.
 */
import { quat, vec3, mat3 } from 'gl-matrix';
import type { Mat3, Vec3 } from './mat3';
import type { Rng } from './prng';
import { hypot3 } from './hypot';

export type Quat = Float64Array;

export function qCreate(): Quat {
  const q = new Float64Array(4);
  q[3] = 1;
  return q;
}

/** From scalar-last components. */
export function qFromValues(x: number, y: number, z: number, w: number): Quat {
  const q = new Float64Array(4);
  q[0] = x;
  q[1] = y;
  q[2] = z;
  q[3] = w;
  return q;
}

export function qCopy(out: Quat, a: ArrayLike<number>): Quat {
  out[0] = a[0]!;
  out[1] = a[1]!;
  out[2] = a[2]!;
  out[3] = a[3]!;
  return out;
}

function qIdentity(out: Quat): Quat {
  out[0] = out[1] = out[2] = 0;
  out[3] = 1;
  return out;
}

/** Hamilton product out = a ⊗ b. */
export function qMultiply(out: Quat, a: ArrayLike<number>, b: ArrayLike<number>): Quat {
  return quat.multiply(out as unknown as quat, a as quat, b as quat) as unknown as Quat;
}

/** out = a* ⊗ b (the relative rotation from a to b), without a temporary. */
export function qConjMultiply(out: Quat, a: ArrayLike<number>, b: ArrayLike<number>): Quat {
  const ax = -a[0]!,
    ay = -a[1]!,
    az = -a[2]!,
    aw = a[3]!;
  const bx = b[0]!,
    by = b[1]!,
    bz = b[2]!,
    bw = b[3]!;
  out[0] = ax * bw + aw * bx + ay * bz - az * by;
  out[1] = ay * bw + aw * by + az * bx - ax * bz;
  out[2] = az * bw + aw * bz + ax * by - ay * bx;
  out[3] = aw * bw - ax * bx - ay * by - az * bz;
  return out;
}

export function qConjugate(out: Quat, a: ArrayLike<number>): Quat {
  out[0] = -a[0]!;
  out[1] = -a[1]!;
  out[2] = -a[2]!;
  out[3] = a[3]!;
  return out;
}

export function qNorm(a: ArrayLike<number>): number {
  return Math.hypot(a[0]!, a[1]!, a[2]!, a[3]!);
}

function qDot(a: ArrayLike<number>, b: ArrayLike<number>): number {
  return a[0]! * b[0]! + a[1]! * b[1]! + a[2]! * b[2]! + a[3]! * b[3]!;
}

/**
 * Normalise in place-safe form. A zero or non-finite quaternion has a defined result: the
 * identity, and the function returns false so callers can report it.
 */
export function qNormalize(out: Quat, a: ArrayLike<number>): boolean {
  const n = qNorm(a);
  if (!(n > 0) || !Number.isFinite(n)) {
    qIdentity(out);
    return false;
  }
  out[0] = a[0]! / n;
  out[1] = a[1]! / n;
  out[2] = a[2]! / n;
  out[3] = a[3]! / n;
  return true;
}

/** Rotate a vector: out = q ⊗ v ⊗ q* (body → inertial for an attitude quaternion). */
export function qRotate(out: Vec3, q: ArrayLike<number>, v: ArrayLike<number>): Vec3 {
  return vec3.transformQuat(out as unknown as vec3, v as vec3, q as quat) as unknown as Vec3;
}

/** Inverse rotation: out = q* ⊗ v ⊗ q (inertial → body for an attitude quaternion). */
export function qRotateInverse(out: Vec3, q: ArrayLike<number>, v: ArrayLike<number>): Vec3 {
  const x = -q[0]!,
    y = -q[1]!,
    z = -q[2]!,
    w = q[3]!;
  const vx = v[0]!,
    vy = v[1]!,
    vz = v[2]!;
  // t = 2 (q_v × v); out = v + w t + q_v × t  (with q_v of the conjugate)
  const tx = 2 * (y * vz - z * vy);
  const ty = 2 * (z * vx - x * vz);
  const tz = 2 * (x * vy - y * vx);
  out[0] = vx + w * tx + (y * tz - z * ty);
  out[1] = vy + w * ty + (z * tx - x * tz);
  out[2] = vz + w * tz + (x * ty - y * tx);
  return out;
}

/** R(q), column-major, body-to-inertial for an attitude quaternion (methods §1.1). */
export function qToMat3(out: Mat3, q: ArrayLike<number>): Mat3 {
  return mat3.fromQuat(out as unknown as mat3, q as quat) as unknown as Mat3;
}

/**
 * Quaternion of a rotation matrix (column-major), by Shepperd's method (largest-diagonal branch,
 * Shepperd, JGCD 1(3), 1978), sign chosen with w ≥ 0. The input should be orthonormal.
 */
export function qFromMat3(out: Quat, m: ArrayLike<number>): Quat {
  const r00 = m[0]!,
    r11 = m[4]!,
    r22 = m[8]!;
  const r10 = m[1]!,
    r20 = m[2]!,
    r01 = m[3]!,
    r21 = m[5]!,
    r02 = m[6]!,
    r12 = m[7]!;
  const tr = r00 + r11 + r22;
  let x: number, y: number, z: number, w: number;
  if (tr >= r00 && tr >= r11 && tr >= r22) {
    const s = 2 * Math.sqrt(1 + tr);
    w = 0.25 * s;
    x = (r21 - r12) / s;
    y = (r02 - r20) / s;
    z = (r10 - r01) / s;
  } else if (r00 >= r11 && r00 >= r22) {
    const s = 2 * Math.sqrt(1 + r00 - r11 - r22);
    w = (r21 - r12) / s;
    x = 0.25 * s;
    y = (r01 + r10) / s;
    z = (r02 + r20) / s;
  } else if (r11 >= r22) {
    const s = 2 * Math.sqrt(1 + r11 - r00 - r22);
    w = (r02 - r20) / s;
    x = (r01 + r10) / s;
    y = 0.25 * s;
    z = (r12 + r21) / s;
  } else {
    const s = 2 * Math.sqrt(1 + r22 - r00 - r11);
    w = (r10 - r01) / s;
    x = (r02 + r20) / s;
    y = (r12 + r21) / s;
    z = 0.25 * s;
  }
  const sign = w < 0 ? -1 : 1;
  const n = Math.hypot(x, y, z, w) * sign;
  out[0] = x / n;
  out[1] = y / n;
  out[2] = z / n;
  out[3] = w / n;
  return out;
}

/** q = (sin(θ/2) u, cos(θ/2)); `axis` need not be unit but must be non-zero. */
export function qFromAxisAngle(out: Quat, axis: ArrayLike<number>, angleRad: number): Quat {
  const n = Math.hypot(axis[0]!, axis[1]!, axis[2]!);
  if (!(n > 0)) return qIdentity(out);
  const s = Math.sin(0.5 * angleRad) / n;
  out[0] = axis[0]! * s;
  out[1] = axis[1]! * s;
  out[2] = axis[2]! * s;
  out[3] = Math.cos(0.5 * angleRad);
  return out;
}

/**
 * Axis and angle of q, angle in [0, π] (the shortest rotation; the axis flips with the sign of w).
 * For the identity the axis is +X by convention.
 */
export function qToAxisAngle(axisOut: Vec3, q: ArrayLike<number>): number {
  const sgn = q[3]! < 0 ? -1 : 1;
  const x = q[0]! * sgn,
    y = q[1]! * sgn,
    z = q[2]! * sgn,
    w = q[3]! * sgn;
  const s = Math.hypot(x, y, z);
  if (s < 1e-300) {
    axisOut[0] = 1;
    axisOut[1] = 0;
    axisOut[2] = 0;
    return 0;
  }
  axisOut[0] = x / s;
  axisOut[1] = y / s;
  axisOut[2] = z / s;
  return 2 * Math.atan2(s, w);
}

/**
 * Shortest rotation angle of q in [0, π]: 2·atan2(|ε|, |η|). Same as 2·arccos|η| but accurate
 * near 0 and π (no unclamped acos). |ε| by hypot3 (hypot.ts), Math.hypot bit for bit without the call.
 */
export function qAngle(q: ArrayLike<number>): number {
  return 2 * Math.atan2(hypot3(q[0]!, q[1]!, q[2]!), Math.abs(q[3]!));
}

/** Shortest rotation angle between two attitudes (from the relative quaternion a* ⊗ b, accurate near 0). */
export function qAngleBetween(a: ArrayLike<number>, b: ArrayLike<number>): number {
  return qAngle(qConjMultiply(scratchAngle, a, b));
}
const scratchAngle = new Float64Array(4);

/** Body-frame attitude error q_e = q_d* ⊗ q (methods §1.1). */
export function qError(out: Quat, qDesired: ArrayLike<number>, q: ArrayLike<number>): Quat {
  return qConjMultiply(out, qDesired, q);
}

/** Exponential map: q = exp(½ φ) for a rotation vector φ (rad): axis φ/|φ|, angle |φ|. */
export function qFromRotationVector(out: Quat, phi: ArrayLike<number>): Quat {
  const x = phi[0]!,
    y = phi[1]!,
    z = phi[2]!;
  const th = hypot3(x, y, z);
  const half = 0.5 * th;
  // sin(θ/2)/θ with a series near zero.
  const k = th < 1e-4 ? 0.5 - (th * th) / 48 : Math.sin(half) / th;
  out[0] = x * k;
  out[1] = y * k;
  out[2] = z * k;
  out[3] = Math.cos(half);
  return out;
}

/** Logarithm map: rotation vector of q (shortest, |φ| ≤ π). */
export function qToRotationVector(out: Vec3, q: ArrayLike<number>): Vec3 {
  const sgn = q[3]! < 0 ? -1 : 1;
  const x = q[0]! * sgn,
    y = q[1]! * sgn,
    z = q[2]! * sgn,
    w = q[3]! * sgn;
  const s = Math.hypot(x, y, z);
  const th = 2 * Math.atan2(s, w);
  const k = s < 1e-12 ? 2 / Math.max(w, 1e-300) : th / s;
  out[0] = x * k;
  out[1] = y * k;
  out[2] = z * k;
  return out;
}

/**
 * Propagate q by a constant body rate over dt: q ⊗ exp(½ ω dt) (exact for constant ω).
 */
export function qPropagateBodyRate(out: Quat, q: ArrayLike<number>, omegaBody: ArrayLike<number>, dt: number): Quat {
  const dq = scratchQ;
  scratchV[0] = omegaBody[0]! * dt;
  scratchV[1] = omegaBody[1]! * dt;
  scratchV[2] = omegaBody[2]! * dt;
  qFromRotationVector(dq, scratchV);
  return qMultiply(out, q, dq);
}

const scratchQ = qCreate();
const scratchV = new Float64Array(3);

/** Spherical linear interpolation along the shorter arc. */
export function qSlerp(out: Quat, a: ArrayLike<number>, b: ArrayLike<number>, t: number): Quat {
  return quat.slerp(out as unknown as quat, a as quat, b as quat, t) as unknown as Quat;
}

/** Flip b's sign if needed so that ⟨a, b⟩ ≥ 0 (same attitude, same hemisphere as a). */
export function qSameHemisphere(out: Quat, a: ArrayLike<number>, b: ArrayLike<number>): Quat {
  const s = qDot(a, b) < 0 ? -1 : 1;
  out[0] = b[0]! * s;
  out[1] = b[1]! * s;
  out[2] = b[2]! * s;
  out[3] = b[3]! * s;
  return out;
}

/**
 * Uniformly distributed random attitude (Haar measure on SO(3)), Shoemake, "Uniform random
 * rotations", Graphics Gems III, 1992: u1, u2, u3 ~ U(0,1),
 * q = (√(1−u1) sin 2πu2, √(1−u1) cos 2πu2, √u1 sin 2πu3, √u1 cos 2πu3) as [x, y, z, w].
 */
export function qRandomUniform(out: Quat, rng: Rng): Quat {
  const u1 = rng.next(),
    u2 = rng.next(),
    u3 = rng.next();
  const a = Math.sqrt(1 - u1),
    b = Math.sqrt(u1);
  out[0] = a * Math.sin(2 * Math.PI * u2);
  out[1] = a * Math.cos(2 * Math.PI * u2);
  out[2] = b * Math.sin(2 * Math.PI * u3);
  out[3] = b * Math.cos(2 * Math.PI * u3);
  return out;
}

/**
 * Quaternion kinematics: out = ½ q ⊗ (ω, 0), ω in body axes (methods §1.1). Written out so the
 * integrator's inner loop does not allocate.
 */
export function qDerivative(
  out: ArrayLike<number> & { [i: number]: number },
  q: ArrayLike<number>,
  w: ArrayLike<number>,
  offset = 0,
): void {
  const x = q[0]!,
    y = q[1]!,
    z = q[2]!,
    s = q[3]!;
  const wx = w[0]!,
    wy = w[1]!,
    wz = w[2]!;
  out[offset] = 0.5 * (s * wx + y * wz - z * wy);
  out[offset + 1] = 0.5 * (s * wy + z * wx - x * wz);
  out[offset + 2] = 0.5 * (s * wz + x * wy - y * wx);
  out[offset + 3] = -0.5 * (x * wx + y * wy + z * wz);
}
