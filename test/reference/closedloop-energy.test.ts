/**
 * Energy identity on flows through the real closed loop (ideal continuous mode):
 *   dW/dt = −ω_eᵀ K ω_e,   W = k V + ½ ω_eᵀ J⊥ ω_e,
 * for quaternion PD (V = 2(1 − η), K = K_d; methods §2a and §3, Mayhew, Sanfelice & Teel, IEEE TAC
 * 56(11):2555–2566, 2011, tracking form with the passive feedforward) and the synergistic law
 * (V = V_q, K = K_ω; Mayhew & Teel, IEEE TAC 58(11):2730–2742, 2013; methods §4.1), in regulation
 * and while tracking a moving reference, on a gyrostat with a non-diagonal inertia and stored wheel
 * momentum (the gyroscopic terms cancel out of Ẇ, methods §6).
 *
 * Check: five-point central differences of the trace's W (100 Hz output, 2 RK4 steps of 5 ms per
 * sample) against −ω_eᵀKω_e from the trace's q, q_ref, ω and ω_ref, where ω_e = ω − R_eᵀω_d is
 * recomputed here with rotation matrices (not with the engine's tracking code). The stencil error
 * is O(h⁴) (the plain three-point difference, O(h²), already gives ~1e-4 of the peak |Ẇ| at this
 * h, i.e. would hide an error of that size); with it the difference must stay below 1e-6 of the
 * peak |Ẇ|.
 */
import { describe, expect, it } from 'vitest';
import type { ReferenceSource } from '../../app/engine/sim/closedLoop';
import { fly, fixedReference, law, pyramidVehicle, type Vehicle } from './closedloop-fixtures';

const Jrows = [
  [1.2, 0.05, -0.02],
  [0.05, 0.9, 0.03],
  [-0.02, 0.03, 1.5],
];
const veh = pyramidVehicle(Jrows, 5, 50, 2e-3);
const h0 = [0.2, -0.1, 0.15, 0.05]; // stored wheel momentum, N·m·s

/** R(q) rows, q = [x, y, z, w] (body → inertial), written out (methods §1.1). */
function rot(q: ArrayLike<number>, o: number): number[][] {
  const [x, y, z, w] = [q[o]!, q[o + 1]!, q[o + 2]!, q[o + 3]!];
  return [
    [w * w + x * x - y * y - z * z, 2 * (x * y - w * z), 2 * (x * z + w * y)],
    [2 * (x * y + w * z), w * w - x * x + y * y - z * z, 2 * (y * z - w * x)],
    [2 * (x * z - w * y), 2 * (y * z + w * x), w * w - x * x - y * y + z * z],
  ];
}

/** ω_e = ω − R_eᵀ ω_d with R_e = R_dᵀ R, i.e. R_eᵀω_d = Rᵀ R_d ω_d. */
function omegaE(tr: ReturnType<typeof fly>['trace'], k: number): number[] {
  const R = rot(tr.q, 4 * k),
    Rd = rot(tr.qRef, 4 * k);
  const wd = [tr.omegaRef[3 * k], tr.omegaRef[3 * k + 1], tr.omegaRef[3 * k + 2]];
  const inertial = [0, 1, 2].map((i) => Rd[i]![0]! * wd[0]! + Rd[i]![1]! * wd[1]! + Rd[i]![2]! * wd[2]!);
  return [0, 1, 2].map((i) => tr.omega[3 * k + i]! - (R[0]![i]! * inertial[0]! + R[1]![i]! * inertial[1]! + R[2]![i]! * inertial[2]!));
}

/** Largest |central difference of W − (−ω_eᵀKω_e)| over interior flow samples, and the peak |Ẇ|. */
function identityError(
  v: Vehicle,
  spec: Record<string, unknown>,
  K: number[][],
  reference: ReferenceSource,
  q0: number[],
  omega0: number[],
) {
  const r = fly({
    vehicle: v,
    controller: law(spec, v),
    reference,
    q0,
    omega0,
    hWheel0: h0,
    tEnd: 30,
    timing: 'continuous-ideal',
    controlRateHz: 100,
    rk4StepsPerSample: 2,
  });
  expect(r.outcome.status).toBe('completed');
  const tr = r.trace;
  let worst = 0,
    peak = 0,
    used = 0;
  for (let k = 2; k < tr.n - 2; k++) {
    const h = tr.t[k + 1]! - tr.t[k]!;
    let uniform = tr.j[k - 2] === tr.j[k + 2] && tr.segment[k - 2] === tr.segment[k + 2];
    for (let m = k - 2; m < k + 2; m++) uniform &&= Math.abs(tr.t[m + 1]! - tr.t[m]! - h) <= 1e-9;
    if (!uniform) continue;
    // five-point central difference, error O(h⁴) (Abramowitz & Stegun, Handbook, 25.3.6)
    const W = tr.lyapunov;
    const fd = (-W[k + 2]! + 8 * W[k + 1]! - 8 * W[k - 1]! + W[k - 2]!) / (12 * h);
    const e = omegaE(tr, k);
    const Ke = [0, 1, 2].map((i) => K[i]![0]! * e[0]! + K[i]![1]! * e[1]! + K[i]![2]! * e[2]!);
    const wdot = -(e[0]! * Ke[0]! + e[1]! * Ke[1]! + e[2]! * Ke[2]!);
    worst = Math.max(worst, Math.abs(fd - wdot));
    peak = Math.max(peak, Math.abs(wdot));
    used++;
  }
  // the wheels never limited the torque (else the identity would not hold)
  for (let i = 0; i < 3 * tr.n; i++)
    expect(Math.abs(tr.torqueBody[i]! - tr.torqueCmdBody[i]!)).toBeLessThanOrEqual(1e-12 + 1e-12 * Math.abs(tr.torqueCmdBody[i]!));
  return { worst, peak, used, jumps: r.jumps.length };
}

/** q_d(t) = exp(½ φ(t) e), φ = 0.4 (1 − cos 0.25t): ω_d = φ̇ e, ω̇_d = φ̈ e (reference axes). */
function movingReference(): ReferenceSource {
  const e = [0.6, 0, 0.8];
  return {
    at: (t, q, w, wd) => {
      const phi = 0.4 * (1 - Math.cos(0.25 * t)),
        dphi = 0.1 * Math.sin(0.25 * t),
        ddphi = 0.025 * Math.cos(0.25 * t);
      const s = Math.sin(0.5 * phi);
      q[0] = e[0]! * s;
      q[1] = e[1]! * s;
      q[2] = e[2]! * s;
      q[3] = Math.cos(0.5 * phi);
      for (let i = 0; i < 3; i++) {
        w[i] = dphi * e[i]!;
        wd[i] = ddphi * e[i]!;
      }
      return 0;
    },
  };
}

const q0 = (() => {
  const a = [0.3, -0.5, 0.81],
    n = Math.hypot(...a),
    th = 2.2;
  return [...a.map((x) => (x / n) * Math.sin(th / 2)), Math.cos(th / 2)];
})();
const omega0 = [0.05, -0.12, 0.08];

const KD = [
  [0.6, 0, 0],
  [0, 0.9, 0],
  [0, 0, 1.2],
];
const KW = [
  [1.0, 0.1, 0],
  [0.1, 0.8, -0.05],
  [0, -0.05, 1.1],
];
const PD = { kind: 'quaternion-pd', gains: { kp: 0.5, kd: [0.6, 0.9, 1.2] } };
const SYN = { kind: 'synergistic', gains: { kR: 0.3, kOmega: KW }, potential: { eigenvalues: [1, 2, 3] }, warpGain: 0.15, hysteresis: 0.2 };

describe('dW/dt = −ω_eᵀKω_e on flows (ideal continuous mode)', () => {
  for (const [name, spec, K] of [
    ['PD (K_d diagonal)', PD, KD],
    ['synergistic (K_ω full)', SYN, KW],
  ] as const) {
    for (const [mode, ref] of [
      ['regulation', fixedReference],
      ['tracking a moving reference', movingReference],
    ] as const) {
      it(`${name}, ${mode}`, () => {
        const r = identityError(veh, spec, K as number[][], ref(), q0, omega0);
        expect(r.used).toBeGreaterThan(2500);
        expect(r.peak).toBeGreaterThan(1e-3); // the run did dissipate energy
        expect(r.worst).toBeLessThan(1e-6 * r.peak);
      });
    }
  }

  it('counter-check: with a wrong K the same comparison fails (the check can tell)', () => {
    const wrong = KD.map((row) => row.map((x) => 1.1 * x));
    const r = identityError(veh, PD, wrong, fixedReference(), q0, omega0);
    expect(r.worst).toBeGreaterThan(1e-2 * r.peak);
  });
});
