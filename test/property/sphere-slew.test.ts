/**
 * The reduced (pointing-only) slew (app/engine/control/sphere/slew.ts) timed by the planner's own
 * planCheckedSegment (app/engine/plan/segment.ts).
 *
 * Sources:
 *  - Geometry: a rotation by φ moves a unit vector v by at most φ (|R v − v| = 2 sin(φ/2)|n × v|),
 *    so every attitude with R b = r is at least ∠(R(q0)b, r) away from q0 (Euler's rotation
 *    theorem; standard, no source). The shortest such rotation is about x0 × r by that angle.
 *  - Rest-to-rest eigenaxis closed forms with zero stored momentum (references §2; Wie, Space
 *    Vehicle Dynamics and Control, 2nd ed., AIAA 2008 — from memory): with torque along Je,
 *    a = m_τ C_τ(Ĵe)/|Je|, w = min(rate cap, m_h C_h(Ĵe)/|Je|); T = 2√(θ/a) when θ ≤ w²/a, else
 *    θ/w + w/a. The cube envelope of an orthogonal triad: C(d̂) = l / max_i |d̂_i| (references §3).
 *  - "Never faster": with J = jI and direction-independent (spherical) envelopes the planner's time
 *    depends on the angle alone and grows with it, so no full-attitude slew with the same final
 *    pointing can beat the reduced one. This does NOT hold in general: on an anisotropic body a
 *    longer rotation about a lighter axis can be much faster (explicit case below, and a cube
 *    envelope alone breaks it too); the saving function reports the signed planner result.
 */
import fc from 'fast-check';
import Quaternion from 'quaternion';
import { describe, expect, it } from 'vitest';
import { reducedSlewSaving, reducedTargetAttitude, type SlewPlanner } from '../../app/engine/control/sphere/index';
import { cubeCapacity } from '../../app/engine/plan/limits';
import { planCheckedSegment } from '../../app/engine/plan/segment';
import type { PlanLimits } from '../../app/engine/plan/types';
import { RAD_PER_DEG } from '../../app/engine/units';

type V3 = [number, number, number];
const unit = (v: number[]): V3 => {
  const n = Math.hypot(v[0]!, v[1]!, v[2]!);
  return [v[0]! / n, v[1]! / n, v[2]! / n];
};
const rot = (q: number[], v: V3) => new Quaternion(q[3]!, q[0]!, q[1]!, q[2]!).rotateVector(v) as V3;
const ang = (a: V3, b: V3) =>
  Math.atan2(
    Math.hypot(a[1] * b[2] - a[2] * b[1], a[2] * b[0] - a[0] * b[2], a[0] * b[1] - a[1] * b[0]),
    a[0] * b[0] + a[1] * b[1] + a[2] * b[2],
  );
const planner =
  (J: number[], limits: PlanLimits): SlewPlanner =>
  (a, b) =>
    planCheckedSegment(a, b, Float64Array.from(J), new Float64Array(3), limits);

const arbUnit = fc
  .tuple(
    fc.double({ min: -1, max: 1, noNaN: true }),
    fc.double({ min: -1, max: 1, noNaN: true }),
    fc.double({ min: -1, max: 1, noNaN: true }),
  )
  .filter((v) => Math.hypot(...v) > 0.1)
  .map(unit);
const arbQuat = fc.tuple(arbUnit, fc.double({ min: 0, max: 2 * Math.PI, noNaN: true })).map(([ax, t]) => {
  const q = Quaternion.fromAxisAngle(ax, t);
  return [q.x, q.y, q.z, q.w];
});

describe('reduced target: the axis moved by θ', () => {
  it('angle θ, R(q1)b = r, and the planner times it with the rest-to-rest closed forms (cube envelope, principal J)', () => {
    const J = [0.11, 0, 0, 0, 0.12, 0, 0, 0, 0.08];
    const lt = 2e-3,
      lh = 6e-3,
      mt = 0.8,
      mh = 0.9;
    const limits: PlanLimits = {
      torqueCapacity: cubeCapacity(lt),
      momentumCapacity: cubeCapacity(lh),
      torqueMargin: mt,
      momentumMargin: mh,
    };
    fc.assert(
      fc.property(arbQuat, arbUnit, arbUnit, fc.double({ min: 1e-3, max: Math.PI - 1e-3, noNaN: true }), (q0, b, w, theta) => {
        // r at exactly θ from x0 = R(q0)b: rotate x0 by θ about an axis n ⊥ x0
        const x0 = rot(q0, b);
        const d = w[0] * x0[0] + w[1] * x0[1] + w[2] * x0[2];
        if (Math.abs(d) > 0.99) return;
        const n = unit([w[0] - d * x0[0], w[1] - d * x0[1], w[2] - d * x0[2]]);
        const r = Quaternion.fromAxisAngle(n, theta).rotateVector(x0) as V3;
        const red = reducedTargetAttitude(q0, b, r);
        if (!red.ok) throw new Error('rejected');
        expect(Math.abs(red.value.angleRad - theta)).toBeLessThan(1e-9);
        expect(ang(rot(Array.from(red.value.q), b), r)).toBeLessThan(1e-9);
        const p = planCheckedSegment(Float64Array.from(q0), red.value.q, Float64Array.from(J), new Float64Array(3), limits);
        if (!p.feasible) throw new Error('infeasible');
        expect(Math.abs(p.angleRad - theta)).toBeLessThan(1e-9);
        // closed form, computed here from the eigenaxis e (body) of the reduced rotation
        const e = Array.from(red.value.axisBody);
        const Je = [J[0]! * e[0]!, J[4]! * e[1]!, J[8]! * e[2]!];
        const nJe = Math.hypot(...Je);
        const cap = (l: number) => l / (Math.max(...Je.map(Math.abs)) / nJe);
        const a = (mt * cap(lt)) / nJe,
          wmax = (mh * cap(lh)) / nJe;
        const T = theta <= (wmax * wmax) / a ? 2 * Math.sqrt(theta / a) : theta / wmax + wmax / a;
        expect(Math.abs(p.durationS - T)).toBeLessThan(1e-9 * T);
      }),
      { numRuns: 300, seed: 11 },
    );
  });

  it('θ = 0 and θ = π (antiparallel) are handled: identity and a rotation by π about an axis ⊥ x0', () => {
    const q0 = [0.1, -0.2, 0.3, Math.sqrt(1 - 0.14)];
    const b: V3 = [0, 0, 1];
    const x0 = rot(q0, b);
    const same = reducedTargetAttitude(q0, b, x0);
    if (!same.ok) throw new Error('rejected');
    expect(same.value.angleRad).toBeLessThan(1e-12); // rounding of x0 only
    const flip = reducedTargetAttitude(q0, b, [-x0[0], -x0[1], -x0[2]]);
    if (!flip.ok) throw new Error('rejected');
    expect(flip.value.angleRad).toBeCloseTo(Math.PI, 14);
    expect(ang(rot(Array.from(flip.value.q), b), [-x0[0], -x0[1], -x0[2]])).toBeLessThan(1e-12);
    const n = flip.value.axisInertial;
    expect(Math.abs(n[0]! * x0[0] + n[1]! * x0[1] + n[2]! * x0[2])).toBeLessThan(1e-12);
  });

  it('bad input is listed, not thrown', () => {
    const r = reducedTargetAttitude([0, 0, 0, 2], [0, 0, 0], [1, NaN, 0]);
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.errors.map((i) => i.path).sort()).toEqual(['axis', 'direction', 'q0']);
  });
});

describe('full-attitude slews with the same pointing', () => {
  it('are never smaller in angle, on any vehicle (geometry)', () => {
    fc.assert(
      fc.property(arbQuat, arbUnit, arbQuat, fc.double({ min: 0, max: 2 * Math.PI, noNaN: true }), (q0, b, qf0, roll) => {
        const r = rot(qf0, b);
        const full = Quaternion.fromAxisAngle(r, roll).mul(new Quaternion(qf0[3]!, qf0[0]!, qf0[1]!, qf0[2]!));
        const red = reducedTargetAttitude(q0, b, r);
        if (!red.ok) throw new Error('rejected');
        const rel = new Quaternion(q0[3]!, q0[0]!, q0[1]!, q0[2]!).conjugate().mul(full);
        const fullAngle = 2 * Math.atan2(Math.hypot(rel.x, rel.y, rel.z), Math.abs(rel.w));
        expect(fullAngle).toBeGreaterThanOrEqual(red.value.angleRad - 1e-12);
      }),
      { numRuns: 1000, seed: 12 },
    );
  });

  it('are never faster with J = jI and spherical envelopes (planner time grows with the angle alone)', () => {
    fc.assert(
      fc.property(
        arbQuat,
        arbUnit,
        arbQuat,
        fc.double({ min: 0, max: 2 * Math.PI, noNaN: true }),
        fc.double({ min: 0.01, max: 2, noNaN: true }),
        fc.double({ min: 1e-3, max: 0.1, noNaN: true }),
        fc.double({ min: 1e-3, max: 1, noNaN: true }),
        fc.option(fc.double({ min: 0.2 * RAD_PER_DEG, max: 10 * RAD_PER_DEG, noNaN: true }), { nil: undefined }),
        (q0, b, qf0, roll, j, ct, ch, slew) => {
          const limits: PlanLimits = {
            torqueCapacity: () => ct,
            momentumCapacity: () => ch,
            torqueMargin: 0.9,
            momentumMargin: 0.9,
            slewRateLimitRadPerS: slew,
          };
          const full = Quaternion.fromAxisAngle(rot(qf0, b), roll).mul(new Quaternion(qf0[3]!, qf0[0]!, qf0[1]!, qf0[2]!));
          const s = reducedSlewSaving(q0, b, [full.x, full.y, full.z, full.w], planner([j, 0, 0, 0, j, 0, 0, 0, j], limits));
          if (!s.ok) throw new Error('rejected');
          expect(s.value.reduced.feasible && s.value.full.feasible).toBe(true);
          expect(s.value.pointingResidualRad).toBeLessThan(1e-9);
          expect(s.value.angleSavedRad).toBeGreaterThanOrEqual(-1e-12);
          // near θ = 0 the time 2√(θ/a) turns angle rounding (~1e-15 rad) into ~√(1e-15/a) s
          const a = (0.9 * ct) / j;
          expect(s.value.timeSavedS!).toBeGreaterThanOrEqual(-1e-9 * s.value.full.durationS! - 2 * Math.sqrt(1e-14 / a));
        },
      ),
      { numRuns: 500, seed: 13 },
    );
  });

  it('counter-example on an anisotropic body: a π rotation about a light axis beats the 90° reduced slew, and the saving says so', () => {
    // J = diag(0.01, 0.01, 1) kg·m², b = x, q0 = identity, r = y: reduced = 90° about z (|Je| = 1);
    // full target = 180° about (x + y)/√2 (|Je| = 0.01), also putting x on y. Spherical envelopes,
    // momentum capacity high enough for bang-bang: T = 2√(θ|Je|/(m_τ C_τ)) (references §2).
    const J = [0.01, 0, 0, 0, 0.01, 0, 0, 0, 1];
    const ct = 1e-3,
      m = 0.9;
    const limits: PlanLimits = { torqueCapacity: () => ct, momentumCapacity: () => 10, torqueMargin: m, momentumMargin: m };
    const s2 = Math.SQRT1_2;
    const full = [s2, s2, 0, 0]; // sin(90°)·(1,1,0)/√2, cos(90°)
    const r = reducedSlewSaving([0, 0, 0, 1], [1, 0, 0], full, planner(J, limits));
    if (!r.ok) throw new Error('rejected');
    const Tred = 2 * Math.sqrt(((Math.PI / 2) * 1) / (m * ct));
    const Tfull = 2 * Math.sqrt((Math.PI * 0.01) / (m * ct));
    expect(r.value.reduced.durationS).toBeCloseTo(Tred, 9);
    expect(r.value.full.durationS).toBeCloseTo(Tfull, 9);
    expect(r.value.timeSavedS).toBeCloseTo(Tfull - Tred, 9);
    expect(r.value.timeSavedS!).toBeLessThan(0);
    expect(r.value.angleSavedRad).toBeCloseTo(Math.PI / 2, 12);
    expect(r.value.summary).toMatch(/COSTS/);
  });
});
