/**
 * The sampled loop's per-sample shortcuts added for issue 12 (loop part), each against the general
 * path it replaces:
 *  - prepareSample (control/quaternionBase.ts): the tracking error formed once per sample for the
 *    jump guard, the logic update and the torque gives the same bits as forming it in each call,
 *    also when a call on another input (the true state's diagnostics at a jump) comes in between,
 *    and the promise ends with the torque (a changed input is formed again);
 *  - LoopCore.measuredIsTrue (sim/loop.ts) with sensors that add nothing answers exactly "is every
 *    measured value the true one, bit for bit" (Object.is) after sensors.ts measure, over states
 *    holding +0, −0, NaN, ±∞ and rate biases of ±0 (IEEE 754-2019 §6.3 signed-zero sums);
 *  - a noisy hysteretic run that jumps records the same trace, bit for bit, as the same law
 *    without the shortcut, and its jump follows the hysteretic jump map h⁺ = sgn(η) when hη ≤ −δ
 *    (Mayhew, Sanfelice & Teel, IEEE TAC 56(11):2555–2566, 2011, eq. of the jump set; methods §3).
 */
import { describe, expect, it } from 'vitest';
import { makeRng } from '../../app/engine/math/prng';
import { makeDiagnostics, type AttitudeController, type ControlInput } from '../../app/engine/control/types';
import { TRACE_CHANNELS } from '../../app/engine/sim/trace';
import type { ClosedLoopResult } from '../../app/engine/sim/closedLoop';
import { fixedReference, fly, law, pyramidVehicle } from '../reference/closedloop-fixtures';
import { LoopCore } from '../../app/engine/sim/loop';
import { measure, type SensorModel } from '../../app/engine/sim/sensors';

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

const rng = makeRng(31, 0);
const unit = (n: number): Float64Array => {
  const v = Float64Array.from({ length: n }, () => rng.normal());
  const s = Math.sqrt(v.reduce((a, c) => a + c * c, 0));
  return v.map((c) => c / s);
};
function randomInput(): ControlInput {
  return {
    q: unit(4),
    omega: Float64Array.from({ length: 3 }, () => 0.1 * rng.normal()),
    hWheel: Float64Array.from({ length: 4 }, () => 1e-3 * rng.normal()),
    qRef: unit(4),
    omegaRef: Float64Array.from({ length: 3 }, () => 0.01 * rng.normal()),
    omegaDotRef: Float64Array.from({ length: 3 }, () => 1e-3 * rng.normal()),
  };
}
const bits = (a: ArrayLike<number>, b: ArrayLike<number>) => {
  for (let i = 0; i < a.length; i++) if (!Object.is(a[i], b[i])) return false;
  return a.length === b.length;
};

describe('prepareSample', () => {
  it('guard, logic update and torque give the same bits as without it, with another input in between; a changed input is formed again', () => {
    for (const spec of SPECS) {
      const fast = law(spec, veh),
        slow = law(spec, veh);
      expect(typeof fast.prepareSample).toBe('function');
      for (let k = 0; k < 200; k++) {
        const input = randomInput(),
          other = randomInput();
        const logic = k % 3 === 0 ? 1 : -1;
        fast.prepareSample!(input);
        expect(Object.is(fast.jumpGuard(input, logic), slow.jumpGuard(input, logic))).toBe(true);
        expect(fast.updateLogic(input, logic)).toEqual(slow.updateLogic(input, logic));
        if (k % 2 === 0) {
          // The true state's diagnostics at a jump (sim/loop.ts logicStep) use the law's scratch.
          const a = fast.diagnostics(makeDiagnostics(), other, logic),
            b = slow.diagnostics(makeDiagnostics(), other, logic);
          expect(a).toEqual(b);
          expect(Object.is(fast.jumpGuard(input, logic), slow.jumpGuard(input, logic))).toBe(true);
        }
        const ta = fast.torque(new Float64Array(3), input, logic),
          tb = slow.torque(new Float64Array(3), input, logic);
        expect(bits(ta, tb)).toBe(true);
        // The promise ended with the torque: new values in the same object are formed again.
        input.q.set(unit(4));
        input.omega[0] = 0.05 * rng.normal();
        expect(Object.is(fast.jumpGuard(input, logic), slow.jumpGuard(input, logic))).toBe(true);
        expect(bits(fast.torque(new Float64Array(3), input, logic), slow.torque(new Float64Array(3), input, logic))).toBe(true);
      }
    }
  });
});

/** The same law without the optional shortcuts (prepareSample, diagnosticsOfLastTorque). */
function general(c: AttitudeController): AttitudeController {
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

function sameRun(a: ClosedLoopResult, b: ClosedLoopResult): void {
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

describe('a noisy hysteretic run that jumps', () => {
  it('same trace and jumps as the law without shortcuts; the first jump is h: 1 → sgn(η) = −1 where hη ≤ −δ (MST 2011)', () => {
    // Start 2.6 rad from the target: η = cos(1.3) > 0 … flip the lift so η < 0 with h = +1.
    const half = 1.3;
    const q0 = [0.6 * Math.sin(half), 0.8 * Math.sin(half), 0, -Math.cos(half)];
    const sensors = { attitudeSigmaRad: 2e-3, rateSigmaRadPerS: 2e-4, rateBiasRadPerS: [1e-5, 0, -2e-5], adversarialEta: 0 };
    const spec = { kind: 'hysteretic', gains, hysteresis: 0.2, initialLogic: 1 };
    const base = { vehicle: veh, q0, omega0: [0.02, -0.01, 0.005], tEnd: 120, sensors, seed: 9 };
    const c = law(spec, veh);
    const fast = fly({ ...base, controller: c });
    const slow = fly({ ...base, controller: general(law(spec, veh)) });
    expect(fast.trace.n).toBeGreaterThan(1000);
    expect(fast.jumps.length).toBeGreaterThan(0);
    const j = fast.jumps[0]!;
    expect([j.from, j.to]).toEqual([1, -1]);
    // W = 2k_p(1 − hη) + ½ω_eᵀJω_e (MST 2011; methods §3): flipping h from 1 to −1 at the TRUE η
    // (target = identity, so η = q_w of the recorded state) lowers W by exactly −4k_p·η.
    const k = Math.round(j.t * 10);
    const eta = fast.trace.q[4 * k + 3]!;
    expect(eta).toBeLessThan(-0.2);
    const kp = (c as unknown as { kp: number }).kp;
    expect(Math.abs((j.lyapunovBefore ?? NaN) - (j.lyapunovAfter ?? NaN) - -4 * kp * eta)).toBeLessThan(1e-12 * kp);
    expect(fast.trace.logic[k]).toBe(-1);
    sameRun(fast, slow);
  });
});

describe('measuredIsTrue with sensors that add nothing', () => {
  it('is true exactly when every measured value is the true one bit for bit (−0, NaN, ±∞, bias ±0)', () => {
    const special = [0, -0, NaN, Infinity, -Infinity, 1e-300, -2.5, 5e-324];
    const pick = (r: number): number => (r < 0.5 ? special[Math.floor(r * 16)]! : rng.normal());
    let agreeTrue = 0,
      agreeFalse = 0;
    for (const bias of [
      [0, 0, 0],
      [-0, 0, -0],
    ]) {
      const sensors: SensorModel = { attitudeSigmaRad: 0, rateSigmaRadPerS: 0, rateBiasRadPerS: bias, adversarialEta: 0 };
      const core = new LoopCore({
        plant: veh.plant,
        wheels: veh.wheels,
        controller: law(SPECS[0]!, veh),
        reference: fixedReference(),
        q0: [0, 0, 0, 1],
        omega0: [0, 0, 0],
        hWheel0: new Float64Array(veh.wheels.n),
        tEnd: 1,
        timing: 'sampled',
        controlRateHz: 10,
        rk4StepsPerSample: 1,
        sensors,
        seed: 1,
        actuation: { mode: 'hold' },
        allocation: 'min-norm',
      });
      for (let k = 0; k < 4000; k++) {
        // Mostly ordinary values, with one or two special ones somewhere.
        for (let i = 0; i < 4; i++) core.qTrue[i] = k % 5 === 0 ? pick(rng.next()) : rng.normal();
        for (let i = 0; i < 3; i++) core.wTrue[i] = k % 2 === 0 ? pick(rng.next()) : rng.normal();
        for (let i = 0; i < core.N; i++) core.hTrue[i] = k % 7 === 0 ? pick(rng.next()) : rng.normal();
        measure(core.qMeas, core.wMeas, sensors, core.rng, core.qTrue, core.wTrue, core.qRef, core.axis);
        for (let i = 0; i < core.N; i++) core.hMeas[i] = core.hTrue[i]!; // as sampled.ts does
        let same = true;
        for (let i = 0; i < 4; i++) if (!Object.is(core.qMeas[i], core.qTrue[i])) same = false;
        for (let i = 0; i < 3; i++) if (!Object.is(core.wMeas[i], core.wTrue[i])) same = false;
        for (let i = 0; i < core.N; i++) if (!Object.is(core.hMeas[i], core.hTrue[i])) same = false;
        // NaN equals itself under Object.is but never under ===: the loop then takes the general path.
        let anyNaN = false;
        for (const a of [core.qTrue, core.wTrue, core.hTrue]) for (let i = 0; i < a.length; i++) if (Number.isNaN(a[i])) anyNaN = true;
        const want = same && !anyNaN;
        expect(core.measuredIsTrue()).toBe(want);
        if (want) agreeTrue++;
        else agreeFalse++;
      }
    }
    expect(agreeTrue).toBeGreaterThan(1000);
    expect(agreeFalse).toBeGreaterThan(1000);
  });
});
