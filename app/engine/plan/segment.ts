/**
 * One rest-to-rest eigenaxis slew within the wheel torque and momentum envelopes.
 *
 * Reference trajectory: the shortest rotation from q0 to q1 (axis e, angle θ ≤ π),
 * q_ref(t) = q0 ⊗ exp(½ φ(t) e), with a bang-bang or bang-coast-bang φ(t) (profile.ts).
 *
 * With no momentum in the system (H = 0) the closed forms of references §2 are exact, with the
 * torque taken along Je (the direction the wheels really push, loads.ts):
 *   a_max = m_τ · min(C_τ(+Ĵe), C_τ(−Ĵe)) / |Je|,
 *   w_max = min(slew-rate limit, m_h · C_h(−Ĵe) / |Je|)       (h_w = −ω_s J e, ω_s ≥ 0).
 * For a centrally symmetric envelope (a zonotope) the ± distinction vanishes. With stored
 * momentum the search of search.ts takes over.
 */
import { fail, IssueList, issue, ok, type Issue, type Result } from '../errors';
import type { Mat3, Vec3 } from '../math/mat3';
import { v3Norm } from '../math/mat3';
import { qConjMultiply, qToAxisAngle, type Quat } from '../math/rotation';
import { envelopeFraction, makeSlewGeometry, scanEnvelopeUse, storedMomentumAt, symmetricCapacity, type SlewGeometry } from './loads';
import { noCoastClosedForm, noCoastSearch } from './bangBang';
import { profileSwitchTimes, restToRestProfile } from './profile';
import { pct, searchProfile, SEARCH_GUARD, VERIFY_SAMPLING } from './search';
import type { BindingLimit, PlanLimits, RestToRestProfile, SegmentPlan, SegmentVerdict } from './types';
import { checkLimits, readInertia, readQuat, readVec3 } from './validate';

export interface SegmentInput {
  /** Start attitude qInertialFromBody [x, y, z, w], body at rest. */
  qStart: ArrayLike<number>;
  /** Target attitude, body at rest. */
  qTarget: ArrayLike<number>;
  /** Inertia J, 9 numbers column-major (kg·m²); see loads.ts for which J. */
  inertia: ArrayLike<number>;
  /** Wheel momentum G h in body axes at the start (N·m·s); zeros for an empty system. */
  wheelMomentumBody: ArrayLike<number>;
}

/** Validate, then plan. Bad input: every problem listed. Infeasible slews: a verdict, not an error. */
export function planSegment(input: SegmentInput, limits: PlanLimits): Result<SegmentVerdict> {
  const list = new IssueList();
  const q0 = readQuat(list, 'qStart', input?.qStart);
  const q1 = readQuat(list, 'qTarget', input?.qTarget);
  const J = readInertia(list, 'inertia', input?.inertia);
  const h0 = readVec3(list, 'wheelMomentumBody', input?.wheelMomentumBody);
  const limitsOk = checkLimits(list, 'limits', limits);
  if (!list.empty || !q0 || !q1 || !J || !h0 || !limitsOk) return fail(list.items);
  return ok(planCheckedSegment(q0, q1, J, h0, limits));
}

const rel = new Float64Array(4);

/** Plan from already validated inputs (unit quaternions, SPD inertia, checked limits). */
export function planCheckedSegment(q0: Quat, q1: Quat, J: Mat3, h0: Vec3, limits: PlanLimits): SegmentVerdict {
  qConjMultiply(rel, q0, q1);
  const axis = new Float64Array(3);
  const angle = qToAxisAngle(axis, rel);
  // qToAxisAngle takes the shorter way (it flips the sign of rel when w < 0): so must qEnd.
  const sgn = rel[3]! < 0 ? -1 : 1;
  const qEnd = Float64Array.from([q1[0]! * sgn, q1[1]! * sgn, q1[2]! * sgn, q1[3]! * sgn]);
  const g = makeSlewGeometry(J, axis, h0, angle);
  const hEnd = storedMomentumAt(new Float64Array(3), g, angle);
  const base = {
    qStart: Float64Array.from(q0),
    qEnd,
    axisBody: axis,
    angleRad: angle,
    wheelMomentumStartBody: Float64Array.from(h0),
    wheelMomentumEndBody: hEnd,
  };
  // Zero stored momentum, allowing for rounding carried through a sequence (|h| ~ 1e-20 N·m·s
  // after several rotations): below 1e-12 of the envelope the closed forms are exact to print.
  const hScale =
    limits.momentumCapacity(Float64Array.of(1, 0, 0)) +
    limits.momentumCapacity(Float64Array.of(0, 1, 0)) +
    limits.momentumCapacity(Float64Array.of(0, 0, 1));
  const emptySystem = Math.hypot(h0[0]!, h0[1]!, h0[2]!) <= 1e-12 * hScale;
  const reasons = checkSegment(g, limits, hEnd, emptySystem);
  if (reasons.length) return { ...base, feasible: false, reasons };

  if (angle === 0) {
    const p = restToRestProfile(0, 0, Infinity);
    return finish(base, g, limits, p, 'none', 'closed-form', 'Target equals the start attitude: no slew.');
  }

  const JeNorm = v3Norm(g.Je);
  const aHi = (limits.torqueMargin * symmetricCapacity(g.Je, limits.torqueCapacity)) / JeNorm;
  const slew = limits.slewRateLimitRadPerS;

  if (limits.family === 'bang-bang') return planNoCoast(base, g, limits, aHi, emptySystem, h0);

  if (emptySystem) {
    const wMom = momentumRate(g, limits);
    const w = Math.min(slew ?? Infinity, wMom);
    const p = restToRestProfile(angle, aHi, w);
    let binding: BindingLimit;
    let why: string;
    if (p.kind === 'bang-bang') {
      binding = 'torque';
      why = `Bang-bang: the torque envelope along Je sets the acceleration ${fmt(aHi)} rad/s² (|Je| = ${fmt(JeNorm)} kg·m²); the peak rate ${fmt(p.peakRateRadPerS)} rad/s stays below the rate cap.`;
    } else if (slew !== undefined && slew <= wMom) {
      binding = 'slew-rate';
      why = `Bang-coast-bang: the slew-rate limit ${fmt(slew)} rad/s caps the rate (the momentum envelope would allow ${fmt(wMom)} rad/s); acceleration ${fmt(aHi)} rad/s² from the torque envelope.`;
    } else {
      binding = 'momentum';
      why = `Bang-coast-bang: the momentum envelope along Je caps the rate at ${fmt(wMom)} rad/s; acceleration ${fmt(aHi)} rad/s² from the torque envelope.`;
    }
    return finish(base, g, limits, p, binding, 'closed-form', why);
  }

  const found = searchProfile(g, limits, aHi);
  if (!found.ok) return { ...base, feasible: false, reasons: [found.reason] };
  const p = found.profile;
  const why =
    `${p.kind === 'bang-bang' ? 'Bang-bang' : 'Bang-coast-bang'} with stored momentum (|H| = ${fmt(v3Norm(h0))} N·m·s): ` +
    `acceleration ${fmt(p.accelRadPerS2)} rad/s², peak rate ${fmt(p.peakRateRadPerS)} rad/s; ${found.binding} binds ` +
    `(found by a sampled search within ${pct(SEARCH_GUARD)} of the margins).`;
  return finish(base, g, limits, p, found.binding, 'sampled-search', why);
}

/** The momentum envelope's rate cap along −Je for an empty system (header). */
function momentumRate(g: SlewGeometry, limits: PlanLimits): number {
  const mJe = Float64Array.from([-g.Je[0]!, -g.Je[1]!, -g.Je[2]!]);
  return (limits.momentumMargin * capacityAlong(mJe, limits.momentumCapacity)) / v3Norm(g.Je);
}

/** The no-coast family (bangBang.ts): closed form for an empty system, a search with stored momentum. */
function planNoCoast(base: Base, g: SlewGeometry, limits: PlanLimits, aHi: number, emptySystem: boolean, h0: Vec3): SegmentVerdict {
  if (emptySystem) {
    const { profile: p, binding } = noCoastClosedForm(g.angleRad, aHi, momentumRate(g, limits), limits.slewRateLimitRadPerS);
    const why =
      binding === 'torque'
        ? `Bang-bang: the torque envelope along Je sets the acceleration ${fmt(aHi)} rad/s²; the peak rate ${fmt(p.peakRateRadPerS)} rad/s stays below the rate cap.`
        : `Bang-bang (no coast): the ${binding === 'slew-rate' ? 'slew-rate limit' : 'momentum envelope along Je'} caps the peak rate at ${fmt(p.peakRateRadPerS)} rad/s, so the acceleration is lowered to ${fmt(p.accelRadPerS2)} rad/s² (the torque envelope would allow ${fmt(aHi)}).`;
    return finish(base, g, limits, p, binding, 'closed-form', why);
  }
  const found = noCoastSearch(g, limits, aHi);
  if (!found.ok) return { ...base, feasible: false, reasons: [found.reason] };
  const p = found.plan.profile;
  const why =
    `Bang-bang (no coast) with stored momentum (|H| = ${fmt(v3Norm(h0))} N·m·s): acceleration ${fmt(p.accelRadPerS2)} rad/s², ` +
    `peak rate ${fmt(p.peakRateRadPerS)} rad/s; ${found.plan.binding} binds (found by a sampled search within ${pct(SEARCH_GUARD)} of the margins).`;
  return finish(base, g, limits, p, found.plan.binding, 'sampled-search', why);
}

type Base = Omit<
  SegmentPlan,
  | 'feasible'
  | 'profile'
  | 'durationS'
  | 'switchTimesS'
  | 'peakRateRadPerS'
  | 'binding'
  | 'peakTorqueFraction'
  | 'peakMomentumFraction'
  | 'slewRateFraction'
  | 'method'
  | 'summary'
>;

function finish(
  base: Base,
  g: SlewGeometry,
  limits: PlanLimits,
  p: RestToRestProfile,
  binding: BindingLimit,
  method: SegmentPlan['method'],
  summary: string,
): SegmentPlan {
  const use = scanEnvelopeUse({ torque: 0, momentum: 0 }, g, p, limits, VERIFY_SAMPLING);
  const slew = limits.slewRateLimitRadPerS;
  return {
    ...base,
    feasible: true,
    profile: p,
    durationS: p.durationS,
    switchTimesS: profileSwitchTimes(p),
    peakRateRadPerS: p.peakRateRadPerS,
    binding,
    peakTorqueFraction: use.torque,
    peakMomentumFraction: use.momentum,
    slewRateFraction: slew !== undefined ? p.peakRateRadPerS / slew : 0,
    method,
    summary,
  };
}

/** Reasons no profile can exist, whatever a and w: checked before any search. */
function checkSegment(g: SlewGeometry, limits: PlanLimits, hEnd: Vec3, emptySystem: boolean): Issue[] {
  const out: Issue[] = [];
  const m = limits.momentumMargin;
  // The start and end are at rest, so the wheels hold exactly h0 and H_B(θ) there.
  const f0 = envelopeFraction(g.h0, limits.momentumCapacity);
  if (f0 >= m) {
    out.push(
      issue(
        'wheelMomentumBody',
        'stored-momentum-start',
        `The wheels already hold ${pct(f0)} of the momentum envelope along their momentum direction at the start; the margin allows ${pct(m)}.`,
      ),
    );
  }
  if (g.angleRad > 0) {
    const f1 = envelopeFraction(hEnd, limits.momentumCapacity);
    if (f1 >= m) {
      out.push(
        issue(
          'qTarget',
          'stored-momentum-end',
          `At the target attitude the stored momentum would use ${pct(f1)} of the momentum envelope along its direction; the margin allows ${pct(m)}.`,
        ),
      );
    }
    if (!(symmetricCapacity(g.Je, limits.torqueCapacity) > 0)) {
      out.push(
        issue(
          'limits.torqueCapacity',
          'zero-torque-capacity',
          'The torque envelope gives no usable capacity (zero, or not a finite number) along ±Je, the direction this eigenaxis slew must push.',
        ),
      );
    }
    if (emptySystem) {
      const mJe = Float64Array.from([-g.Je[0]!, -g.Je[1]!, -g.Je[2]!]);
      if (!(capacityAlong(mJe, limits.momentumCapacity) > 0)) {
        out.push(
          issue(
            'limits.momentumCapacity',
            'zero-momentum-capacity',
            'The momentum envelope gives no usable capacity (zero, or not a finite number) along −Je, where this slew puts the wheel momentum.',
          ),
        );
      }
    }
  }
  return out;
}

function capacityAlong(v: ArrayLike<number>, cap: (d: Vec3) => number): number {
  const n = Math.hypot(v[0]!, v[1]!, v[2]!);
  if (!(n > 0)) return 0;
  const c = cap(Float64Array.from([v[0]! / n, v[1]! / n, v[2]! / n]));
  return c > 0 && Number.isFinite(c) ? c : 0;
}

function fmt(x: number): string {
  return x.toPrecision(4);
}
