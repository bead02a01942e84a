/**
 * Rigid spacecraft with reaction wheels (a gyrostat), methods note §6.
 *
 * State x (length 7 + n): [ q (4: x, y, z, w; qInertialFromBody), ω (3, body axes, rad/s),
 * h (n: ABSOLUTE axial wheel momenta h_i = J_s,i (g_iᵀω + Ω_i), N·m·s) ].
 * With J the whole-spacecraft inertia (wheels included), G = [g_1 … g_n] the unit spin axes and
 * J_s = diag(J_s,i) the rotor axial inertias, J_⊥ = J − G J_s Gᵀ and
 *   H = J_⊥ ω + G h                                     (total momentum, body axes)
 *   J_⊥ ω̇ = −ω × (J_⊥ ω + G h) − G τ + τ_ext,  ḣ = τ      (τ = motor torque + friction, on the wheels)
 *   q̇ = ½ q ⊗ (ω, 0).
 * This is Euler's equation Ḣ + ω × H = τ_ext with constant G; the matrix in front of ω̇ is J_⊥
 * (using J there is only approximate). Friction acts between rotor and body, so it is internal
 * and leaves the inertial total momentum R(q) H unchanged; it only dissipates energy.
 *
 * This module takes the wheel geometry as a structural type so it does not depend on the wheels
 * module.
 */
import type { Issue, Result } from '../errors';
import { fail, issue, ok } from '../errors';
import { allFinite } from '../math/arrays';
import type { Mat3, Vec3 } from '../math/mat3';
import { m3Create, m3Invert, symmetricEigen3, v3Create } from '../math/mat3';

export interface WheelGeometry {
  n: number;
  /** 3n values: unit spin axis of wheel i in body axes at [3i .. 3i+2]. */
  axes: Float64Array;
  /** n rotor axial inertias J_s,i, kg·m². */
  rotorInertiaKgm2: Float64Array;
}

export interface WheelFrictionInput {
  /** Viscous coefficient c_i, N·m·s/rad (torque −c_i Ω_i on the rotor). Scalar = same for all. */
  viscousNmsPerRad: Float64Array | number;
  /** Coulomb level, N·m (torque −τ_c,i tanh(Ω_i / Ω_s) on the rotor). Scalar = same for all. */
  coulombNm: Float64Array | number;
  /** Speed Ω_s below which the Coulomb term is smoothed (tanh), rad/s; default 0.5. */
  coulombSmoothingRadPerS?: number;
}

export interface Gyrostat {
  /** Whole-spacecraft inertia including the wheels, kg·m², column-major. */
  J: Mat3;
  /** J − G J_s Gᵀ, kg·m². */
  Jperp: Mat3;
  JperpInv: Mat3;
  n: number;
  /** 3n unit axes (copied). */
  axes: Float64Array;
  /** n rotor axial inertias (copied). */
  Js: Float64Array;
  /** 1 / J_s,i. */
  JsInv: Float64Array;
  friction: {
    viscousNmsPerRad: Float64Array;
    coulombNm: Float64Array;
    coulombSmoothingRadPerS: number;
    /** False when every coefficient is zero (the derivative then skips the friction terms). */
    active: boolean;
  };
  /** State length 7 + n. */
  dim: number;
}

const UNIT_TOL = 1e-6;
const DEFAULT_COULOMB_SMOOTHING = 0.5;

function perWheel(v: Float64Array | number | undefined, n: number, path: string, errors: Issue[]): Float64Array {
  const out = new Float64Array(n);
  if (v === undefined) return out;
  if (typeof v === 'number') {
    if (!Number.isFinite(v) || v < 0) errors.push(issue(path, 'non-negative', `${path} must be a finite number ≥ 0 (got ${v})`));
    else out.fill(v);
    return out;
  }
  if (!(v instanceof Float64Array) || v.length !== n) {
    errors.push(issue(path, 'shape', `${path} must be a number or a Float64Array of length ${n}`));
    return out;
  }
  for (let i = 0; i < n; i++) {
    if (!Number.isFinite(v[i]) || v[i]! < 0) {
      errors.push(issue(`${path}[${i}]`, 'non-negative', `${path}[${i}] must be a finite number ≥ 0 (got ${v[i]})`));
    } else out[i] = v[i]!;
  }
  return out;
}

/**
 * Build a gyrostat. `J` must already be a valid inertia (see validateInertia); it is checked
 * again for symmetry and definiteness. Wheel axes must be unit (within 1e-6), rotor inertias
 * positive, friction coefficients ≥ 0, and J_⊥ = J − G J_s Gᵀ positive definite (rule
 * `transverse-inertia-positive-definite` at `wheels.rotorInertiaKgm2`: the rotors are too heavy
 * for the stated whole-spacecraft inertia).
 */
export function makeGyrostat(J: Mat3, wheels: WheelGeometry, friction?: WheelFrictionInput): Result<Gyrostat> {
  const errors: Issue[] = [];
  let jOk = J instanceof Float64Array && J.length === 9;
  if (!jOk) errors.push(issue('inertia', 'shape', 'inertia must be a column-major Float64Array(9)'));
  else {
    jOk = allFinite(J);
    if (!jOk) errors.push(issue('inertia', 'finite', 'inertia entries must be finite'));
  }
  const n = wheels?.n;
  if (!Number.isInteger(n) || n < 0) {
    errors.push(issue('wheels.n', 'integer', `wheels.n must be an integer ≥ 0 (got ${n})`));
    return fail(errors);
  }
  const axes = new Float64Array(3 * n);
  const Js = new Float64Array(n);
  if (!(wheels.axes instanceof Float64Array) || wheels.axes.length !== 3 * n) {
    errors.push(issue('wheels.axes', 'shape', `wheels.axes must be a Float64Array of length 3n = ${3 * n}`));
  } else {
    for (let i = 0; i < n; i++) {
      const x = wheels.axes[3 * i]!,
        y = wheels.axes[3 * i + 1]!,
        z = wheels.axes[3 * i + 2]!;
      const len = Math.hypot(x, y, z);
      if (!Number.isFinite(len) || Math.abs(len - 1) > UNIT_TOL) {
        errors.push(issue(`wheels.axes[${i}]`, 'unit-norm', `wheels.axes[${i}] must be a unit vector (length ${len})`));
      } else {
        axes[3 * i] = x;
        axes[3 * i + 1] = y;
        axes[3 * i + 2] = z;
      }
    }
  }
  if (!(wheels.rotorInertiaKgm2 instanceof Float64Array) || wheels.rotorInertiaKgm2.length !== n) {
    errors.push(issue('wheels.rotorInertiaKgm2', 'shape', `wheels.rotorInertiaKgm2 must be a Float64Array of length ${n}`));
  } else {
    for (let i = 0; i < n; i++) {
      const v = wheels.rotorInertiaKgm2[i]!;
      if (!Number.isFinite(v) || v <= 0) {
        errors.push(
          issue(`wheels.rotorInertiaKgm2[${i}]`, 'positive', `wheels.rotorInertiaKgm2[${i}] must be a finite number > 0 (got ${v})`),
        );
      } else Js[i] = v;
    }
  }
  const viscous = perWheel(friction?.viscousNmsPerRad, n, 'friction.viscousNmsPerRad', errors);
  const coulomb = perWheel(friction?.coulombNm, n, 'friction.coulombNm', errors);
  const smoothing = friction?.coulombSmoothingRadPerS ?? DEFAULT_COULOMB_SMOOTHING;
  if (!Number.isFinite(smoothing) || smoothing <= 0) {
    errors.push(issue('friction.coulombSmoothingRadPerS', 'positive', `friction.coulombSmoothingRadPerS must be > 0 (got ${smoothing})`));
  }
  if (!jOk || errors.length) return fail(errors);

  const Jc = new Float64Array(J);
  const scale = Math.max(...Array.from(Jc, Math.abs));
  for (const [r, c] of [
    [0, 1],
    [0, 2],
    [1, 2],
  ] as const) {
    if (Math.abs(Jc[3 * c + r]! - Jc[3 * r + c]!) > 1e-6 * scale) {
      errors.push(issue(`inertia[${r}][${c}]`, 'symmetric', `inertia[${r}][${c}] and inertia[${c}][${r}] differ`));
    }
  }
  const ev = v3Create();
  symmetricEigen3(Jc, ev, m3Create());
  if (!(ev[0]! > 1e-12 * ev[2]!)) {
    errors.push(issue('inertia', 'positive-definite', `inertia must be positive definite; smallest eigenvalue ${ev[0]} kg·m²`));
  }
  const Jperp = new Float64Array(Jc);
  for (let i = 0; i < n; i++) {
    for (let r = 0; r < 3; r++) for (let c = 0; c < 3; c++) Jperp[3 * c + r]! -= Js[i]! * axes[3 * i + r]! * axes[3 * i + c]!;
  }
  const evp = v3Create();
  symmetricEigen3(Jperp, evp, m3Create());
  const JperpInv = m3Create();
  if (!(evp[0]! > 1e-12 * ev[2]!) || !m3Invert(JperpInv, Jperp)) {
    errors.push(
      issue(
        'wheels.rotorInertiaKgm2',
        'transverse-inertia-positive-definite',
        `J − G·J_s·Gᵀ (the inertia the body shows once the rotors spin freely) must be positive definite; ` +
          `its smallest eigenvalue is ${evp[0]} kg·m²: the rotor inertias are too large for the whole-spacecraft inertia`,
      ),
    );
  }
  if (errors.length) return fail(errors);
  let active = false;
  for (let i = 0; i < n; i++) if (viscous[i]! > 0 || coulomb[i]! > 0) active = true;
  const JsInv = new Float64Array(n);
  for (let i = 0; i < n; i++) JsInv[i] = 1 / Js[i]!;
  return ok({
    J: Jc,
    Jperp,
    JperpInv,
    n,
    axes,
    Js,
    JsInv,
    friction: { viscousNmsPerRad: viscous, coulombNm: coulomb, coulombSmoothingRadPerS: smoothing, active },
    dim: 7 + n,
  });
}

/**
 * dx = f(x) for the gyrostat (writes dx[0 .. 6+n]; other entries of dx are left alone).
 * `wheelMotorTorque` (n values, N·m) is the motor torque on each rotor; `extTorque` (3, body
 * axes, N·m) the external torque. Friction on the rotor opposes the relative spin
 * Ω_i = h_i/J_s,i − g_iᵀω: −c_i Ω_i − τ_c,i tanh(Ω_i/Ω_s). No allocation.
 */
export function gyrostatDerivative(
  dx: Float64Array,
  x: ArrayLike<number>,
  g: Gyrostat,
  wheelMotorTorque: ArrayLike<number>,
  extTorque: ArrayLike<number>,
): void {
  const qx = x[0]!,
    qy = x[1]!,
    qz = x[2]!,
    qw = x[3]!;
  const wx = x[4]!,
    wy = x[5]!,
    wz = x[6]!;
  // q̇ = ½ q ⊗ (ω, 0), scalar-last Hamilton product.
  dx[0] = 0.5 * (qw * wx + qy * wz - qz * wy);
  dx[1] = 0.5 * (qw * wy + qz * wx - qx * wz);
  dx[2] = 0.5 * (qw * wz + qx * wy - qy * wx);
  dx[3] = -0.5 * (qx * wx + qy * wy + qz * wz);
  const P = g.Jperp;
  let Hx = P[0]! * wx + P[3]! * wy + P[6]! * wz;
  let Hy = P[1]! * wx + P[4]! * wy + P[7]! * wz;
  let Hz = P[2]! * wx + P[5]! * wy + P[8]! * wz;
  let bx = extTorque[0]!,
    by = extTorque[1]!,
    bz = extTorque[2]!;
  const ax = g.axes,
    n = g.n;
  const fr = g.friction;
  const active = fr.active;
  for (let i = 0; i < n; i++) {
    const gx = ax[3 * i]!,
      gy = ax[3 * i + 1]!,
      gz = ax[3 * i + 2]!;
    const h = x[7 + i]!;
    Hx += gx * h;
    Hy += gy * h;
    Hz += gz * h;
    let tau = wheelMotorTorque[i]!;
    if (active) {
      const rel = h * g.JsInv[i]! - (gx * wx + gy * wy + gz * wz);
      tau -= fr.viscousNmsPerRad[i]! * rel + fr.coulombNm[i]! * Math.tanh(rel / fr.coulombSmoothingRadPerS);
    }
    dx[7 + i] = tau;
    bx -= gx * tau;
    by -= gy * tau;
    bz -= gz * tau;
  }
  // rhs = −ω × H + b
  const rx = bx - (wy * Hz - wz * Hy);
  const ry = by - (wz * Hx - wx * Hz);
  const rz = bz - (wx * Hy - wy * Hx);
  const M = g.JperpInv;
  dx[4] = M[0]! * rx + M[3]! * ry + M[6]! * rz;
  dx[5] = M[1]! * rx + M[4]! * ry + M[7]! * rz;
  dx[6] = M[2]! * rx + M[5]! * ry + M[8]! * rz;
}

/**
 * Bearing friction on each rotor at state x (the torque gyrostatDerivative subtracts from the
 * motor torque, so ḣ_i = τ_motor,i − out_i), N·m. Zeros when the gyrostat has no friction.
 */
export function wheelFrictionTorque(out: Float64Array, x: ArrayLike<number>, g: Gyrostat): Float64Array {
  return frictionCore(out, x[4]!, x[5]!, x[6]!, x, 7, g);
}

/**
 * The same bearing friction from the body rate ω (3) and the wheel momenta h (n) held apart,
 * N·m (no state vector to assemble in the closed loop's per-sample path).
 */
export function wheelFrictionTorqueAt(out: Float64Array, omega: ArrayLike<number>, h: ArrayLike<number>, g: Gyrostat): Float64Array {
  return frictionCore(out, omega[0]!, omega[1]!, omega[2]!, h, 0, g);
}

/** Friction with ω = (wx, wy, wz) and wheel momentum i at h[o + i]. */
function frictionCore(out: Float64Array, wx: number, wy: number, wz: number, h: ArrayLike<number>, o: number, g: Gyrostat): Float64Array {
  const fr = g.friction;
  const ax = g.axes;
  for (let i = 0; i < g.n; i++) {
    if (!fr.active) {
      out[i] = 0;
      continue;
    }
    const rel = h[o + i]! * g.JsInv[i]! - (ax[3 * i]! * wx + ax[3 * i + 1]! * wy + ax[3 * i + 2]! * wz);
    out[i] = fr.viscousNmsPerRad[i]! * rel + fr.coulombNm[i]! * Math.tanh(rel / fr.coulombSmoothingRadPerS);
  }
  return out;
}

/** Total angular momentum in body axes, H = J_⊥ ω + G h, N·m·s. */
export function totalMomentumBody(out: Vec3, x: ArrayLike<number>, g: Gyrostat): Vec3 {
  const wx = x[4]!,
    wy = x[5]!,
    wz = x[6]!;
  const P = g.Jperp;
  let Hx = P[0]! * wx + P[3]! * wy + P[6]! * wz;
  let Hy = P[1]! * wx + P[4]! * wy + P[7]! * wz;
  let Hz = P[2]! * wx + P[5]! * wy + P[8]! * wz;
  for (let i = 0; i < g.n; i++) {
    const h = x[7 + i]!;
    Hx += g.axes[3 * i]! * h;
    Hy += g.axes[3 * i + 1]! * h;
    Hz += g.axes[3 * i + 2]! * h;
  }
  out[0] = Hx;
  out[1] = Hy;
  out[2] = Hz;
  return out;
}

/**
 * Total angular momentum in inertial axes, R(q)·H. The quaternion is normalised on the fly, so a
 * slightly non-unit q from an integrator does not scale the result.
 */
export function totalMomentumInertial(out: Vec3, x: ArrayLike<number>, g: Gyrostat): Vec3 {
  totalMomentumBody(out, x, g);
  const nq = Math.hypot(x[0]!, x[1]!, x[2]!, x[3]!);
  const qx = x[0]! / nq,
    qy = x[1]! / nq,
    qz = x[2]! / nq,
    qw = x[3]! / nq;
  const vx = out[0]!,
    vy = out[1]!,
    vz = out[2]!;
  // v' = v + 2w (q_v × v) + 2 q_v × (q_v × v)
  const tx = 2 * (qy * vz - qz * vy);
  const ty = 2 * (qz * vx - qx * vz);
  const tz = 2 * (qx * vy - qy * vx);
  out[0] = vx + qw * tx + (qy * tz - qz * ty);
  out[1] = vy + qw * ty + (qz * tx - qx * tz);
  out[2] = vz + qw * tz + (qx * ty - qy * tx);
  return out;
}

/**
 * Kinetic energy T = ½ ωᵀ J_⊥ ω + Σ h_i² / (2 J_s,i), J. (The rotor's axial energy is
 * ½ J_s (g·ω + Ω)² = h²/(2 J_s); its transverse part is inside J_⊥.)
 */
export function kineticEnergy(x: ArrayLike<number>, g: Gyrostat): number {
  const wx = x[4]!,
    wy = x[5]!,
    wz = x[6]!;
  const P = g.Jperp;
  const Hx = P[0]! * wx + P[3]! * wy + P[6]! * wz;
  const Hy = P[1]! * wx + P[4]! * wy + P[7]! * wz;
  const Hz = P[2]! * wx + P[5]! * wy + P[8]! * wz;
  let T = 0.5 * (wx * Hx + wy * Hy + wz * Hz);
  for (let i = 0; i < g.n; i++) T += 0.5 * x[7 + i]! * x[7 + i]! * g.JsInv[i]!;
  return T;
}

/** Wheel spin relative to the body, Ω_i = h_i / J_s,i − g_iᵀ ω, rad/s (n values). */
export function wheelRelativeSpeed(out: Float64Array, x: ArrayLike<number>, g: Gyrostat): Float64Array {
  const wx = x[4]!,
    wy = x[5]!,
    wz = x[6]!;
  for (let i = 0; i < g.n; i++) {
    out[i] = x[7 + i]! * g.JsInv[i]! - (g.axes[3 * i]! * wx + g.axes[3 * i + 1]! * wy + g.axes[3 * i + 2]! * wz);
  }
  return out;
}

/** Absolute axial momentum from a relative wheel speed: h_i = J_s,i (g_iᵀ ω + Ω_i). */
export function wheelMomentumFromRelativeSpeed(
  out: Float64Array,
  omegaBody: ArrayLike<number>,
  relSpeed: ArrayLike<number>,
  g: Gyrostat,
): Float64Array {
  for (let i = 0; i < g.n; i++) {
    const gw = g.axes[3 * i]! * omegaBody[0]! + g.axes[3 * i + 1]! * omegaBody[1]! + g.axes[3 * i + 2]! * omegaBody[2]!;
    out[i] = g.Js[i]! * (gw + relSpeed[i]!);
  }
  return out;
}
