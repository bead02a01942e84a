/**
 * From a chain of attitudes to timed legs, and from timed legs to a sampled history.
 *
 * Each leg is a rest-to-rest eigenaxis slew between consecutive attitudes, timed within the
 * wheel envelopes by plan/segment.ts planCheckedSegment, unchanged. No external torque: the
 * total momentum H is fixed in inertial axes, so the wheels hold R(q)ᵀ H_I at rest at every
 * waypoint (as plan/sequence.ts does between targets).
 *
 * For a single-axis path the chain is built so that b travels exactly the waypoint arcs: leg k
 * is the inertial rotation about the arc normal n_k = w_k × w_k+1 by the arc angle, and one last
 * rotation about b itself (b stays put) brings the roll to the target.
 */
import type { Mat3, Vec3 } from '../math/mat3';
import { qMultiply, qRotate, qRotateInverse, type Quat } from '../math/rotation';
import { planCheckedSegment } from '../plan/segment';
import { profileAt } from '../plan/profile';
import type { InfeasibleSegment, PlanLimits, SegmentPlan } from '../plan/types';
import { rotateInto, rotationAngle, shortestArc } from './edge';

/** Legs shorter than this rotation (rad) are dropped from a chain. */
const MIN_LEG_RAD = 1e-9;

/** The attitude chain for waypoint directions w_0 … w_m of axis b, ending exactly at q1. */
export function chainFromWaypoints(q0: Quat, q1: Quat, waypoints: readonly Float64Array[]): Float64Array[] {
  const chain: Float64Array[] = [Float64Array.from(q0)];
  const arc = new Float64Array(4);
  let q: Float64Array = Float64Array.from(q0);
  for (let k = 0; k + 1 < waypoints.length; k++) {
    shortestArc(arc, waypoints[k]!, waypoints[k + 1]!);
    q = qMultiply(new Float64Array(4), arc, q);
    chain.push(q);
  }
  // The final roll about b: from q (b on the goal direction) to q1 (same b direction).
  chain.push(Float64Array.from(q1));
  return pruneChain(chain);
}

/** Drop zero-length legs (keeping the last attitude exact). */
export function pruneChain(chain: Float64Array[]): Float64Array[] {
  const out = [chain[0]!];
  for (let k = 1; k < chain.length; k++) {
    if (rotationAngle(out[out.length - 1]!, chain[k]!) > MIN_LEG_RAD) out.push(chain[k]!);
    else if (k === chain.length - 1) out[out.length - 1] = chain[k]!;
  }
  if (out.length === 1) out.push(chain[chain.length - 1]!);
  return out;
}

export interface TimedLeg {
  plan: SegmentPlan;
  /** Leg start, seconds from the slew start. */
  startS: number;
}

export type TimedChain = { ok: true; legs: TimedLeg[]; totalS: number } | { ok: false; leg: number; verdict: InfeasibleSegment };

/** Time every leg of the chain with the existing segment planner. */
export function timeChain(chain: readonly Float64Array[], J: Mat3, h0: Vec3, limits: PlanLimits): TimedChain {
  const hInertial = qRotate(new Float64Array(3), chain[0]!, h0);
  const legs: TimedLeg[] = [];
  let t = 0;
  for (let k = 0; k + 1 < chain.length; k++) {
    const hk = qRotateInverse(new Float64Array(3), chain[k]!, hInertial);
    const v = planCheckedSegment(chain[k]!, chain[k + 1]!, J, hk, limits);
    if (!v.feasible) return { ok: false, leg: k, verdict: v };
    legs.push({ plan: v, startS: t });
    t += v.durationS;
  }
  return { ok: true, legs, totalS: t };
}

/** Angle the body axis b travels on the sphere during an eigenaxis leg: θ · sin ∠(e, b). */
export function axisTravel(plan: SegmentPlan, b: ArrayLike<number>): number {
  const e = plan.axisBody;
  const c = e[0]! * b[0]! + e[1]! * b[1]! + e[2]! * b[2]!;
  return plan.angleRad * Math.sqrt(Math.max(0, 1 - c * c));
}

/**
 * Sample the legs into a history at plan times t0 + …: each leg uniformly in time with a step Δt
 * such that peak rate × Δt ≤ stepRad (so no step turns the body by more than stepRad), ends
 * included.
 */
export function sampleLegs(legs: readonly TimedLeg[], t0: number, stepRad: number): { t: Float64Array; q: Float64Array } {
  const counts = legs.map((l) => Math.max(1, Math.ceil((l.plan.durationS * l.plan.peakRateRadPerS) / stepRad)));
  const n = counts.reduce((a, c) => a + c, 0) + 1;
  const t = new Float64Array(n),
    q = new Float64Array(4 * n);
  const st = new Float64Array(3),
    dq = new Float64Array(4),
    qi = new Float64Array(4);
  let i = 0;
  const push = (ti: number, qq: ArrayLike<number>) => {
    if (i > 0 && !(ti > t[i - 1]!)) return;
    t[i] = ti;
    for (let c = 0; c < 4; c++) q[4 * i + c] = qq[c]!;
    i++;
  };
  legs.forEach((l, k) => {
    const p = l.plan,
      m = counts[k]!,
      dt = p.durationS / m;
    for (let s = 0; s < m; s++) {
      profileAt(st, p.profile, s * dt);
      legAttitude(qi, p, st[0]!, dq);
      push(t0 + l.startS + s * dt, qi);
    }
  });
  const last = legs[legs.length - 1]!;
  push(t0 + last.startS + last.plan.durationS, last.plan.qEnd);
  return { t: t.subarray(0, i), q: q.subarray(0, 4 * i) };
}

/** q = qStart ⊗ exp(½ φ e_B) for a leg (plan/reference.ts form). */
function legAttitude(out: Float64Array, p: SegmentPlan, phi: number, dq: Float64Array): void {
  const s = Math.sin(0.5 * phi),
    e = p.axisBody;
  dq[0] = e[0]! * s;
  dq[1] = e[1]! * s;
  dq[2] = e[2]! * s;
  dq[3] = Math.cos(0.5 * phi);
  qMultiply(out, p.qStart, dq);
}

/** Inertial direction of body axis b at attitude q. */
export function axisDirection(q: ArrayLike<number>, b: ArrayLike<number>): Float64Array {
  const out = new Float64Array(3);
  rotateInto(out, 0, q, b);
  return out;
}
