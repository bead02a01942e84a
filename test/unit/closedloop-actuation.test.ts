/**
 * Actuation modes and wheel limits through the real closed loop (10 Hz sampled, zero-order hold).
 *
 * Invented test vehicle ("Test-6U"): J close to a 6U CubeSat's (0.11, 0.12, 0.08 kg·m² with small
 * products), 4-wheel pyramid on cube diagonals, 2 mN·m and 6 mN·m·s per wheel, rotor 9e-6 kg·m²,
 * no friction (so ḣ is exactly the motor torque and impulses can be checked from h alone).
 *
 * Pulsed actuation (common practice, no source: a PWM motor driver applies full torque for a
 * fraction |τ|/τ_max of each period): the wheel momentum change over a period must equal the held
 * torque × the period (the same impulse), to rounding, in every mode; quantised torques are
 * multiples of the quantum. How the slew result differs between 'hold', 'pwm' and 'quantized' is
 * printed as a small table and bounded: PWM moves the impulse to the start of the period (a
 * fraction of a period earlier), which must change the settle time by less than a few periods; a
 * 2e-5 N·m quantum (1 % of the torque limit) leaves a dead band of the order of
 * θ ≈ quantum / k_p ≈ 0.1°, and the final error must stay within a few times that.
 *
 * Wheel limits (methods §6: direction-preserving scaling, never clipping one wheel): a request far
 * above the torque limit, and a slew that fills the wheels' momentum, must deliver body torque
 * s × the request (0 ≤ s ≤ 1, same direction, to rounding) and never exceed |τ_i| ≤ τ_max or
 * |h_i| ≤ h_max (the sampled loop limits predictively over the coming period).
 */
import { describe, expect, it } from 'vitest';
import type { Actuation } from '../../app/engine/sim/closedLoop';
import type { RunTrace } from '../../app/engine/sim/types';
import { fly, law, metricsOf, pyramidVehicle } from '../reference/closedloop-fixtures';
import { DEG_PER_RAD, RAD_PER_DEG } from '../../app/engine/units';

const J = [
  [0.11, 0.0012, -0.0008],
  [0.0012, 0.12, 0.0005],
  [-0.0008, 0.0005, 0.08],
];
const TAU_MAX = 2e-3;

function slewStart(angleDeg: number): number[] {
  const a = [0.3, -0.8, 0.52],
    n = Math.hypot(...a),
    th = angleDeg * RAD_PER_DEG;
  return [...a.map((x) => (x / n) * Math.sin(th / 2)), Math.cos(th / 2)];
}

/** Largest |Δh_i − τ_i Δt| over all sample intervals, where τ_i is the torque held from sample k. */
function impulseMismatch(tr: RunTrace): number {
  const N = tr.nWheels;
  let worst = 0;
  for (let k = 0; k + 1 < tr.n; k++) {
    const dt = tr.t[k + 1]! - tr.t[k]!;
    for (let i = 0; i < N; i++)
      worst = Math.max(worst, Math.abs(tr.hWheel[N * (k + 1) + i]! - tr.hWheel[N * k + i]! - tr.wheelTorque[N * k + i]! * dt));
  }
  return worst;
}

describe("pulsed actuation: 'hold', 'pwm' and 'quantized' on the same 60° slew", () => {
  const veh = pyramidVehicle(J, TAU_MAX, 6e-3, 9e-6);
  const spec = { kind: 'hysteretic', gains: { omegaN: 0.2, zeta: 0.9 }, hysteresis: 0.2 };
  const QUANTUM = 2e-5;
  const modes: [string, Actuation][] = [
    ['hold', { mode: 'hold' }],
    ['pwm', { mode: 'pwm' }],
    ['quantized', { mode: 'quantized', quantumNm: QUANTUM }],
  ];
  const results = modes.map(([name, actuation]) => {
    const r = fly({
      vehicle: veh,
      controller: law(spec, veh),
      q0: slewStart(60),
      tEnd: 120,
      rk4StepsPerSample: 4,
      actuation,
      allocation: 'min-max',
    });
    return { name, r, m: metricsOf(r, veh, [0, 0, 0, 1], { angle: 0.1 * RAD_PER_DEG, rate: 0.02 * RAD_PER_DEG }) };
  });
  const by = (name: string) => results.find((x) => x.name === name)!;

  it('prints the comparison', () => {
    const rows = results.map(
      ({ name, r, m }) =>
        `  ${name.padEnd(10)} settle ${m.settleTimeS === null ? '   never' : `${m.settleTimeS.toFixed(1).padStart(6)} s`}` +
        `  final ${(m.finalErrorRad * DEG_PER_RAD).toExponential(2)}°  effort ${(m.controlEffortNms * 1e3).toFixed(4)} mN·m·s` +
        `  peak |τ| ${m.peakWheelTorqueFraction.toFixed(3)}  peak |h| ${m.peakWheelMomentumFraction.toFixed(3)}  impulse error ${impulseMismatch(r.trace).toExponential(1)} N·m·s`,
    );
    console.log(`60° slew, Test-6U, 10 Hz, hysteretic law (ω_n 0.2 rad/s):\n${rows.join('\n')}`);
    for (const { r } of results) expect(r.outcome.status).toBe('completed');
  });

  it('every mode delivers exactly the held torque as impulse over each period (∫τ dt = τ_held·T_s)', () => {
    // hold/quantized: rounding only; PWM: pulse edges closer than 1e-12 s to another edge are
    // applied together (closedLoop.ts), worth τ_max × 1e-12 s ≈ 2e-15 N·m·s per period at most
    for (const { r } of results) expect(impulseMismatch(r.trace)).toBeLessThan(1e-10 * TAU_MAX * 0.1);
  });

  it('PWM really pulses: same impulses, different path (the attitude differs from hold within a period)', () => {
    const a = by('hold').r.trace,
      b = by('pwm').r.trace;
    let diff = 0;
    for (let i = 0; i < 4 * Math.min(a.n, b.n); i++) diff = Math.max(diff, Math.abs(a.q[i]! - b.q[i]!));
    expect(diff).toBeGreaterThan(1e-7);
  });

  it('PWM settles within a few control periods of hold, with the same final accuracy', () => {
    const h = by('hold').m,
      p = by('pwm').m;
    expect(h.settleTimeS).not.toBeNull();
    expect(p.settleTimeS).not.toBeNull();
    expect(Math.abs(p.settleTimeS! - h.settleTimeS!)).toBeLessThanOrEqual(0.5); // 5 periods
    expect(p.finalErrorRad * DEG_PER_RAD).toBeLessThan(1e-3);
    expect(Math.abs(p.controlEffortNms - h.controlEffortNms)).toBeLessThan(0.01 * h.controlEffortNms);
  });

  it('quantized torques are multiples of the quantum and leave a bounded dead band', () => {
    const { r, m } = by('quantized');
    const tr = r.trace;
    for (let i = 0; i < tr.wheelTorque.length; i++) {
      const u = tr.wheelTorque[i]! / QUANTUM;
      expect(Math.abs(u - Math.round(u))).toBeLessThan(1e-9);
      expect(Math.abs(tr.wheelTorque[i]!)).toBeLessThanOrEqual(TAU_MAX);
    }
    const kp = 2 * 0.12 * 0.2 * 0.2; // bandwidth gains: k_p = 2 J_max ω_n² (control/gains.ts)
    const deadBandDeg = (QUANTUM / kp) * DEG_PER_RAD;
    expect(m.finalErrorRad * DEG_PER_RAD).toBeLessThan(3 * deadBandDeg);
    // ... and it is a real effect: hold ends far inside it
    expect(by('hold').m.finalErrorRad * DEG_PER_RAD).toBeLessThan(0.01 * deadBandDeg);
  });
});

/** Check every sample: delivered body torque = s × request, 0 ≤ s ≤ 1; limits never exceeded. */
function checkLimits(tr: RunTrace, tauMax: number, hMax: number) {
  const N = tr.nWheels;
  let minScale = 1,
    worstPerp = 0,
    worstTau = 0,
    worstH = 0;
  for (let k = 0; k < tr.n; k++) {
    const c = [0, 1, 2].map((i) => tr.torqueCmdBody[3 * k + i]);
    const d = [0, 1, 2].map((i) => tr.torqueBody[3 * k + i]);
    const c2 = c[0]! * c[0]! + c[1]! * c[1]! + c[2]! * c[2]!;
    if (c2 > 0) {
      const s = (c[0]! * d[0]! + c[1]! * d[1]! + c[2]! * d[2]!) / c2;
      minScale = Math.min(minScale, s);
      expect(s).toBeGreaterThanOrEqual(-1e-12);
      expect(s).toBeLessThanOrEqual(1 + 1e-12);
      // the part of the delivered torque off the request's direction, relative to the request
      const perp = Math.hypot(d[0]! - s * c[0]!, d[1]! - s * c[1]!, d[2]! - s * c[2]!) / Math.sqrt(c2);
      worstPerp = Math.max(worstPerp, perp);
    }
    for (let i = 0; i < N; i++) {
      worstTau = Math.max(worstTau, Math.abs(tr.wheelTorque[N * k + i]!) / tauMax);
      worstH = Math.max(worstH, Math.abs(tr.hWheel[N * k + i]!) / hMax);
    }
  }
  return { minScale, worstPerp, worstTau, worstH };
}

describe('wheel limits keep the torque direction and are never exceeded', () => {
  const strong = { kind: 'hysteretic', gains: { omegaN: 1, zeta: 0.9 }, hysteresis: 0.2 }; // k_p = 0.24 N·m ≫ 2 mN·m

  for (const allocation of ['min-max', 'min-norm'] as const) {
    it(`torque-limited (${allocation}): request up to ~100× the limit, delivered ∥ requested`, () => {
      const veh = pyramidVehicle(J, TAU_MAX, 1, 9e-6); // momentum capacity far away
      const r = fly({ vehicle: veh, controller: law(strong, veh), q0: slewStart(120), tEnd: 60, rk4StepsPerSample: 4, allocation });
      const c = checkLimits(r.trace, TAU_MAX, 1);
      expect(c.minScale).toBeLessThan(0.05); // the limit really bound
      expect(c.worstPerp).toBeLessThan(1e-12);
      expect(c.worstTau).toBeLessThanOrEqual(1 + 1e-12);
    });

    it(`momentum-limited (${allocation}): the slew fills the wheels, which stop at h_max`, () => {
      const hMax = 2e-3;
      const veh = pyramidVehicle(J, TAU_MAX, hMax, 9e-6);
      const r = fly({
        vehicle: veh,
        controller: law(strong, veh),
        q0: slewStart(120),
        hWheel0: [1e-3, -1e-3, 1e-3, -1e-3],
        tEnd: 150,
        rk4StepsPerSample: 4,
        allocation,
      });
      const c = checkLimits(r.trace, TAU_MAX, hMax);
      expect(c.worstH).toBeGreaterThan(0.999); // some wheel reached its momentum limit
      expect(c.worstH).toBeLessThanOrEqual(1 + 1e-12);
      expect(c.minScale).toBeLessThan(1e-9); // and the whole command was scaled down to nothing there
      expect(c.worstPerp).toBeLessThan(1e-12);
      expect(c.worstTau).toBeLessThanOrEqual(1 + 1e-12);
      // the law still gets there once the body has turned (the momentum leaves the saturated wheels)
      expect(metricsOf(r, veh).finalErrorRad * DEG_PER_RAD).toBeLessThan(0.01);
    });
  }
});
