/**
 * THE adapter between engine arrays and three.js objects. Every place in view3d that moves an
 * engine quaternion, vector or matrix into three.js goes through this file, and its tests
 * (test/unit/view3d-adapter.test.ts) pin the mapping.
 *
 * Mapping, written once:
 * - Engine attitude `qInertialFromBody`, Hamilton, stored [x, y, z, w], rotates body vectors into
 *   the inertial frame (v_I = q ⊗ v_B ⊗ q*). three.js `Quaternion` is also Hamilton, also stores
 *   (x, y, z, w), and `Object3D.quaternion` rotates the object's local vectors into its parent's
 *   frame. So a body-frame object whose parent is the inertial frame takes the engine quaternion
 *   component for component: no sign flip, no reordering, no conjugate.
 * - Scene coordinates ARE inertial coordinates: scene x, y, z = X_I, Y_I, Z_I, and the scene root
 *   carries no transform. three.js draws +Y up by default; we show Z_I up by setting the camera's
 *   `up` vector to (0, 0, 1) (`setInertialZUp`), never by rotating the data.
 * - Engine 3×3 matrices are column-major Float64Array(9) (element (r, c) at 3c + r). three.js
 *   `Matrix3/Matrix4.elements` are also column-major, so `fromArray` is a straight copy; the
 *   row-major argument order of `Matrix3.set()` is never used here.
 */
import type { Matrix3, Matrix4, Object3D, Quaternion } from 'three';

/** Copy an engine quaternion (offset `o` into a flat [x, y, z, w]… array) into a three Quaternion. */
export function quaternionFromArray(target: Quaternion, arr: ArrayLike<number>, o = 0): Quaternion {
  return target.set(arr[o]!, arr[o + 1]!, arr[o + 2]!, arr[o + 3]!);
}

/** Pose a body-frame object (parent = inertial frame) from an engine attitude at offset `o`. */
export function setObjectAttitude(obj: Object3D, arr: ArrayLike<number>, o = 0): Object3D {
  obj.quaternion.set(arr[o]!, arr[o + 1]!, arr[o + 2]!, arr[o + 3]!);
  return obj;
}

/** Copy a three Quaternion back into an engine array at offset `o`. */
export function quaternionToArray(out: { [i: number]: number }, q: Quaternion, o = 0): void {
  out[o] = q.x;
  out[o + 1] = q.y;
  out[o + 2] = q.z;
  out[o + 3] = q.w;
}

/**
 * Spherical linear interpolation between two samples of a flat quaternion array, along the
 * shorter arc (the sign of the second sample is flipped when ⟨q0, q1⟩ < 0: q and −q are the same
 * attitude). Writes [x, y, z, w] at `out[oo]`. The angle is taken as 2·atan2(|q0 − q1|, |q0 + q1|),
 * accurate near 0 (no unclamped acos); below 1e-9 rad the weights fall back to linear + normalise
 * (Shoemake, "Animating rotation with quaternion curves", SIGGRAPH 1985, for the formula).
 * Allocation-free; `out` may alias the input.
 */
export function slerpFlat(
  out: { [i: number]: number },
  oo: number,
  arr0: ArrayLike<number>,
  o0: number,
  arr1: ArrayLike<number>,
  o1: number,
  alpha: number,
): void {
  const ax = arr0[o0]!,
    ay = arr0[o0 + 1]!,
    az = arr0[o0 + 2]!,
    aw = arr0[o0 + 3]!;
  let bx = arr1[o1]!,
    by = arr1[o1 + 1]!,
    bz = arr1[o1 + 2]!,
    bw = arr1[o1 + 3]!;
  if (ax * bx + ay * by + az * bz + aw * bw < 0) {
    bx = -bx;
    by = -by;
    bz = -bz;
    bw = -bw;
  }
  const dn = Math.hypot(ax - bx, ay - by, az - bz, aw - bw);
  const sn = Math.hypot(ax + bx, ay + by, az + bz, aw + bw);
  // Half-angle between the two unit 4-vectors; sin(φ) with φ = 2·atan2(dn, sn).
  const phi = 2 * Math.atan2(dn, sn);
  let s0: number, s1: number;
  const sinPhi = Math.sin(phi);
  if (sinPhi > 1e-9) {
    s0 = Math.sin((1 - alpha) * phi) / sinPhi;
    s1 = Math.sin(alpha * phi) / sinPhi;
  } else {
    s0 = 1 - alpha;
    s1 = alpha;
  }
  let x = ax * s0 + bx * s1,
    y = ay * s0 + by * s1,
    z = az * s0 + bz * s1,
    w = aw * s0 + bw * s1;
  const n = Math.hypot(x, y, z, w);
  if (n > 0) {
    x /= n;
    y /= n;
    z /= n;
    w /= n;
  } else {
    x = y = z = 0;
    w = 1;
  }
  out[oo] = x;
  out[oo + 1] = y;
  out[oo + 2] = z;
  out[oo + 3] = w;
}

const slerpScratch = new Float64Array(4);

/**
 * Pose a body-frame object from samples i and i+1 (or any two sample indices) of a sample-major
 * quaternion channel, interpolated by `alpha` ∈ [0, 1] with `slerpFlat`. Allocation-free.
 */
export function setObjectAttitudeInterpolated(obj: Object3D, q: ArrayLike<number>, i0: number, i1: number, alpha: number): Object3D {
  slerpFlat(slerpScratch, 0, q, 4 * i0, q, 4 * i1, alpha);
  return setObjectAttitude(obj, slerpScratch, 0);
}

/** Engine mat3 (column-major Float64Array(9)) → three Matrix3, a straight element copy. */
export function matrix3FromMat3(target: Matrix3, m: ArrayLike<number>): Matrix3 {
  const e = target.elements;
  for (let i = 0; i < 9; i++) e[i] = m[i]!;
  return target;
}

/** Engine mat3 → the rotation/linear block of a three Matrix4 (no translation). */
export function matrix4FromMat3(target: Matrix4, m: ArrayLike<number>): Matrix4 {
  const e = target.elements;
  // Matrix4 is column-major 4×4: column c occupies e[4c .. 4c+3].
  e[0] = m[0]!;
  e[1] = m[1]!;
  e[2] = m[2]!;
  e[3] = 0;
  e[4] = m[3]!;
  e[5] = m[4]!;
  e[6] = m[5]!;
  e[7] = 0;
  e[8] = m[6]!;
  e[9] = m[7]!;
  e[10] = m[8]!;
  e[11] = 0;
  e[12] = 0;
  e[13] = 0;
  e[14] = 0;
  e[15] = 1;
  return target;
}

/** The 3×3 block of a three Matrix3 back into an engine mat3 (column-major). */
export function mat3FromMatrix3(out: { [i: number]: number }, m: Matrix3): void {
  const e = m.elements;
  for (let i = 0; i < 9; i++) out[i] = e[i]!;
}

/** Draw Z_I up: the camera's up vector is +Z of the scene (= inertial frame). */
export function setInertialZUp(camera: Object3D): void {
  camera.up.set(0, 0, 1);
}
