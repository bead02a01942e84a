/**
 * The sampled loop's fixed-step path (issue 12, loop part):
 *  - HeldGyrostatRk4 (sim/heldRk4.ts) takes the same RK4 step bit for bit as the general
 *    rk4Step (hybrid/rk4.ts) over gyrostatDerivative (body/gyrostat.ts) with the wheel torques
 *    held and no external torque, with and without bearing friction, for random states; and it
 *    integrates two cases with a closed-form answer:
 *      · a torque-free axisymmetric rigid body: ω_z constant, the transverse rate turns at
 *        λ = (I_z − I_t)/I_t · ω_z in body axes (Euler's equations of the free symmetric top:
 *        Landau & Lifshitz, Mechanics, 3rd ed., §33; Markley & Crassidis, Fundamentals of
 *        Spacecraft Attitude Determination and Control, 2014, §3.3 — from memory);
 *      · one wheel on the body's symmetry axis driven with a constant motor torque τ from rest:
 *        momentum exchange about a fixed axis, J⊥ω_z + h = 0, so h = τt, ω_z = −τt/J⊥_zz and the
 *        body turns by θ = −τt²/(2J⊥_zz) (conservation of angular momentum about a fixed axis,
 *        any dynamics text; the gyrostat form as in methods §6);
 *  - diagnosticsOfLastTorque (control/quaternionBase.ts) gives the same bits as diagnostics on the
 *    input the torque saw, for the PD, sign-switch and hysteretic laws;
 *  - allocateMinMax with one null vector (wheels/allocation.ts) makes the same choice, bit for bit,
 *    as the pair search it replaced (transcribed below from commit c114375), and its peak equals
 *    the LP optimum's (allocateMinMaxLp);
 *  - without bearing friction the recorded net wheel torque is the delivered motor torque itself;
 *  - a run whose sensors are perfect (the loop then takes the diagnostics from the torque's
 *    tracking error) records the same trace, bit for bit, as the same run through a law that
 *    lacks the shortcut (the general path), and a noisy run does too.
 */
import { describe, expect, it } from 'vitest';
import { gyrostatDerivative, makeGyrostat, type Gyrostat } from '../../app/engine/body/gyrostat';
import { makeRk4Work, rk4Step } from '../../app/engine/hybrid/rk4';
import type { FlowFn } from '../../app/engine/hybrid/types';
import { m3Diag } from '../../app/engine/math/mat3';
import { makeRng } from '../../app/engine/math/prng';
import { makeDiagnostics, type AttitudeController, type ControlInput } from '../../app/engine/control/types';
import { HeldGyrostatRk4 } from '../../app/engine/sim/heldRk4';
import { TRACE_CHANNELS } from '../../app/engine/sim/trace';
import type { ClosedLoopResult } from '../../app/engine/sim/closedLoop';
import { fly, law, pyramidVehicle } from '../reference/closedloop-fixtures';
import { allocateMinMax, allocateMinMaxLp, allocateMinNorm } from '../../app/engine/wheels/allocation';
import { makeWheelArray, type WheelArray } from '../../app/engine/wheels/array';
import { pyramid } from '../../app/engine/wheels/presets';

function gyro(n: number, friction: boolean): Gyrostat {
  const axes =
    n === 4
      ? new Float64Array([0.6, 0, 0.8, 0, 0.6, 0.8, -0.6, 0, 0.8, 0, -0.6, 0.8])
      : new Float64Array([1, 0, 0, 0, 1, 0, 0, 0, 1]).subarray(0, 3 * n);
  const js = Float64Array.from({ length: n }, (_, i) => 1e-5 * (1 + 0.1 * i));
  const J = new Float64Array([0.11, 0.004, -0.002, 0.004, 0.12, 0.003, -0.002, 0.003, 0.08]);
  const r = makeGyrostat(
    J,
    { n, axes: Float64Array.from(axes), rotorInertiaKgm2: js },
    friction ? { viscousNmsPerRad: 3e-7, coulombNm: new Float64Array(n).fill(4e-5), coulombSmoothingRadPerS: 0.4 } : undefined,
  );
  if (!r.ok) throw new Error(JSON.stringify(r.errors));
  return r.value;
}

describe('HeldGyrostatRk4', () => {
  it('same bits as rk4Step over gyrostatDerivative (held torques, no external torque), friction on and off', () => {
    const rng = makeRng(7, 3);
    for (const n of [3, 4]) {
      for (const friction of [false, true]) {
        const g = gyro(n, friction);
        const dim = 7 + n;
        const tau = new Float64Array(n);
        const zero3 = new Float64Array(3);
        const flow: FlowFn = (_t, x, dx) => gyrostatDerivative(dx, x, g, tau, zero3);
        const work = makeRk4Work(dim);
        const held = new HeldGyrostatRk4(g);
        const x = new Float64Array(dim),
          a = new Float64Array(dim),
          b = new Float64Array(dim);
        for (let k = 0; k < 300; k++) {
          for (let i = 0; i < 4; i++) x[i] = rng.normal();
          for (let i = 4; i < 7; i++) x[i] = 0.2 * rng.normal();
          for (let i = 7; i < dim; i++) x[i] = 5e-3 * rng.normal();
          for (let i = 0; i < n; i++) tau[i] = k % 7 === 0 ? 0 : 2e-3 * rng.normal();
          const h = k % 5 === 0 ? 0.1 : 0.1 / (1 + (k % 4));
          rk4Step(a, flow, 0, x, h, work);
          held.hold(tau);
          expect(held.step(b, x, h)).toBe(true);
          for (let i = 0; i < dim; i++) expect(Object.is(a[i], b[i])).toBe(true);
        }
      }
    }
  });

  it('reports a non-finite step (false) and leaves the start state alone', () => {
    const g = gyro(4, false);
    const held = new HeldGyrostatRk4(g);
    const x = new Float64Array([0, 0, 0, 1, 1e200, 1e200, 1e200, 0, 0, 0, 0]);
    const keep = Float64Array.from(x);
    held.hold(new Float64Array(4));
    expect(held.step(new Float64Array(11), x, 0.1)).toBe(false);
    expect(Array.from(x)).toEqual(Array.from(keep));
  });

  it('free symmetric top: ω_z constant, transverse rate turning at λ = (I_z − I_t)/I_t ω_z (Landau & Lifshitz §33)', () => {
    // No wheels: the body alone, I = diag(It, It, Iz).
    const It = 0.1,
      Iz = 0.16;
    const r = makeGyrostat(m3Diag(It, It, Iz), { n: 0, axes: new Float64Array(0), rotorInertiaKgm2: new Float64Array(0) });
    if (!r.ok) throw new Error('gyrostat');
    const held = new HeldGyrostatRk4(r.value);
    held.hold(new Float64Array(0));
    const w0 = 0.05,
      wz = 0.3;
    let x = new Float64Array([0, 0, 0, 1, w0, 0, wz]);
    let y = new Float64Array(7);
    const h = 0.01,
      steps = 2000;
    for (let k = 0; k < steps; k++) {
      expect(held.step(y, x, h)).toBe(true);
      [x, y] = [y, x];
    }
    const t = h * steps;
    const lambda = ((Iz - It) / It) * wz;
    // Body-axis solution: ω_x = w0 cos λt, ω_y = w0 sin λt (sign: ω̇_x = −λω_y... with λ as above
    // Euler gives ω̇_x = (I_t − I_z)/I_t ω_y ω_z = −λ ω_y, ω̇_y = λ ω_x).
    expect(Math.abs(x[4]! - w0 * Math.cos(lambda * t))).toBeLessThan(1e-9);
    expect(Math.abs(x[5]! - w0 * Math.sin(lambda * t))).toBeLessThan(1e-9);
    expect(Math.abs(x[6]! - wz)).toBeLessThan(1e-12);
  });

  it('one wheel on the symmetry axis, constant motor torque from rest: h = τt, ω_z = −τt/J⊥zz, θ = −τt²/(2J⊥zz)', () => {
    const js = 2e-5,
      Jz = 0.08;
    // Whole-body inertia includes the rotor's axial inertia; J⊥ = J − js g gᵀ.
    const r = makeGyrostat(m3Diag(0.1, 0.11, Jz + js), {
      n: 1,
      axes: new Float64Array([0, 0, 1]),
      rotorInertiaKgm2: new Float64Array([js]),
    });
    if (!r.ok) throw new Error('gyrostat');
    const g = r.value;
    const held = new HeldGyrostatRk4(g);
    const tau = 1.5e-3;
    held.hold([tau]);
    let x = new Float64Array([0, 0, 0, 1, 0, 0, 0, 0]);
    let y = new Float64Array(8);
    const h = 0.05,
      steps = 400;
    for (let k = 0; k < steps; k++) {
      expect(held.step(y, x, h)).toBe(true);
      [x, y] = [y, x];
      const n = Math.hypot(x[0]!, x[1]!, x[2]!, x[3]!);
      for (let i = 0; i < 4; i++) x[i] = x[i]! / n;
    }
    const t = h * steps;
    const Jpz = g.Jperp[8]!;
    expect(Math.abs(Jpz - Jz)).toBeLessThan(1e-15);
    expect(Math.abs(x[7]! - tau * t)).toBeLessThan(1e-15);
    expect(Math.abs(x[6]! + (tau * t) / Jpz)).toBeLessThan(1e-12);
    const theta = (-tau * t * t) / (2 * Jpz);
    expect(Math.abs(x[2]! - Math.sin(theta / 2))).toBeLessThan(1e-8);
    expect(Math.abs(x[3]! - Math.cos(theta / 2))).toBeLessThan(1e-8);
    expect(Math.abs(x[4]!) + Math.abs(x[5]!)).toBe(0);
  });
});

const veh = pyramidVehicle(
  [
    [0.11, 0.002, -0.001],
    [0.002, 0.12, 0.0015],
    [-0.001, 0.0015, 0.08],
  ],
  2e-3,
  6e-3,
);
const gains = { kp: 0.02, kd: 0.08 };
const SPECS = [
  { kind: 'quaternion-pd', gains },
  { kind: 'sign-switch', gains },
  { kind: 'hysteretic', gains, hysteresis: 0.3, initialLogic: 1 },
];

describe('diagnosticsOfLastTorque', () => {
  it('same bits as diagnostics on the input the torque saw (PD, sign-switch, hysteretic)', () => {
    const rng = makeRng(11, 0);
    const unit = (n: number) => {
      const v = Float64Array.from({ length: n }, () => rng.normal());
      const s = Math.hypot(...v);
      return v.map((c) => c / s);
    };
    for (const spec of SPECS) {
      const c = law(spec, veh);
      expect(typeof c.diagnosticsOfLastTorque).toBe('function');
      for (let k = 0; k < 100; k++) {
        const input: ControlInput = {
          q: unit(4),
          omega: Float64Array.from({ length: 3 }, () => 0.1 * rng.normal()),
          hWheel: Float64Array.from({ length: 4 }, () => 1e-3 * rng.normal()),
          qRef: unit(4),
          omegaRef: Float64Array.from({ length: 3 }, () => 0.01 * rng.normal()),
          omegaDotRef: Float64Array.from({ length: 3 }, () => 1e-3 * rng.normal()),
        };
        const logic = k % 2 ? 1 : -1;
        c.torque(new Float64Array(3), input, logic);
        const a = c.diagnosticsOfLastTorque!(makeDiagnostics(), logic);
        const b = c.diagnostics(makeDiagnostics(), input, logic);
        for (const key of Object.keys(b) as (keyof typeof b)[]) expect(Object.is(a[key], b[key])).toBe(true);
      }
    }
  });
});

/** The same law without the optional shortcut: the loop then forms the diagnostics as before. */
function withoutShortcut(c: AttitudeController): AttitudeController {
  return {
    kind: c.kind,
    label: c.label,
    jumpDecrease: c.jumpDecrease,
    certificate: c.certificate,
    initialLogic: (i) => c.initialLogic(i),
    jumpGuard: (i, l) => c.jumpGuard(i, l),
    updateLogic: (i, l) => c.updateLogic(i, l),
    torque: (o, i, l) => c.torque(o, i, l),
    diagnostics: (o, i, l) => c.diagnostics(o, i, l),
  };
}

function sameTrace(a: ClosedLoopResult, b: ClosedLoopResult): void {
  expect(a.trace.n).toBe(b.trace.n);
  for (const name of TRACE_CHANNELS) {
    const x = a.trace[name],
      y = b.trace[name];
    expect(x.length).toBe(y.length);
    for (let i = 0; i < x.length; i++) if (!Object.is(x[i], y[i])) expect(`${name}[${i}] ${x[i]}`).toBe(`${name}[${i}] ${y[i]}`);
  }
  expect(a.jumps).toEqual(b.jumps);
  expect(a.outcome).toEqual(b.outcome);
}

describe('net wheel torque without bearing friction', () => {
  it('equals the delivered motor torque bit for bit (net = motor − friction, friction 0: body/gyrostat.ts)', () => {
    const r = fly({ vehicle: veh, controller: law(SPECS[0]!, veh), q0: [0, 0, Math.sin(1), Math.cos(1)], tEnd: 30 });
    expect(veh.plant.friction.active).toBe(false);
    const a = r.trace.wheelTorqueNet,
      b = r.trace.wheelTorque;
    let nonzero = 0;
    for (let i = 0; i < a.length; i++) {
      expect(Object.is(a[i], b[i])).toBe(true);
      if (b[i] !== 0) nonzero++;
    }
    expect(nonzero).toBeGreaterThan(100);
  });
});

describe('diagnostics from the torque when the sensors are perfect', () => {
  const q0 = [Math.sin(1.4), 0.3 * Math.cos(1.4), 0, 0];
  const n = Math.hypot(...q0);
  const q0u = q0.map((v) => v / n);
  for (const spec of SPECS) {
    it(`${spec.kind}: same trace as the general path, perfect and noisy sensors`, () => {
      for (const sensors of [
        undefined,
        { attitudeSigmaRad: 5e-5, rateSigmaRadPerS: 1e-5, rateBiasRadPerS: [1e-6, 0, -2e-6], adversarialEta: 0 },
      ]) {
        const base = { vehicle: veh, q0: q0u, omega0: [0.01, -0.02, 0.005], tEnd: 60, ...(sensors ? { sensors } : {}) };
        const fast = fly({ ...base, controller: law(spec, veh) });
        const slow = fly({ ...base, controller: withoutShortcut(law(spec, veh)) });
        expect(fast.trace.n).toBeGreaterThan(500);
        sameTrace(fast, slow);
      }
    });
  }
});

/**
 * The one-null-vector min-max allocation as it was before weights and centres were formed once
 * and a candidate's peak check could stop early (wheels/allocation.ts at commit c114375): the
 * reference for "the same choice, the same bits".
 */
function previousMinMaxOneDim(out: Float64Array, arr: WheelArray): Float64Array {
  const n = arr.n,
    nu = arr.nullBasis,
    l = arr.maxTorqueNm;
  const peakWith = (a: number) => {
    let p = 0;
    for (let i = 0; i < n; i++) p = Math.max(p, Math.abs(out[i]! + nu[i]! * a) / l[i]!);
    return p;
  };
  let bestPeak = Infinity,
    alpha = 0,
    firstFree = -1;
  for (let i = 0; i < n; i++) {
    if (Math.abs(nu[i]!) <= 1e-14) continue;
    if (firstFree < 0) firstFree = i;
    const wi = Math.abs(nu[i]!) / l[i]!;
    const ci = -out[i]! / nu[i]!;
    for (let j = i + 1; j < n; j++) {
      if (Math.abs(nu[j]!) <= 1e-14) continue;
      const wj = Math.abs(nu[j]!) / l[j]!;
      const cj = -out[j]! / nu[j]!;
      const a = (wi * ci + wj * cj) / (wi + wj);
      const peak = peakWith(a);
      if (peak < bestPeak) {
        bestPeak = peak;
        alpha = a;
      }
    }
  }
  if (bestPeak === Infinity && firstFree >= 0) alpha = -out[firstFree]! / nu[firstFree]!;
  for (let i = 0; i < n; i++) out[i]! += nu[i]! * alpha;
  return out;
}

describe('min-max allocation, one null vector', () => {
  it('same bits as the previous pair search, and the peak of the LP optimum (allocateMinMaxLp)', () => {
    const rng = makeRng(5, 2);
    const arrays: WheelArray[] = [];
    for (let k = 0; k < 12; k++) {
      const specs = pyramid({
        cantAngleRad: 0.4 + 0.8 * rng.next(),
        azimuthOffsetRad: rng.next(),
        maxTorqueNm: 2e-3,
        maxMomentumNms: 6e-3,
        rotorInertiaKgm2: 1e-5,
      });
      // Unequal torque limits on some arrays, so the weights w_i differ.
      if (k % 2) specs.forEach((s, i) => (s.maxTorqueNm = 1e-3 * (1 + 0.5 * i)));
      const w = makeWheelArray(specs);
      if (!w.ok) throw new Error(JSON.stringify(w.errors));
      arrays.push(w.value);
    }
    const a = new Float64Array(4),
      b = new Float64Array(4),
      c = new Float64Array(4);
    const tau = new Float64Array(3);
    let checked = 0;
    for (const arr of arrays) {
      for (let k = 0; k < 400; k++) {
        for (let i = 0; i < 3; i++) tau[i] = (k % 9 === 0 ? 0 : 1e-3) * rng.normal();
        allocateMinMax(a, arr, tau);
        allocateMinNorm(b, arr, tau);
        previousMinMaxOneDim(b, arr);
        for (let i = 0; i < 4; i++) expect(Object.is(a[i], b[i])).toBe(true);
        // Outside check: the min-max problem's optimum (LP of wheels/lp.ts, checked against mathjs in
        // test/reference/wheels-allocation.test.ts; min-∞-norm allocation: Yoon, Seo & Choi, Aerospace
        // Science and Technology 39, 2014).
        allocateMinMaxLp(c, arr, tau);
        let pa = 0,
          pc = 0;
        for (let i = 0; i < 4; i++) {
          pa = Math.max(pa, Math.abs(a[i]!) / arr.maxTorqueNm[i]!);
          pc = Math.max(pc, Math.abs(c[i]!) / arr.maxTorqueNm[i]!);
        }
        expect(Math.abs(pa - pc)).toBeLessThanOrEqual(1e-9 * Math.max(1, pc));
        checked++;
      }
    }
    expect(checked).toBe(4800);
  });
});
