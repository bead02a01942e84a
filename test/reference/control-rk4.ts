/**
 * Test-local closed loop for the controller tests: a rigid body with three reaction wheels along
 * the body axes (G = I, so the wheel-equipped body is a gyrostat, methods §6), a reference attitude
 * integrated from an analytic reference rate, and a classical fixed-step RK4 (Runge–Kutta 4th
 * order, e.g. Hairer, Nørsett & Wanner, Solving ODEs I, §II.1). Written here on purpose, independent
 * of app/engine/body and app/engine/hybrid, so the controller checks do not lean on those modules.
 *
 * State x = [q(4), ω(3), h(3), q_d(4), D(1)], D = ∫ ω_eᵀKω_e dt (dissipation integral).
 * Plant: J ω̇ = −ω × (Jω + h) + τ, ḣ = −τ (body torque τ = −G τ_w with G = I).
 */
import type { AttitudeController, ControlInput, PlantModel } from '../../app/engine/control/types';

export const DIM = 15;

export function plantOf(J: number[][]): PlantModel {
  const Jperp = new Float64Array(9);
  for (let r = 0; r < 3; r++) for (let c = 0; c < 3; c++) Jperp[3 * c + r] = J[r]![c]!;
  return { Jperp, nWheels: 3, axes: Float64Array.of(1, 0, 0, 0, 1, 0, 0, 0, 1) };
}

export interface Reference {
  /** ω_d(t) and ω̇_d(t) in reference axes. */
  rate(t: number, w: Float64Array, wd: Float64Array): void;
}

export const REGULATION: Reference = {
  rate(_t, w, wd) {
    w.fill(0);
    wd.fill(0);
  },
};

export function makeInput(): ControlInput {
  return {
    q: new Float64Array(4),
    omega: new Float64Array(3),
    hWheel: new Float64Array(3),
    qRef: new Float64Array(4),
    omegaRef: new Float64Array(3),
    omegaDotRef: new Float64Array(3),
  };
}

/** Fill a ControlInput from the state at time t. */
export function inputAt(inp: ControlInput, x: ArrayLike<number>, t: number, ref: Reference): ControlInput {
  for (let i = 0; i < 4; i++) inp.q[i] = x[i]!;
  for (let i = 0; i < 3; i++) inp.omega[i] = x[4 + i]!;
  for (let i = 0; i < 3; i++) inp.hWheel[i] = x[7 + i]!;
  for (let i = 0; i < 4; i++) inp.qRef[i] = x[10 + i]!;
  ref.rate(t, inp.omegaRef as Float64Array, inp.omegaDotRef as Float64Array);
  return inp;
}

function quatDot(out: Float64Array, o: number, q: ArrayLike<number>, w: ArrayLike<number>): void {
  // ½ q ⊗ (ω, 0), q = [x, y, z, w]
  const x = q[0]!,
    y = q[1]!,
    z = q[2]!,
    s = q[3]!;
  out[o] = 0.5 * (s * w[0]! + y * w[2]! - z * w[1]!);
  out[o + 1] = 0.5 * (s * w[1]! + z * w[0]! - x * w[2]!);
  out[o + 2] = 0.5 * (s * w[2]! + x * w[1]! - y * w[0]!);
  out[o + 3] = -0.5 * (x * w[0]! + y * w[1]! + z * w[2]!);
}

type Quat4 = [number, number, number, number];

/** ω_e = ω − R_eᵀω_d with q_e = q_d* ⊗ q, computed here by matrices (independent of tracking.ts). */
export function omegaError(x: ArrayLike<number>, wRef: ArrayLike<number>): number[] {
  const q: Quat4 = [x[0]!, x[1]!, x[2]!, x[3]!],
    qd: Quat4 = [x[10]!, x[11]!, x[12]!, x[13]!];
  const R = (p: Quat4) => {
    const [a, b, c, d] = p; // x y z w
    return [
      [d * d + a * a - b * b - c * c, 2 * (a * b - d * c), 2 * (a * c + d * b)],
      [2 * (a * b + d * c), d * d - a * a + b * b - c * c, 2 * (b * c - d * a)],
      [2 * (a * c - d * b), 2 * (b * c + d * a), d * d - a * a - b * b + c * c],
    ];
  };
  const Rb = R(q),
    Rd = R(qd);
  // R_e = R_dᵀ R ; R_eᵀ ω_d = Rᵀ R_d ω_d
  const v = [0, 1, 2].map((i) => Rd[i]![0]! * wRef[0]! + Rd[i]![1]! * wRef[1]! + Rd[i]![2]! * wRef[2]!);
  const wr = [0, 1, 2].map((i) => Rb[0]![i]! * v[0]! + Rb[1]![i]! * v[1]! + Rb[2]![i]! * v[2]!);
  return [x[4]! - wr[0]!, x[5]! - wr[1]!, x[6]! - wr[2]!];
}

export interface LoopOptions {
  ctrl: AttitudeController;
  plant: PlantModel;
  J: number[][];
  ref?: Reference;
  /** Damping matrix K (rows) for the dissipation integral; omit to skip it. */
  K?: number[][];
}

/** Closed-loop derivative with the controller evaluated at every RK stage (continuous law). */
export function makeDerivative(o: LoopOptions, logicRef: { logic: number }) {
  const inp = makeInput();
  const tau = new Float64Array(3);
  const ref = o.ref ?? REGULATION;
  const J = o.J;
  return (t: number, x: Float64Array, dx: Float64Array) => {
    inputAt(inp, x, t, ref);
    o.ctrl.torque(tau, inp, logicRef.logic);
    const w = [x[4]!, x[5]!, x[6]!];
    quatDot(dx, 0, x, w);
    const H = [0, 1, 2].map((i) => J[i]![0]! * w[0]! + J[i]![1]! * w[1]! + J[i]![2]! * w[2]! + x[7 + i]!);
    const rhs = [
      -(w[1]! * H[2]! - w[2]! * H[1]!) + tau[0]!,
      -(w[2]! * H[0]! - w[0]! * H[2]!) + tau[1]!,
      -(w[0]! * H[1]! - w[1]! * H[0]!) + tau[2]!,
    ];
    const wd = solve3(J, rhs);
    dx[4] = wd[0]!;
    dx[5] = wd[1]!;
    dx[6] = wd[2]!;
    dx[7] = -tau[0]!;
    dx[8] = -tau[1]!;
    dx[9] = -tau[2]!;
    quatDot(dx, 10, [x[10]!, x[11]!, x[12]!, x[13]!], inp.omegaRef);
    if (o.K) {
      const e = omegaError(x, inp.omegaRef);
      const K = o.K;
      let d = 0;
      for (let i = 0; i < 3; i++) for (let j = 0; j < 3; j++) d += e[i]! * K[i]![j]! * e[j]!;
      dx[14] = d;
    } else dx[14] = 0;
  };
}

function solve3(M: number[][], b: number[]): number[] {
  const det = (m: number[][]) =>
    m[0]![0]! * (m[1]![1]! * m[2]![2]! - m[1]![2]! * m[2]![1]!) -
    m[0]![1]! * (m[1]![0]! * m[2]![2]! - m[1]![2]! * m[2]![0]!) +
    m[0]![2]! * (m[1]![0]! * m[2]![1]! - m[1]![1]! * m[2]![0]!);
  const d = det(M);
  return [0, 1, 2].map((c) => det(M.map((row, r) => row.map((v, k) => (k === c ? b[r]! : v)))) / d);
}

/** One classical RK4 step of size dt (allocates: test code). Quaternions renormalised after. */
export function rk4Step(f: (t: number, x: Float64Array, dx: Float64Array) => void, t: number, x: Float64Array, dt: number): Float64Array {
  const n = x.length;
  const k1 = new Float64Array(n),
    k2 = new Float64Array(n),
    k3 = new Float64Array(n),
    k4 = new Float64Array(n),
    y = new Float64Array(n);
  f(t, x, k1);
  for (let i = 0; i < n; i++) y[i] = x[i]! + 0.5 * dt * k1[i]!;
  f(t + 0.5 * dt, y, k2);
  for (let i = 0; i < n; i++) y[i] = x[i]! + 0.5 * dt * k2[i]!;
  f(t + 0.5 * dt, y, k3);
  for (let i = 0; i < n; i++) y[i] = x[i]! + dt * k3[i]!;
  f(t + dt, y, k4);
  const out = new Float64Array(n);
  for (let i = 0; i < n; i++) out[i] = x[i]! + (dt / 6) * (k1[i]! + 2 * k2[i]! + 2 * k3[i]! + k4[i]!);
  for (const o of [0, 10]) {
    const m = Math.hypot(out[o]!, out[o + 1]!, out[o + 2]!, out[o + 3]!);
    for (let i = 0; i < 4; i++) out[o + i]! /= m;
  }
  return out;
}

/** Initial state: q (x,y,z,w), ω, h; reference starts at q_d (default identity). */
export function initialState(q: number[], w: number[], h: number[] = [0, 0, 0], qd: number[] = [0, 0, 0, 1]): Float64Array {
  return Float64Array.from([...q, ...w, ...h, ...qd, 0]);
}
