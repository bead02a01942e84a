/**
 * One eigenaxis segment: times against closed forms computed here, the Je subtlety, binding
 * limits, stored momentum and infeasible verdicts.
 *
 * Sources: rest-to-rest closed forms (standard kinematics; B. Wie, Space Vehicle Dynamics and
 * Control, 2nd ed., AIAA 2008; Wie, Bailey & Heiberg, JGCD 25(1), 2002 — from memory). The
 * torque direction Je (not e) and the momentum −Jω with H = 0 are references §2 (derived there
 * from Euler's equation with wheels); the stored-momentum bounds below are derived in the test
 * from h_w = H_B − ω J e, τ = J e α + ω e × H_B (methods §6 gyrostat equations).
 */
import { describe, expect, it } from 'vitest';
import { planSegment } from '../../app/engine/plan/segment';
import { planSequence } from '../../app/engine/plan/sequence';
import { evaluatePlannedLoads } from '../../app/engine/plan/reference';
import { boxCapacity, cubeCapacity } from '../../app/engine/plan/limits';
import type { PlanLimits, SegmentPlan, SegmentVerdict } from '../../app/engine/plan/types';
import type { Result } from '../../app/engine/errors';

const D = Math.PI / 180;
const diag = (a: number, b: number, c: number) => [a, 0, 0, 0, b, 0, 0, 0, c];
const axisAngle = (ax: number[], th: number) => {
  const n = Math.hypot(ax[0]!, ax[1]!, ax[2]!),
    s = Math.sin(th / 2) / n;
  return [ax[0]! * s, ax[1]! * s, ax[2]! * s, Math.cos(th / 2)];
};
const I4 = [0, 0, 0, 1];
const sphere = (c: number) => () => c;

function feasible(r: Result<SegmentVerdict>): SegmentPlan {
  if (!r.ok) throw new Error(JSON.stringify(r.errors));
  if (!r.value.feasible) throw new Error(JSON.stringify(r.value.reasons));
  return r.value;
}
function infeasible(r: Result<SegmentVerdict>) {
  if (!r.ok) throw new Error(JSON.stringify(r.errors));
  if (r.value.feasible) throw new Error('expected an infeasible verdict');
  return r.value;
}
/** J v for column-major J (written here, independently of the engine's mat3). */
const mulJ = (J: number[], v: number[]) => [0, 1, 2].map((r) => J[r]! * v[0]! + J[3 + r]! * v[1]! + J[6 + r]! * v[2]!);

describe('zero stored momentum: closed forms', () => {
  // Principal axis z, J_zz = 12 kg·m². Envelopes sized so that a = 1 deg/s² (margin 0.8) and the
  // momentum cap is 3 deg/s (margin 0.9): a = m_τ l_τ / J, w = m_h l_h / J.
  const J = diag(8, 10, 12);
  const lt = (1 * D * 12) / 0.8;
  const lh3 = (3 * D * 12) / 0.9;

  it('90° about z, 1 deg/s², 3 deg/s cap ⇒ 3 s + 27 s + 3 s = 33 s, momentum binds', () => {
    const lim: PlanLimits = {
      torqueCapacity: cubeCapacity(lt),
      momentumCapacity: cubeCapacity(lh3),
      torqueMargin: 0.8,
      momentumMargin: 0.9,
    };
    const p = feasible(planSegment({ qStart: I4, qTarget: axisAngle([0, 0, 1], 90 * D), inertia: J, wheelMomentumBody: [0, 0, 0] }, lim));
    const th = 90 * D,
      a = 1 * D,
      w = 3 * D;
    expect(Math.abs(p.durationS - (th / w + w / a))).toBeLessThan(1e-9);
    expect(Math.abs(p.durationS - 33)).toBeLessThan(1e-9);
    expect(Math.abs(p.switchTimesS[0]! - 3)).toBeLessThan(1e-9);
    expect(Math.abs(p.switchTimesS[1]! - 30)).toBeLessThan(1e-9);
    expect(Math.abs(p.peakRateRadPerS - w)).toBeLessThan(1e-15);
    expect(p.binding).toBe('momentum');
    expect(p.method).toBe('closed-form');
    expect(p.profile.kind).toBe('bang-coast-bang');
    expect(Math.abs(p.peakTorqueFraction - 0.8)).toBeLessThan(1e-12);
    expect(Math.abs(p.peakMomentumFraction - 0.9)).toBeLessThan(1e-12);
  });

  it('slew-rate limit below the momentum cap binds: same 33 s with 3 deg/s limit and a 4 deg/s envelope', () => {
    const lh4 = (4 * D * 12) / 0.9;
    const lim: PlanLimits = {
      torqueCapacity: cubeCapacity(lt),
      momentumCapacity: cubeCapacity(lh4),
      torqueMargin: 0.8,
      momentumMargin: 0.9,
      slewRateLimitRadPerS: 3 * D,
    };
    const p = feasible(planSegment({ qStart: I4, qTarget: axisAngle([0, 0, 1], 90 * D), inertia: J, wheelMomentumBody: [0, 0, 0] }, lim));
    expect(Math.abs(p.durationS - 33)).toBeLessThan(1e-9);
    expect(p.binding).toBe('slew-rate');
    expect(Math.abs(p.slewRateFraction - 1)).toBeLessThan(1e-12);
    expect(Math.abs(p.peakMomentumFraction - 0.9 * (3 / 4))).toBeLessThan(1e-12);
  });

  it('a short slew is bang-bang and torque binds: T = 2√(θ/a)', () => {
    const lim: PlanLimits = {
      torqueCapacity: cubeCapacity(lt),
      momentumCapacity: cubeCapacity(lh3),
      torqueMargin: 0.8,
      momentumMargin: 0.9,
    };
    const p = feasible(planSegment({ qStart: I4, qTarget: axisAngle([0, 0, 1], 8 * D), inertia: J, wheelMomentumBody: [0, 0, 0] }, lim));
    expect(Math.abs(p.durationS - 2 * Math.sqrt((8 * D) / (1 * D)))).toBeLessThan(1e-9);
    expect(p.profile.kind).toBe('bang-bang');
    expect(p.binding).toBe('torque');
    expect(Math.abs(p.switchTimesS[0]! - p.durationS / 2)).toBeLessThan(1e-12);
    expect(p.peakMomentumFraction).toBeLessThan(0.9);
  });

  it('zero angle (target = −start, the same attitude): binding none, zero time', () => {
    const q = axisAngle([1, 2, 3], 0.7);
    const lim: PlanLimits = { torqueCapacity: sphere(1), momentumCapacity: sphere(1), torqueMargin: 1, momentumMargin: 1 };
    const p = feasible(planSegment({ qStart: q, qTarget: q.map((x) => -x), inertia: J, wheelMomentumBody: [0, 0, 0] }, lim));
    expect(p.binding).toBe('none');
    expect(p.durationS).toBe(0);
    expect(p.switchTimesS).toEqual([]);
    expect(p.angleRad).toBe(0);
  });

  it('takes the shortest rotation: a 270° target about +z is flown as 90° about −z', () => {
    const lim: PlanLimits = {
      torqueCapacity: cubeCapacity(lt),
      momentumCapacity: cubeCapacity(lh3),
      torqueMargin: 0.8,
      momentumMargin: 0.9,
    };
    const q1 = axisAngle([0, 0, 1], 270 * D); // w = cos 135° < 0
    const p = feasible(planSegment({ qStart: I4, qTarget: q1, inertia: J, wheelMomentumBody: [0, 0, 0] }, lim));
    expect(Math.abs(p.angleRad - 90 * D)).toBeLessThan(1e-12);
    expect(Math.abs(p.axisBody[2]! + 1)).toBeLessThan(1e-12);
    expect(
      Array.from(p.qEnd)
        .map((x, i) => Math.abs(x + q1[i]!))
        .every((d) => d < 1e-15),
    ).toBe(true);
    expect(Math.abs(p.durationS - 33)).toBeLessThan(1e-9);
  });
});

describe('non-principal axis: the wheels push along Je (references §2)', () => {
  // Invented 6U-like inertia with products of inertia (kg·m²), column-major = row-major (symmetric).
  const J = [0.11, 0.004, -0.003, 0.004, 0.12, 0.002, -0.003, 0.002, 0.08];
  const e = [1 / 3, 2 / 3, 2 / 3];
  const th = 120 * D;
  const Je = mulJ(J, e);
  const JeNorm = Math.hypot(Je[0]!, Je[1]!, Je[2]!);
  const eJe = e[0]! * Je[0]! + e[1]! * Je[1]! + e[2]! * Je[2]!;

  it('norm-bounded torque: a = m c / |Je| (not m c / eᵀJe); T = 2√(θ/a)', () => {
    const c = 0.002,
      m = 0.7;
    const lim: PlanLimits = { torqueCapacity: sphere(c), momentumCapacity: sphere(10), torqueMargin: m, momentumMargin: 1 };
    const p = feasible(planSegment({ qStart: I4, qTarget: axisAngle(e, th), inertia: J, wheelMomentumBody: [0, 0, 0] }, lim));
    const T = 2 * Math.sqrt((th * JeNorm) / (m * c));
    expect(Math.abs(p.durationS - T)).toBeLessThan(1e-9);
    expect(p.binding).toBe('torque');
    // The naive eᵀJe would promise a shorter slew than the wheels can fly.
    const tNaive = 2 * Math.sqrt((th * eJe) / (m * c));
    expect(JeNorm).toBeGreaterThan(eJe);
    expect(p.durationS - tNaive).toBeGreaterThan(1e-4);
  });

  it('per-axis (box) torque limit: a = m l / max_i |(Je)_i|, derived from |(Je)_i a| ≤ m l', () => {
    const l = 0.002,
      m = 0.9;
    const lim: PlanLimits = { torqueCapacity: cubeCapacity(l), momentumCapacity: sphere(10), torqueMargin: m, momentumMargin: 1 };
    const p = feasible(planSegment({ qStart: I4, qTarget: axisAngle(e, th), inertia: J, wheelMomentumBody: [0, 0, 0] }, lim));
    const a = (m * l) / Math.max(...Je.map(Math.abs));
    expect(Math.abs(p.durationS - 2 * Math.sqrt(th / a))).toBeLessThan(1e-9);
    expect(Math.abs(p.peakTorqueFraction - m)).toBeLessThan(1e-12);
  });

  it('momentum cap along Je: w = m_h C_h / |Je|, and the planned torque at the start is parallel to Je', () => {
    const lim: PlanLimits = { torqueCapacity: sphere(0.002), momentumCapacity: sphere(0.003), torqueMargin: 1, momentumMargin: 0.8 };
    const r = planSequence({ qStart: I4, inertia: J, wheelMomentumBody: [0, 0, 0], targets: [{ q: axisAngle(e, th), holdS: 0 }] }, lim);
    if (!r.ok || !r.value.feasible) throw new Error('expected feasible');
    const p = r.value.timeline[0]!.plan;
    const w = (0.8 * 0.003) / JeNorm;
    const a = 0.002 / JeNorm;
    expect(Math.abs(p.durationS - (th / w + w / a))).toBeLessThan(1e-9);
    expect(p.binding).toBe('momentum');
    const tau = new Float64Array(3),
      h = new Float64Array(3);
    evaluatePlannedLoads(r.value, 1e-3, tau, h);
    const cr = [tau[1]! * Je[2]! - tau[2]! * Je[1]!, tau[2]! * Je[0]! - tau[0]! * Je[2]!, tau[0]! * Je[1]! - tau[1]! * Je[0]!];
    expect(Math.hypot(cr[0]!, cr[1]!, cr[2]!) / (Math.hypot(tau[0]!, tau[1]!, tau[2]!) * JeNorm)).toBeLessThan(1e-12);
    // wheel momentum = −ω J e (H = 0)
    const om = a * 1e-3;
    for (let i = 0; i < 3; i++) expect(Math.abs(h[i]! + om * Je[i]!)).toBeLessThan(1e-15);
  });
});

describe('stored momentum', () => {
  // Principal J, slew about z. Torque: cube 0.05 N·m at margin 0.8 ⇒ a ≤ 0.04/12 rad/s².
  // Momentum: cube 0.5 N·m·s at margin 0.9 ⇒ 0.45 N·m·s usable per axis.
  const J = diag(8, 10, 12);
  const th = 120 * D;
  const guard = 1e-3; // search band below the margins (search.ts SEARCH_GUARD)
  const lim: PlanLimits = {
    torqueCapacity: cubeCapacity(0.05),
    momentumCapacity: cubeCapacity(0.5),
    torqueMargin: 0.8,
    momentumMargin: 0.9,
  };
  const plan = (h: number[], l: PlanLimits = lim) =>
    planSegment({ qStart: I4, qTarget: axisAngle([0, 0, 1], th), inertia: J, wheelMomentumBody: h }, l);

  it('momentum along −e (the way the slew loads the wheels) lowers the rate cap to (0.45 − k)/J', () => {
    const base = feasible(plan([0, 0, 0]));
    expect(Math.abs(base.peakRateRadPerS - 0.45 / 12)).toBeLessThan(1e-15);
    const k = 0.15;
    const p = feasible(plan([0, 0, -k]));
    // h_w = −(k + J w) e_z stays axial and the gyroscopic term vanishes (e × H_B = 0):
    const wExact = (0.45 - k) / 12;
    const wGuard = (0.45 * (1 - 2 * guard) - k) / 12;
    expect(p.peakRateRadPerS).toBeLessThanOrEqual(wExact * (1 + 1e-12));
    expect(p.peakRateRadPerS).toBeGreaterThan(wGuard);
    expect(p.peakRateRadPerS).toBeLessThan(base.peakRateRadPerS);
    expect(p.durationS).toBeGreaterThan(base.durationS);
    expect(p.binding).toBe('momentum');
    expect(p.method).toBe('sampled-search');
    expect(p.peakMomentumFraction).toBeLessThanOrEqual(0.9);
  });

  it('momentum along +e raises the rate cap to (0.45 + k)/J', () => {
    const k = 0.15;
    const p = feasible(plan([0, 0, k]));
    const wExact = (0.45 + k) / 12;
    expect(p.peakRateRadPerS).toBeLessThanOrEqual(wExact * (1 + 1e-12));
    expect(p.peakRateRadPerS).toBeGreaterThan((0.45 * (1 - 2 * guard) + k) / 12);
    expect(p.binding).toBe('momentum');
  });

  it('momentum across e adds gyroscopic torque |h⊥| ω that lowers the acceleration (norm-bounded torque)', () => {
    // Sphere torque envelope c = 0.05 at margin 0.8: (J_zz a)² + (0.3 w)² ≤ 0.04² at the switches.
    // Cube momentum 0.5 at 0.9: the z part J_zz w ≤ 0.45 ⇒ w ≤ 0.0375; |H_B| = 0.3 < 0.45 per axis.
    const l2: PlanLimits = { ...lim, torqueCapacity: sphere(0.05) };
    const p = feasible(plan([0.3, 0, 0], l2));
    const wMax = 0.45 / 12;
    const aAt = (w: number) => Math.sqrt(0.04 ** 2 - (0.3 * w) ** 2) / 12;
    expect(p.peakRateRadPerS).toBeLessThanOrEqual(wMax * (1 + 1e-12));
    expect(p.peakRateRadPerS).toBeGreaterThan(wMax * (1 - 3 * guard));
    const aBound = aAt(p.peakRateRadPerS);
    expect(p.profile.accelRadPerS2).toBeLessThanOrEqual(aBound * (1 + 1e-12));
    expect(p.profile.accelRadPerS2).toBeGreaterThan(aBound * (1 - 3 * guard));
    expect(p.profile.accelRadPerS2).toBeLessThan(0.97 * (0.04 / 12)); // clearly below the H = 0 value
    expect(p.peakTorqueFraction).toBeLessThanOrEqual(0.8);
    expect(p.peakTorqueFraction).toBeGreaterThan(0.8 * (1 - 3 * guard));
  });

  it('with stored momentum the slew-rate limit and the torque limit are still classified', () => {
    const slow = feasible(plan([0, 0, 0.05], { ...lim, slewRateLimitRadPerS: 0.5 * D }));
    expect(slow.binding).toBe('slew-rate');
    expect(slow.peakRateRadPerS).toBeLessThanOrEqual(0.5 * D);
    expect(slow.peakRateRadPerS).toBeGreaterThan(0.5 * D * (1 - 1e-2));
    // A short slew with ample momentum room is bang-bang and torque-bound.
    const short = feasible(
      planSegment({ qStart: I4, qTarget: axisAngle([0, 0, 1], 2 * D), inertia: J, wheelMomentumBody: [0, 0, 0.05] }, lim),
    );
    expect(short.profile.kind).toBe('bang-bang');
    expect(short.binding).toBe('torque');
  });

  it('a tiny stored momentum gives nearly the closed-form time (continuity of the search)', () => {
    const base = feasible(plan([0, 0, 0]));
    const p = feasible(plan([1e-9, 0, 0]));
    expect(p.durationS).toBeGreaterThanOrEqual(base.durationS);
    expect(p.durationS).toBeLessThan(base.durationS * (1 + 3 * guard));
  });

  it('momentum already outside, or exactly at, the margin: infeasible with the reason', () => {
    const out = infeasible(plan([0.6, 0, 0]));
    expect(out.reasons.map((r) => r.rule)).toContain('stored-momentum-start');
    expect(out.reasons[0]!.message).toMatch(/120\.0%/);
    const at = infeasible(plan([0.45, 0, 0])); // exactly 0.9 of the 0.5 cube along x
    expect(at.reasons.map((r) => r.rule)).toContain('stored-momentum-start');
  });

  it('momentum that fits at the start but not at the target: infeasible (end check)', () => {
    // 1.2 along (1,1,0)/√2 uses 1.2/√2 = 85% of a unit cube; after 45° about z the body sees it along
    // (1,0,0), i.e. 120%.
    const l: PlanLimits = { torqueCapacity: cubeCapacity(1), momentumCapacity: cubeCapacity(1), torqueMargin: 1, momentumMargin: 1 };
    const h = [1.2 / Math.SQRT2, 1.2 / Math.SQRT2, 0];
    const v = infeasible(planSegment({ qStart: I4, qTarget: axisAngle([0, 0, 1], 45 * D), inertia: J, wheelMomentumBody: h }, l));
    expect(v.reasons.map((r) => r.rule)).toEqual(['stored-momentum-end']);
    expect(Math.abs(v.wheelMomentumEndBody[0]! - 1.2)).toBeLessThan(1e-12);
    expect(Math.abs(v.wheelMomentumEndBody[1]!)).toBeLessThan(1e-12);
  });

  it('momentum that fits at both ends but leaves the envelope mid-slew: infeasible from the search', () => {
    // 1.2 along (1,1,0)/√2 uses 85% of a unit cube; 90° about z carries it through (1,0,0) (120%)
    // to (1,−1,0)/√2 (85% again). The slew adds only a z component (J e ∥ z), so no profile helps.
    const l: PlanLimits = { torqueCapacity: cubeCapacity(1), momentumCapacity: cubeCapacity(1), torqueMargin: 1, momentumMargin: 1 };
    const h = [1.2 / Math.SQRT2, 1.2 / Math.SQRT2, 0];
    const v = infeasible(planSegment({ qStart: I4, qTarget: axisAngle([0, 0, 1], 90 * D), inertia: J, wheelMomentumBody: h }, l));
    expect(v.reasons.map((x) => x.rule)).toEqual(['stored-momentum-path']);
    expect(v.reasons[0]!.message).toMatch(/leaves the usable momentum envelope/);
  });

  it('zero torque capacity along ±Je: infeasible with the reason', () => {
    const l: PlanLimits = { torqueCapacity: boxCapacity([1, 1, 0]), momentumCapacity: cubeCapacity(1), torqueMargin: 1, momentumMargin: 1 };
    const v = infeasible(plan([0, 0, 0], l));
    expect(v.reasons.map((r) => r.rule)).toEqual(['zero-torque-capacity']);
  });
});

describe('profile family "bang-bang": never coasts, a rate cap lowers the acceleration', () => {
  // Rest-to-rest with no coast (standard kinematics, sources in the header): peak rate √(θ a),
  // T = 2√(θ/a); under a rate cap w the acceleration becomes w²/θ and T = 2θ/w.
  const J = diag(8, 10, 12);
  const lt = (1 * D * 12) / 0.8; // a = 1 deg/s² about z at margin 0.8
  const lh3 = (3 * D * 12) / 0.9; // w = 3 deg/s about z at margin 0.9
  const lim: PlanLimits = { torqueCapacity: cubeCapacity(lt), momentumCapacity: cubeCapacity(lh3), torqueMargin: 0.8, momentumMargin: 0.9 };
  const seg = (deg: number, l: PlanLimits, h = [0, 0, 0]) =>
    feasible(planSegment({ qStart: I4, qTarget: axisAngle([0, 0, 1], deg * D), inertia: J, wheelMomentumBody: h }, l));

  it('90° about z with a 3 deg/s momentum cap: a = w²/θ = 0.1 deg/s², T = 2θ/w = 60 s (bang-coast-bang takes 33 s)', () => {
    const p = seg(90, { ...lim, family: 'bang-bang' });
    expect(p.profile.kind).toBe('bang-bang');
    expect(p.profile.coastTimeS).toBe(0);
    expect(Math.abs(p.durationS - 60)).toBeLessThan(1e-9);
    expect(Math.abs(p.profile.accelRadPerS2 - 0.1 * D)).toBeLessThan(1e-15);
    expect(p.binding).toBe('momentum');
    expect(p.peakMomentumFraction).toBeLessThanOrEqual(0.9 * (1 + 1e-12));
    expect(seg(90, lim).durationS).toBeCloseTo(33, 9);
  });

  it('a slew-rate limit below the momentum cap binds instead: T = 2θ/w_slew', () => {
    const p = seg(90, { ...lim, family: 'bang-bang', slewRateLimitRadPerS: 2 * D });
    expect(p.binding).toBe('slew-rate');
    expect(Math.abs(p.durationS - (2 * 90) / 2)).toBeLessThan(1e-9);
  });

  it('a slew short enough never to reach the cap is the same in both families (torque-bound)', () => {
    const a = seg(4, { ...lim, family: 'bang-bang' });
    const b = seg(4, lim);
    expect(a.binding).toBe('torque');
    expect(a.durationS).toBe(b.durationS);
    expect(Math.abs(a.durationS - 2 * Math.sqrt((4 * D) / (1 * D)))).toBeLessThan(1e-9);
  });

  it('with stored momentum along −e: the search finds a ≈ w²/θ with w = (h_usable − k)/J, no coast', () => {
    const l: PlanLimits = {
      torqueCapacity: cubeCapacity(0.05),
      momentumCapacity: cubeCapacity(0.5),
      torqueMargin: 0.8,
      momentumMargin: 0.9,
    };
    const k = 0.15;
    const th = 120 * D;
    const p = seg(120, { ...l, family: 'bang-bang' }, [0, 0, -k]);
    const w = (0.45 - k) / 12;
    expect(p.profile.coastTimeS).toBe(0);
    expect(p.method).toBe('sampled-search');
    expect(p.binding).toBe('momentum');
    expect(p.peakRateRadPerS).toBeLessThanOrEqual(w * (1 + 1e-12));
    expect(p.peakRateRadPerS).toBeGreaterThan(w * (1 - 3e-3));
    expect(Math.abs(p.durationS - (2 * th) / p.peakRateRadPerS)).toBeLessThan(1e-9 * p.durationS);
    expect(p.peakMomentumFraction).toBeLessThanOrEqual(0.9);
  });

  it('an unknown family is refused, naming it', () => {
    const r = planSegment(
      { qStart: I4, qTarget: axisAngle([0, 0, 1], 10 * D), inertia: J, wheelMomentumBody: [0, 0, 0] },
      { ...lim, family: 'triangle' as never },
    );
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.errors[0]!.path).toBe('limits.family');
  });
});

describe('input validation', () => {
  it('lists every problem with its path and rule, and never throws', () => {
    const r = planSegment(
      { qStart: [0, 0, 0, 2], qTarget: [0, NaN, 0, 1], inertia: [1, 0.5, 0, 0, 1, 0, 0, 0, 1], wheelMomentumBody: [0, 0] },
      {
        torqueCapacity: 3 as unknown as PlanLimits['torqueCapacity'],
        momentumCapacity: () => 1,
        torqueMargin: 1.5,
        momentumMargin: 0,
        slewRateLimitRadPerS: -1,
      },
    );
    expect(r.ok).toBe(false);
    if (r.ok) return;
    const got = r.errors.map((e) => `${e.path}:${e.rule}`);
    expect(got).toEqual(
      expect.arrayContaining([
        'qStart:unit-norm',
        'qTarget[1]:finite',
        'inertia[0][1]:symmetric',
        'wheelMomentumBody:length',
        'limits.torqueCapacity:function',
        'limits.torqueMargin:range',
        'limits.momentumMargin:range',
        'limits.slewRateLimitRadPerS:positive',
      ]),
    );
    expect(got.length).toBe(8);
  });

  it('rejects an indefinite inertia', () => {
    const r = planSegment(
      { qStart: I4, qTarget: I4, inertia: diag(1, -1, 1), wheelMomentumBody: [0, 0, 0] },
      { torqueCapacity: sphere(1), momentumCapacity: sphere(1), torqueMargin: 1, momentumMargin: 1 },
    );
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.errors.map((e) => e.rule)).toEqual(['positive-definite']);
  });
});
