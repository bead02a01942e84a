/**
 * Reaction-wheel array: validated geometry and limits, with the matrices every other wheel
 * function needs precomputed.
 *
 * Model (methods §6 of the project notes; gyrostat as in Markley & Crassidis, Fundamentals of
 * Spacecraft Attitude Determination and Control, Springer 2014, ch. 7):
 * - G = [g₁ … g_N] holds the unit spin axes in the body frame.
 * - Wheel motor torque τ_w,i = ḣ_i (h_i the wheel's axial momentum); the body feels the reaction,
 *   so the body control torque is τ_c = −G τ_w, and the wheels store body-frame momentum G h.
 * - Minimum-2-norm allocation τ_w = −G⁺ τ_c with G⁺ = Gᵀ(GGᵀ)⁻¹; any α in the null space of G
 *   can be added without changing τ_c.
 *
 * Units: N·m, N·m·s, kg·m².
 */
import { IssueList, describe, fail, ok } from '../errors';
import type { Issue, Result } from '../errors';
import { axisSvd, nullSpaceBasis, pseudoInverseFromSvd } from './linalg';

/** One wheel as a person or a scenario file writes it. */
export interface WheelSpec {
  /** Spin axis in body axes; must be unit length (within 1e-6 relative, then normalised). */
  axis: [number, number, number] | number[];
  /** Largest motor torque magnitude, N·m, > 0. */
  maxTorqueNm: number;
  /** Largest stored axial momentum magnitude, N·m·s, > 0. */
  maxMomentumNms: number;
  /** Rotor axial inertia J_s, kg·m², > 0 (wheel speed Ω = h/J_s − gᵀω). */
  rotorInertiaKgm2: number;
}

/** A validated array. Treat every field as read-only. */
export interface WheelArray {
  /** Number of wheels, 3 ≤ n ≤ MAX_WHEELS. */
  n: number;
  /** 3n: unit spin axis of wheel i at [3i .. 3i+2], body frame (the columns of G). */
  axes: Float64Array;
  maxTorqueNm: Float64Array;
  maxMomentumNms: Float64Array;
  rotorInertiaKgm2: Float64Array;
  /** n×3 row-major: row i is row i of G⁺ = Gᵀ(GGᵀ)⁻¹. */
  pinv: Float64Array;
  /** (n−3) orthonormal null-space vectors of G, each of length n, concatenated. */
  nullBasis: Float64Array;
  /** Singular values of G, descending (for conditioning reports). */
  singularValues: Float64Array;
}

/** Upper bound on wheel count: keeps the per-step linear programs and envelopes small. */
export const MAX_WHEELS = 24;

/** Axes whose norm is within this relative distance of 1 are normalised (with a warning). */
const AXIS_UNIT_TOLERANCE = 1e-6;
/** Deviation below this is rounding, normalised silently. */
const AXIS_ROUNDING = 1e-12;
/** G counts as rank-deficient when σ_min ≤ this × σ_max. */
const SPAN_TOLERANCE = 1e-6;
/** Below this σ_min/σ_max the array works but allocations are large: warn. */
const CONDITION_WARNING = 1e-2;
/** Elements inspected when far too many are given (bounded work on garbage input). */
const INSPECT_LIMIT = 64;

/** Build and validate an array. `path` prefixes every issue (e.g. `vehicle.wheels`). */
export function makeWheelArray(specs: unknown, path = 'wheels'): Result<WheelArray> {
  const errs = new IssueList();
  const warnings: Issue[] = [];
  const isList = Array.isArray(specs);
  if (!isList) {
    errs.add(path, 'array', `${path} must be a list of wheels (got ${describe(specs)})`);
    return fail(errs.items);
  }
  const list = specs as unknown[];
  const n = list.length;
  if (n < 3) {
    errs.add(path, 'min-wheels', `${path} needs at least 3 wheels to give torque about every axis (got ${n})`);
  }
  if (n > MAX_WHEELS) {
    errs.add(path, 'max-wheels', `${path} may hold at most ${MAX_WHEELS} wheels (got ${n}); only the first ${INSPECT_LIMIT} are checked`);
  }
  const m = Math.min(n, INSPECT_LIMIT);
  const axes = new Float64Array(3 * m);
  const axisOk = new Array<boolean>(m).fill(false);
  const maxTorqueNm = new Float64Array(m);
  const maxMomentumNms = new Float64Array(m);
  const rotorInertiaKgm2 = new Float64Array(m);
  for (let i = 0; i < m; i++) {
    const p = `${path}[${i}]`;
    const w = list[i];
    if (typeof w !== 'object' || w === null || Array.isArray(w)) {
      errs.add(p, 'object', `${p} must be an object with axis, maxTorqueNm, maxMomentumNms, rotorInertiaKgm2 (got ${describe(w)})`);
      continue;
    }
    const rec = w as Record<string, unknown>;
    axisOk[i] = readAxis(errs, warnings, `${p}.axis`, rec.axis, axes, i);
    if (errs.positive(`${p}.maxTorqueNm`, rec.maxTorqueNm)) maxTorqueNm[i] = rec.maxTorqueNm;
    if (errs.positive(`${p}.maxMomentumNms`, rec.maxMomentumNms)) maxMomentumNms[i] = rec.maxMomentumNms;
    if (errs.positive(`${p}.rotorInertiaKgm2`, rec.rotorInertiaKgm2)) rotorInertiaKgm2[i] = rec.rotorInertiaKgm2;
  }
  // The span test needs every axis; with a broken axis it would only add noise.
  let svd = null as ReturnType<typeof axisSvd> | null;
  if (n >= 3 && n <= MAX_WHEELS && axisOk.every(Boolean)) {
    svd = axisSvd(axes, n);
    const s0 = svd.sigma[0]!,
      s2 = svd.sigma[2]!;
    const rank = svd.sigma.reduce((r, s) => r + (s > SPAN_TOLERANCE * s0 ? 1 : 0), 0);
    if (rank < 3) {
      errs.add(
        path,
        'axes-span-3d',
        `${path} axes span only ${rank === 2 ? 'a plane' : 'a line'} (rank ${rank}; smallest singular value of G ` +
          `${s2.toExponential(3)} vs largest ${s0.toPrecision(6)}), so some body torques cannot be produced`,
      );
    } else if (s2 < CONDITION_WARNING * s0) {
      warnings.push({
        path,
        rule: 'axes-conditioning',
        message: `${path} axes are nearly coplanar (σ_min/σ_max = ${(s2 / s0).toExponential(3)}): torque along the weak direction needs large wheel torques`,
      });
    }
    parallelWarnings(warnings, path, axes, n);
  }
  if (!errs.empty || svd === null) return fail(errs.items, warnings);
  const pinv = pseudoInverseFromSvd(new Float64Array(3 * n), svd, n);
  const nullBasis = nullSpaceBasis(axes, n);
  return ok({ n, axes, maxTorqueNm, maxMomentumNms, rotorInertiaKgm2, pinv, nullBasis, singularValues: svd.sigma }, warnings);
}

function readAxis(errs: IssueList, warnings: Issue[], p: string, v: unknown, axes: Float64Array, i: number): boolean {
  const isVec = Array.isArray(v) || (ArrayBuffer.isView(v) && !(v instanceof DataView));
  const arr = v as ArrayLike<unknown>;
  if (!isVec || arr.length !== 3) {
    errs.add(p, 'vector3', `${p} must be a list of 3 numbers (got ${describe(v)})`);
    return false;
  }
  let finite = true;
  for (let c = 0; c < 3; c++) finite = errs.finite(`${p}[${c}]`, arr[c]) && finite;
  if (!finite) return false;
  const x = arr[0] as number,
    y = arr[1] as number,
    z = arr[2] as number;
  const norm = Math.hypot(x, y, z);
  if (norm === 0) {
    errs.add(p, 'nonzero-axis', `${p} is the zero vector; a spin axis needs a direction`);
    return false;
  }
  const dev = Math.abs(norm - 1);
  if (dev > AXIS_UNIT_TOLERANCE) {
    errs.add(p, 'unit-norm', `${p} must have unit length (got |axis| = ${norm.toPrecision(8)}); normalise it first`);
    return false;
  }
  if (dev > AXIS_ROUNDING) {
    warnings.push({ path: p, rule: 'unit-norm', message: `${p} had length ${norm.toPrecision(10)}; normalised` });
  }
  axes[3 * i] = x / norm;
  axes[3 * i + 1] = y / norm;
  axes[3 * i + 2] = z / norm;
  return true;
}

/** Parallel or opposite axes are legal (redundant wheels) but usually a typing slip: warn. */
function parallelWarnings(warnings: Issue[], path: string, axes: Float64Array, n: number): void {
  for (let i = 0; i < n; i++) {
    for (let j = i + 1; j < n; j++) {
      const cx = axes[3 * i + 1]! * axes[3 * j + 2]! - axes[3 * i + 2]! * axes[3 * j + 1]!;
      const cy = axes[3 * i + 2]! * axes[3 * j]! - axes[3 * i]! * axes[3 * j + 2]!;
      const cz = axes[3 * i]! * axes[3 * j + 1]! - axes[3 * i + 1]! * axes[3 * j]!;
      if (Math.hypot(cx, cy, cz) <= 1e-8) {
        warnings.push({
          path: `${path}[${j}].axis`,
          rule: 'parallel-axes',
          message: `${path}[${j}].axis is parallel to ${path}[${i}].axis (within 1e-8 rad); in the envelopes the pair acts as one wheel with the summed limits`,
        });
      }
    }
  }
}

/** out (length n) = G⁺ v: minimum-norm wheel-space image of a body vector (e.g. momentum H → h). */
export function applyPinv(out: Float64Array, arr: WheelArray, v: ArrayLike<number>): Float64Array {
  const x = v[0]!,
    y = v[1]!,
    z = v[2]!;
  const p = arr.pinv;
  for (let i = 0; i < arr.n; i++) out[i] = p[3 * i]! * x + p[3 * i + 1]! * y + p[3 * i + 2]! * z;
  return out;
}

/** out (3) = G w: body-frame sum of wheel quantities (e.g. stored momentum G h). */
export function applyAxes(out: Float64Array, arr: WheelArray, w: ArrayLike<number>): Float64Array {
  let x = 0,
    y = 0,
    z = 0;
  const a = arr.axes;
  for (let i = 0; i < arr.n; i++) {
    const wi = w[i]!;
    x += a[3 * i]! * wi;
    y += a[3 * i + 1]! * wi;
    z += a[3 * i + 2]! * wi;
  }
  out[0] = x;
  out[1] = y;
  out[2] = z;
  return out;
}

/** out (3) = −G τ_w: the body torque the wheel motor torques produce (reaction). */
export function bodyTorqueFromWheelTorque(out: Float64Array, arr: WheelArray, wheelTorque: ArrayLike<number>): Float64Array {
  applyAxes(out, arr, wheelTorque);
  out[0] = -out[0]!;
  out[1] = -out[1]!;
  out[2] = -out[2]!;
  return out;
}

/** Largest |τ_w,i| / τ_max,i: 1 means some wheel is exactly at its torque limit. */
export function peakTorqueRatio(arr: WheelArray, wheelTorque: ArrayLike<number>): number {
  let r = 0;
  for (let i = 0; i < arr.n; i++) r = Math.max(r, Math.abs(wheelTorque[i]!) / arr.maxTorqueNm[i]!);
  return r;
}
