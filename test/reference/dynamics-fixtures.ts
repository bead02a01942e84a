/**
 * Invented test vehicles and hybrid-system wrappers for the dynamics tests and the engine bench.
 * "Pyra-4" is a fictional 6U-class bus (no real mission): Lumen-6-like inertia with small
 * products of inertia, four wheels in a pyramid with sin β = 1/√3 (methods §6), rotor axial
 * inertias chosen so that ~6 mN·m·s is reached near 4000 rpm (references §5 ranges).
 */
import { gyrostatDerivative, makeGyrostat } from '../../app/engine/body/gyrostat';
import type { Gyrostat, WheelFrictionInput } from '../../app/engine/body/gyrostat';
import type { HybridSystem } from '../../app/engine/hybrid/index';
import { m3Diag, m3FromRows } from '../../app/engine/math/mat3';
import { qNormalize } from '../../app/engine/math/rotation';

export const PYRA4_INERTIA_ROWS = [
  [0.11, 0.002, -0.001],
  [0.002, 0.12, 0.0015],
  [-0.001, 0.0015, 0.08],
];

export function pyramidAxes(): Float64Array {
  const sb = 1 / Math.sqrt(3),
    cb = Math.sqrt(2 / 3);
  const axes = new Float64Array(12);
  for (let i = 0; i < 4; i++) {
    const phi = (i * Math.PI) / 2;
    axes[3 * i] = cb * Math.cos(phi);
    axes[3 * i + 1] = cb * Math.sin(phi);
    axes[3 * i + 2] = sb;
  }
  return axes;
}

export function pyra4(friction?: WheelFrictionInput): Gyrostat {
  const r = makeGyrostat(
    m3FromRows(PYRA4_INERTIA_ROWS),
    {
      n: 4,
      axes: pyramidAxes(),
      rotorInertiaKgm2: new Float64Array([1.4e-5, 1.5e-5, 1.45e-5, 1.55e-5]),
    },
    friction,
  );
  if (!r.ok) throw new Error(JSON.stringify(r.errors));
  return r.value;
}

export function rigidBody(I1: number, I2: number, I3: number): Gyrostat {
  const r = makeGyrostat(m3Diag(I1, I2, I3), { n: 0, axes: new Float64Array(0), rotorInertiaKgm2: new Float64Array(0) });
  if (!r.ok) throw new Error(JSON.stringify(r.errors));
  return r.value;
}

/** Initial state of the Pyra-4 runs: a tumble plus stored wheel momentum. */
export function pyra4InitialState(): Float64Array {
  const x = new Float64Array(11);
  const q = new Float64Array([0.1, -0.2, 0.3, 0.9]);
  qNormalize(q, q);
  x.set(q, 0);
  x.set([0.02, -0.01, 0.015], 4);
  x.set([1e-3, -5e-4, 2e-3, 0], 7);
  return x;
}

/** Smooth per-wheel test torques τ_i(t) = A_i sin(ν_i t + φ_i), N·m (different on every wheel). */
export const TORQUE_AMP = [1.0e-4, 0.8e-4, 1.2e-4, 0.6e-4];
export const TORQUE_FREQ = [0.05, 0.031, 0.07, 0.023];
export const TORQUE_PHASE = [0, 1.1, 2.3, -0.7];

export function testWheelTorque(out: Float64Array, t: number): Float64Array {
  for (let i = 0; i < 4; i++) out[i] = TORQUE_AMP[i]! * Math.sin(TORQUE_FREQ[i]! * t + TORQUE_PHASE[i]!);
  return out;
}

const ZERO3 = new Float64Array(3);

/** Continuous torque profile, no jumps: a plain flow for integrator comparisons. */
export function wheelDrivenFlow(g: Gyrostat): HybridSystem & { f: (t: number, x: Float64Array, dx: Float64Array) => void } {
  const tau = new Float64Array(g.n);
  const f = (t: number, x: Float64Array, dx: Float64Array): void => {
    if (g.n === 4) testWheelTorque(tau, t);
    gyrostatDerivative(dx, x, g, tau, ZERO3);
  };
  return { dim: g.dim, flow: f, f, jump: () => null };
}

/**
 * The same torque profile held by a 10 Hz zero-order hold: state = [gyrostat (11), held
 * torques (4)], a timer jump at every k·Ts loads τ(k·Ts). The held torques sit in the state so
 * the arc shows them; their derivative is zero.
 */
export function zohWheelSystem(g: Gyrostat, Ts: number): HybridSystem {
  const n = g.n,
    dim = g.dim + n;
  const held = new Float64Array(n);
  let nextK = 0; // one system object per run: the sample counter lives here
  return {
    dim,
    flow(_t, x, dx) {
      for (let i = 0; i < n; i++) held[i] = x[g.dim + i]!;
      gyrostatDerivative(dx, x, g, held, ZERO3);
      for (let i = 0; i < n; i++) dx[g.dim + i] = 0;
    },
    nextScheduledJump() {
      // k·Ts from the sample index, not accumulated, so sample times stay exact multiples.
      return nextK * Ts;
    },
    jump(t, _x, xPlus) {
      testWheelTorque(held, t);
      for (let i = 0; i < n; i++) xPlus[g.dim + i] = held[i]!;
      nextK = Math.round(t / Ts) + 1;
      return null;
    },
    project(x) {
      const s = 1 / Math.sqrt(x[0]! * x[0]! + x[1]! * x[1]! + x[2]! * x[2]! + x[3]! * x[3]!);
      x[0]! *= s;
      x[1]! *= s;
      x[2]! *= s;
      x[3]! *= s;
      return false; // RK4 evaluates its first stage afresh every step, so nothing is stale
    },
  };
}

/**
 * The same zero-order hold with the held torques kept in the system's closure instead of the
 * state (as a closed-loop controller keeps its output): state = the gyrostat's 11 values.
 * `torqueAt(out, k)` gives the held torques of sample k (default: testWheelTorque at k·Ts).
 */
export function zohWheelSystemCompact(
  g: Gyrostat,
  Ts: number,
  torqueAt: (out: Float64Array, k: number) => void = (out, k) => {
    testWheelTorque(out, k * Ts);
  },
): HybridSystem {
  const held = new Float64Array(g.n);
  let nextK = 0;
  return {
    dim: g.dim,
    flow(_t, x, dx) {
      gyrostatDerivative(dx, x, g, held, ZERO3);
    },
    nextScheduledJump() {
      return nextK * Ts;
    },
    jump(t) {
      const k = Math.round(t / Ts);
      torqueAt(held, k);
      nextK = k + 1;
      return null;
    },
    project(x) {
      const s = 1 / Math.sqrt(x[0]! * x[0]! + x[1]! * x[1]! + x[2]! * x[2]! + x[3]! * x[3]!);
      x[0]! *= s;
      x[1]! *= s;
      x[2]! *= s;
      x[3]! *= s;
      return false;
    },
  };
}
