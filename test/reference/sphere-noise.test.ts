/**
 * The smooth pointing law near its antipode, against the synergistic law, through the real closed
 * loop (runClosedLoop unchanged; the noise enters through a controller wrapper until the lead wires
 * app/engine/control/sphere/noise.ts into the sensors).
 *
 * Sources:
 *  - Obstruction and its consequence (Bhat & Bernstein, Systems & Control Letters 39(1):63–70,
 *    2000; the noise mechanism: Mayhew, Sanfelice & Teel, IEEE TAC 56(11), 2011 and 58(5), 2013):
 *    a smooth law has an undesired equilibrium (here y = −b); near it the law hesitates, and a
 *    bounded noise of any size ē > 0 can hold it there; a synergistic law with δ above the noise's
 *    effect is not held.
 *  - Hesitation time (elementary linear ODE, derived here): tilting about a principal axis ⊥ b
 *    (inertia J_a) from rest at a distance ψ from −b, the law gives J_a ψ̈ = k_p sin ψ − k_d ψ̇ ≈
 *    k_p ψ − k_d ψ̇, whose growing mode is e^{λt}, λ = (−k_d + √(k_d² + 4J_a k_p)) / (2J_a). Each
 *    tenfold-smaller start adds ln(10)/λ to the time needed to get away: the hesitation is unbounded.
 *
 * Invented vehicle: J = diag(2, 3, 4) kg·m², 4-wheel pyramid (1 N·m, 10 N·m·s per wheel, never
 * binding here). b = (0.6, 0, 0.8), target r = b. Gains ω_n = 0.2 rad/s, ζ = 0.9. Worst-case
 * noise ē = 2°; start at rest 0.8° from the antipode (pointing error 179.2°), tilted about the body
 * y axis (principal, ⊥ b). Synergistic law: three warp directions 120° apart, k = 0.5, δ = 0.4
 * (certified δ* = 0.8249): a 2° measurement error moves μ by at most 2ē·max|∇V_p| < 0.1 < δ.
 */
import { describe, expect, it } from 'vitest';
import {
  applyAntipodalStall,
  makeReducedPd,
  makeReducedSynergistic,
  reducedGainsFromBandwidth,
  type ReducedPd,
  type ReducedSynergistic,
} from '../../app/engine/control/sphere/index';
import type { AttitudeController } from '../../app/engine/control/types';
import { makeRng } from '../../app/engine/math/prng';
import { qAngleBetween, qConjMultiply, qMultiply, qRandomUniform, qRotateInverse } from '../../app/engine/math/rotation';
import { DEG_PER_RAD, RAD_PER_DEG } from '../../app/engine/units';
import { fly, pyramidVehicle } from './closedloop-fixtures';
import { angle, attitudeSeeing, withMeasurement, type V3 } from './sphere-fixtures';

const veh = pyramidVehicle(
  [
    [2, 0, 0],
    [0, 3, 0],
    [0, 0, 4],
  ],
  1,
  10,
);
const b: V3 = [0.6, 0, 0.8];
const g = reducedGainsFromBandwidth(veh.model.Jperp, 0.2, 0.9);
const EBAR = 2 * RAD_PER_DEG;

function smooth(): ReducedPd {
  const r = makeReducedPd({ axis: b, kp: g.kp, Kd: g.kd }, veh.model);
  if (!r.ok) throw new Error(JSON.stringify(r.errors));
  return r.value;
}
function hybrid(): ReducedSynergistic {
  const r = makeReducedSynergistic({ axis: b, kp: g.kp, Kd: g.kd, warpGain: 0.5, members: 3, hysteresis: 0.4 }, veh.model);
  if (!r.ok) throw new Error(JSON.stringify(r.errors));
  return r.value;
}
/** The law fed the antipodal-stall measurement (noise.ts). */
function stalled(law: AttitudeController) {
  return withMeasurement(law, (qOut, input) => {
    applyAntipodalStall(qOut, input.q, input.q, input.qRef, b, EBAR);
  });
}

/** Direction at distance ψ from −b, tilted about the body y axis (⊥ b): −(cos ψ b + sin ψ e), e = (0.8, 0, −0.6). */
function nearAntipode(psi: number): V3 {
  const e: V3 = [0.8, 0, -0.6];
  return [0, 1, 2].map((i) => -(Math.cos(psi) * b[i]! + Math.sin(psi) * e[i]!)) as V3;
}
const q0 = attitudeSeeing(nearAntipode(0.8 * RAD_PER_DEG), b, 0);

const minError = (r: ReturnType<typeof fly>) => r.trace.errorAngle.reduce((a, v) => Math.min(a, v), Infinity);
const lastError = (r: ReturnType<typeof fly>) => r.trace.errorAngle[r.trace.n - 1]!;

describe('the antipodal-stall noise model (noise.ts)', () => {
  it('applies exactly within ē of the antipode, moves the attitude by ψ ≤ ē and shows the law −b', () => {
    const rng = makeRng(31, 0);
    const qTrue = new Float64Array(4),
      qRef = new Float64Array(4),
      qOut = new Float64Array(4),
      qe = new Float64Array(4),
      y = new Float64Array(3);
    let applied = 0;
    for (let s = 0; s < 4000; s++) {
      qRandomUniform(qRef, rng);
      // half the cases near the antipode (within 3ē), half anywhere
      if (s % 2) qRandomUniform(qTrue, rng);
      else {
        const d = attitudeSeeing(nearAntipode(3 * EBAR * rng.next()), b, 2 * Math.PI * rng.next());
        // q = q_ref ⊗ q_e with R(q_e)ᵀ b = the drawn direction near −b
        qMultiply(qTrue, qRef, d);
      }
      qConjMultiply(qe, qRef, qTrue);
      qRotateInverse(y, qe, b);
      const psi = angle(y, [-b[0], -b[1], -b[2]]);
      const did = applyAntipodalStall(qOut, qTrue, qTrue, qRef, b, EBAR);
      expect(did).toBe(psi <= EBAR);
      if (!did) {
        expect(Array.from(qOut)).toEqual(Array.from(qTrue));
        continue;
      }
      applied++;
      expect(Math.abs(qAngleBetween(qOut, qTrue) - psi)).toBeLessThan(1e-12);
      qConjMultiply(qe, qRef, qOut);
      qRotateInverse(y, qe, b);
      expect(angle(y, [-b[0], -b[1], -b[2]])).toBeLessThan(1e-7);
    }
    expect(applied).toBeGreaterThan(500);
  });
});

describe('smooth law within 1° of the antipode under worst-case bounded noise ē = 2°', () => {
  for (const timing of ['sampled', 'continuous-ideal'] as const) {
    it(`${timing}: the smooth law stays within ē of the antipode for the whole 300 s; the hybrid law converges`, () => {
      const rs = fly({ vehicle: veh, controller: stalled(smooth()), q0, tEnd: 300, timing });
      expect(rs.outcome.status).toBe('completed');
      expect(rs.trace.t[rs.trace.n - 1]).toBeCloseTo(300, 6);
      expect(minError(rs)).toBeGreaterThanOrEqual(Math.PI - EBAR);
      // with a small initial tumble it still never leaves the cap
      const rw = fly({ vehicle: veh, controller: stalled(smooth()), q0, omega0: [1e-3, -5e-4, 8e-4], tEnd: 300, timing });
      expect(minError(rw)).toBeGreaterThanOrEqual(Math.PI - EBAR);

      const rh = fly({ vehicle: veh, controller: stalled(hybrid()), q0, tEnd: 300, timing });
      expect(rh.outcome.status).toBe('completed');
      expect(lastError(rh) * DEG_PER_RAD).toBeLessThan(0.1);
      const rhw = fly({ vehicle: veh, controller: stalled(hybrid()), q0, omega0: [1e-3, -5e-4, 8e-4], tEnd: 300, timing });
      expect(lastError(rhw) * DEG_PER_RAD).toBeLessThan(0.1);
    });
  }

  it('counter-check: without the noise the smooth law leaves the antipode and converges (the stall is the noise)', () => {
    const r = fly({ vehicle: veh, controller: smooth(), q0, tEnd: 300, timing: 'continuous-ideal' });
    expect(lastError(r) * DEG_PER_RAD).toBeLessThan(0.1);
  });
});

describe('hesitation of the smooth law near the antipode (no noise)', () => {
  it('each tenfold-closer start adds ln(10)/λ to the escape time (linearisation about −b)', () => {
    const Ja = 3; // tilt about the body y axis
    const lambda = (-g.kd + Math.sqrt(g.kd * g.kd + 4 * Ja * g.kp)) / (2 * Ja);
    const escape = (psi0: number) => {
      const r = fly({
        vehicle: veh,
        controller: smooth(),
        q0: attitudeSeeing(nearAntipode(psi0), b, 0),
        tEnd: 400,
        timing: 'continuous-ideal',
        controlRateHz: 20,
      });
      // first time the distance from the antipode exceeds 10°
      for (let k = 0; k < r.trace.n; k++) if (Math.PI - r.trace.errorAngle[k]! > 10 * RAD_PER_DEG) return r.trace.t[k]!;
      return Infinity;
    };
    const t = [1e-3, 1e-4, 1e-5].map(escape);
    const step = Math.log(10) / lambda;
    expect(Math.abs(t[1]! - t[0]! - step) / step).toBeLessThan(0.02);
    expect(Math.abs(t[2]! - t[1]! - step) / step).toBeLessThan(0.02);
  });
});
