/**
 * Rate-limited eigenaxis slew through the real closed loop.
 *
 * Law: Wie, Weiss & Arapostathis, "Quaternion feedback regulator for spacecraft eigenaxis
 * rotations", JGCD 12(3):375–380, 1989, with the per-axis saturation of Wie & Lu, "Feedback
 * control logic for spacecraft eigenaxis rotations under slew rate and control constraints", JGCD
 * 18(6):1372–1379, 1995. Check case (derived for this project, methods note §2c, RK4 dt = 0.01 s):
 * J = diag(10, 15, 20) kg·m², 90° about (1,2,2)/3 from rest, ω_n = 0.3 rad/s, ζ = 0.9
 * (k = 2ω_n² = 0.18, c = 2ζω_n = 0.54), ω_max = 0.05 rad/s ⇒ peak ‖ω‖ = 0.050000, axis deviation
 * < 1e-12, peak |τ| = (0.09, 0.27, 0.36) N·m (= c J_ii ω_max |ê_i| at the rest start), 38° left
 * at t = 20 s.
 *
 * Vehicle: three body-axis wheels (tiny rotors, J⊥ = diag(10, 15, 20) exactly) with 1 N·m and
 * 10 N·m·s per wheel: generous, so the limiter never scales and the law's gyroscopic cancellation
 * is exact. The ideal continuous mode at 100 Hz with one RK4 step per sample is the check case's
 * dt = 0.01 s. A second run starts with momentum stored in the wheels, so the cancellation of
 * ω × (J⊥ω + Gh) is exercised (the body-frame gyroscopic term is identically zero when the total
 * momentum is zero); the kinematics must not change.
 */
import { describe, expect, it } from 'vitest';
import { gainsFromBandwidth } from '../../app/engine/control/gains';
import { fly, law, sampleAt, triadVehicle } from './closedloop-fixtures';
import { DEG_PER_RAD, RAD_PER_DEG } from '../../app/engine/units';

const veh = triadVehicle([10, 15, 20], 1e-9, 1, 10);
const axis = [1 / 3, 2 / 3, 2 / 3];
const half = Math.PI / 4;
const q0 = [axis[0]! * Math.sin(half), axis[1]! * Math.sin(half), axis[2]! * Math.sin(half), Math.cos(half)];
const spec = { kind: 'eigenaxis', gains: { omegaN: 0.3, zeta: 0.9 }, maxRateRadPerS: 0.05, torqueLimitNm: 1 };

/** Peaks and the axis deviation max |ε × ê|/|ε| while the error exceeds `minAngleRad`. */
function summary(hWheel0: number[], timing: 'continuous-ideal' | 'sampled', rateHz: number, minAngleRad = 1e-6) {
  const r = fly({ vehicle: veh, controller: law(spec, veh), q0, hWheel0, tEnd: 60, timing, controlRateHz: rateHz, rk4StepsPerSample: 1 });
  const tr = r.trace;
  let peakRate = 0,
    deviation = 0;
  const peakTau = [0, 0, 0];
  for (let k = 0; k < tr.n; k++) {
    const wx = tr.omega[3 * k]!,
      wy = tr.omega[3 * k + 1]!,
      wz = tr.omega[3 * k + 2]!;
    peakRate = Math.max(peakRate, Math.hypot(wx, wy, wz));
    for (let i = 0; i < 3; i++) peakTau[i] = Math.max(peakTau[i]!, Math.abs(tr.torqueBody[3 * k + i]!));
    // target = identity, so the error quaternion is q itself: its vector part must stay on the axis
    const ex = tr.q[4 * k]!,
      ey = tr.q[4 * k + 1]!,
      ez = tr.q[4 * k + 2]!;
    const n = Math.hypot(ex, ey, ez);
    if (n > Math.sin(0.5 * minAngleRad)) {
      const cx = ey * axis[2]! - ez * axis[1]!,
        cy = ez * axis[0]! - ex * axis[2]!,
        cz = ex * axis[1]! - ey * axis[0]!;
      deviation = Math.max(deviation, Math.hypot(cx, cy, cz) / n);
    }
  }
  return {
    r,
    peakRate,
    deviation,
    peakTau,
    at20Deg: tr.errorAngle[sampleAt(r, 20)]! * DEG_PER_RAD,
    finalDeg: tr.errorAngle[tr.n - 1]! * DEG_PER_RAD,
  };
}

describe('eigenaxis check case of methods §2c through runClosedLoop', () => {
  it('bandwidth gains give k = 0.18, c = 0.54 (k = 2ω_n², c = 2ζω_n)', () => {
    const g = gainsFromBandwidth(veh.plant.Jperp, 0.3, 0.9);
    expect(g.kEigen).toBeCloseTo(0.18, 12);
    expect(g.cEigen).toBeCloseTo(0.54, 12);
  });

  it('ideal continuous, empty wheels: peak rate 0.050000, axis fixed, peak torques (0.09, 0.27, 0.36), 38° left at 20 s', () => {
    const s = summary([0, 0, 0], 'continuous-ideal', 100);
    expect(s.r.outcome.status).toBe('completed');
    expect(s.peakRate).toBeLessThanOrEqual(0.05);
    expect(s.peakRate).toBeCloseTo(0.05, 6);
    expect(s.deviation).toBeLessThan(1e-10);
    expect(s.peakTau[0]).toBeCloseTo(0.09, 9);
    expect(s.peakTau[1]).toBeCloseTo(0.27, 9);
    expect(s.peakTau[2]).toBeCloseTo(0.36, 9);
    expect(Math.abs(s.at20Deg - 38)).toBeLessThan(0.5);
    expect(s.finalDeg).toBeLessThan(0.01);
    // the request never reached the limiter: delivered = commanded
    const tr = s.r.trace;
    for (let i = 0; i < 3 * tr.n; i++) expect(Math.abs(tr.torqueBody[i]! - tr.torqueCmdBody[i]!)).toBeLessThan(1e-12);
  });

  it('with momentum stored in the wheels the cancellation keeps the same eigenaxis motion', () => {
    const a = summary([0, 0, 0], 'continuous-ideal', 100);
    const b = summary([0.3, -0.2, 0.1], 'continuous-ideal', 100);
    expect(b.deviation).toBeLessThan(1e-10);
    expect(Math.abs(b.peakRate - a.peakRate)).toBeLessThan(1e-9);
    expect(Math.abs(b.at20Deg - a.at20Deg)).toBeLessThan(1e-6);
    // ... while the torque now differs (it carries ω × Gh)
    let diff = 0;
    for (let i = 0; i < 3 * a.r.trace.n; i++) diff = Math.max(diff, Math.abs(a.r.trace.torqueBody[i]! - b.r.trace.torqueBody[i]!));
    expect(diff).toBeGreaterThan(1e-3);
  });

  it('sampled at 10 Hz (ZOH) with stored momentum: close to the ideal run, not identical', () => {
    const ideal = summary([0.3, -0.2, 0.1], 'continuous-ideal', 100);
    // the axis is judged while more than 1° is left: near the end the error direction is arbitrary
    const zoh = summary([0.3, -0.2, 0.1], 'sampled', 10, 1 * RAD_PER_DEG);
    expect(zoh.peakRate).toBeLessThan(0.05 * 1.01);
    expect(Math.abs(zoh.at20Deg - ideal.at20Deg)).toBeLessThan(0.5);
    expect(zoh.deviation).toBeLessThan(1e-2);
    expect(zoh.finalDeg).toBeLessThan(0.05);
  });
});
