/**
 * What a closed-loop run records, checked from the trace alone against elementary definitions
 * (no source beyond the conventions of app/engine/math/rotation.ts: Hamilton, [x, y, z, w]):
 * unit quaternions, increasing time ending at tEnd, the error-angle channel equal to the shortest
 * angle 2·arccos|q_ref·q| recomputed here, j counting the listed logic jumps, segment latching at
 * the reference's switch time in the ideal mode (a sample exactly there) and at the first sample
 * after it when sampled, and the final sample taken against the reference at the end time.
 */
import { describe, expect, it } from 'vitest';
import type { ReferenceSource } from '../../app/engine/sim/closedLoop';
import type { RunTrace } from '../../app/engine/sim/types';
import { fly, law, pyramidVehicle } from '../reference/closedloop-fixtures';

const veh = pyramidVehicle(
  [
    [2, 0.1, 0],
    [0.1, 3, 0],
    [0, 0, 4],
  ],
  1,
  10,
);
const gains = { omegaN: 0.4, zeta: 0.9 };
const LAWS: Record<string, unknown>[] = [
  { kind: 'quaternion-pd', gains },
  { kind: 'sign-switch', gains },
  { kind: 'hysteretic', gains, hysteresis: 0.2 },
  { kind: 'eigenaxis', gains, maxRateRadPerS: 0.1 },
  { kind: 'synergistic', gains, potential: { eigenvalues: [1, 2, 3] }, warpGain: 0.15, hysteresis: 0.2 },
];

/** Two segments: identity until T_SWITCH, then 150° about (0, 0.6, 0.8); switch times listed. */
const T_SWITCH = 12.345;
function twoTargets(listSwitch: boolean): ReferenceSource {
  const s = Math.sin((0.5 * 150 * Math.PI) / 180),
    c = Math.cos((0.5 * 150 * Math.PI) / 180);
  const q1 = [0, 0.6 * s, 0.8 * s, c];
  return {
    at: (t, q, w, wd) => {
      const k = t >= T_SWITCH ? 1 : 0;
      q[0] = k ? q1[0]! : 0;
      q[1] = k ? q1[1]! : 0;
      q[2] = k ? q1[2]! : 0;
      q[3] = k ? q1[3]! : 1;
      w.fill(0);
      wd.fill(0);
      return k;
    },
    ...(listSwitch ? { switchTimes: [0, T_SWITCH] } : {}),
  };
}

function checkTrace(tr: RunTrace, tEnd: number): void {
  expect(tr.n).toBeGreaterThan(10);
  for (let k = 0; k < tr.n; k++) {
    const q = tr.q.subarray(4 * k, 4 * k + 4),
      d = tr.qRef.subarray(4 * k, 4 * k + 4);
    expect(Math.abs(Math.hypot(q[0]!, q[1]!, q[2]!, q[3]!) - 1)).toBeLessThan(1e-12);
    const dot = Math.min(1, Math.abs(q[0]! * d[0]! + q[1]! * d[1]! + q[2]! * d[2]! + q[3]! * d[3]!));
    expect(Math.abs(tr.errorAngle[k]! - 2 * Math.acos(dot))).toBeLessThan(1e-6);
    if (k > 0) expect(tr.t[k]).toBeGreaterThan(tr.t[k - 1]!);
  }
  expect(tr.t[0]).toBe(0);
  expect(tr.t[tr.n - 1]).toBeCloseTo(tEnd, 9);
}

describe('closed-loop trace contents', () => {
  for (const timing of ['sampled', 'continuous-ideal'] as const) {
    for (const spec of LAWS) {
      it(`${spec.kind}, ${timing}: unit q, increasing t to tEnd, error angle, j vs jumps, segment switch`, () => {
        const tEnd = 40.05; // not a multiple of the period: the last sample is the end state
        const r = fly({
          vehicle: veh,
          controller: law(spec, veh),
          q0: [0.3, -0.2, 0.1, Math.sqrt(1 - 0.14)],
          tEnd,
          reference: twoTargets(true),
          timing,
          controlRateHz: 10,
          rk4StepsPerSample: 2,
        });
        expect(r.outcome.status).toBe('completed');
        const tr = r.trace;
        checkTrace(tr, tEnd);
        // j counts the listed logic jumps, in order
        expect(tr.j[tr.n - 1]).toBe(r.jumps.length);
        r.jumps.forEach((ev, i) => expect(ev.j).toBe(i + 1));
        // segment index follows the reference; the switch is seen exactly (ideal) or at the next sample
        const first1 = Array.from(tr.segment).indexOf(1);
        expect(first1).toBeGreaterThan(0);
        if (timing === 'continuous-ideal') expect(tr.t[first1]).toBeCloseTo(T_SWITCH, 12);
        else expect(tr.t[first1]).toBeCloseTo(Math.ceil(T_SWITCH * 10) / 10, 9);
        for (let k = first1; k < tr.n; k++) expect(tr.segment[k]).toBe(1);
      });
    }
  }

  it('eigenaxis, ideal mode: the switch time is landed on, so the second slew latches from the state at that instant and keeps its axis', () => {
    // Starts at rest on the first target. With the switch listed, the run stops at 12.345 s and the
    // law latches its limits from the exact error there (along (0, 0.6, 0.8)); without it the flow
    // already sees the new target with the first segment's limits until the next output sample,
    // which pushes the body off the eigenaxis.
    const axis = [0, 0.6, 0.8];
    const run = (list: boolean) =>
      fly({
        vehicle: veh,
        controller: law(LAWS[3]!, veh),
        q0: [0, 0, 0, 1],
        tEnd: 60,
        reference: twoTargets(list),
        timing: 'continuous-ideal',
        controlRateHz: 10,
        rk4StepsPerSample: 2,
      }).trace;
    const deviation = (tr: RunTrace) => {
      let worst = 0;
      for (let k = 0; k < tr.n; k++) {
        if (tr.segment[k] !== 1) continue;
        // error of q against the second target, about the slew axis: q_e = q1* ⊗ q has vector part ∥ axis
        const d = tr.qRef.subarray(4 * k, 4 * k + 4),
          q = tr.q.subarray(4 * k, 4 * k + 4);
        const ex = d[3]! * q[0]! - d[0]! * q[3]! - d[1]! * q[2]! + d[2]! * q[1]!;
        const ey = d[3]! * q[1]! - d[1]! * q[3]! - d[2]! * q[0]! + d[0]! * q[2]!;
        const ez = d[3]! * q[2]! - d[2]! * q[3]! - d[0]! * q[1]! + d[1]! * q[0]!;
        const n = Math.hypot(ex, ey, ez);
        if (n < Math.sin(0.5 * 1e-3)) continue;
        const cx = ey * axis[2]! - ez * axis[1]!,
          cy = ez * axis[0]! - ex * axis[2]!,
          cz = ex * axis[1]! - ey * axis[0]!;
        worst = Math.max(worst, Math.hypot(cx, cy, cz) / n);
      }
      return worst;
    };
    const a = run(true),
      b = run(false);
    expect(Array.from(a.t).some((t) => Math.abs(t - T_SWITCH) < 1e-12)).toBe(true);
    expect(Array.from(b.t).some((t) => Math.abs(t - T_SWITCH) < 1e-12)).toBe(false);
    expect(deviation(a)).toBeLessThan(1e-9);
    expect(deviation(b)).toBeGreaterThan(1e-6);
    expect(a.errorAngle[a.n - 1]).toBeLessThan(1e-3);
  });
});
