/**
 * The planned reference at any time of a sequence: attitude, body rate and body acceleration
 * (in reference body axes), and the feed-forward loads (wheel torque on the body, wheel momentum).
 *
 * Within slew k: q_ref(t) = q0_k ⊗ exp(½ φ(s) e_k), ω_ref = φ̇(s) e_k, ω̇_ref = φ̈(s) e_k with
 * s = t − slewStart_k (profile.ts; right-continuous at switches). During holds, before the
 * start and after the end: the held attitude at rest. Allocation-free (module scratch).
 */
import { qCopy, type Quat } from '../math/rotation';
import type { Vec3 } from '../math/mat3';
import { profileStateAt } from './profile';
import type { ReferenceTable } from './types';

const st = new Float64Array(3);

/**
 * Index of the timeline entry active at t: the last k with slewStartS[k] ≤ t; −1 before the
 * first slew (or for an empty timeline, or t NaN).
 */
export function referenceEntryAt(tab: ReferenceTable, t: number): number {
  if (tab.n === 0 || !(t >= tab.slewStartS[0]!)) return -1;
  let lo = 0,
    hi = tab.n - 1;
  while (lo < hi) {
    const mid = (lo + hi + 1) >> 1;
    if (tab.slewStartS[mid]! <= t) lo = mid;
    else hi = mid - 1;
  }
  return lo;
}

/**
 * Reference attitude (qInertialFromBody), body rate and body acceleration at time t (s from the
 * plan start). Returns the active timeline entry (−1 before the first slew). NaN t is treated as
 * before the start, so no NaN leaves.
 */
export function evaluateReference(plan: { reference: ReferenceTable }, t: number, outQ: Quat, outOmega: Vec3, outOmegaDot: Vec3): number {
  const tab = plan.reference;
  const k = referenceEntryAt(tab, t);
  if (k < 0) {
    qCopy(outQ, tab.qInitial);
    zero3(outOmega);
    zero3(outOmegaDot);
    return k;
  }
  profileStateAt(st, tab.angle[k]!, tab.accel[k]!, tab.peakRate[k]!, tab.accelTime[k]!, tab.coastTime[k]!, t - tab.slewStartS[k]!);
  const ex = tab.axis[3 * k]!,
    ey = tab.axis[3 * k + 1]!,
    ez = tab.axis[3 * k + 2]!;
  const half = 0.5 * st[0]!,
    s = Math.sin(half);
  const bx = ex * s,
    by = ey * s,
    bz = ez * s,
    bw = Math.cos(half);
  const o = 4 * k,
    q = tab.q0;
  const ax = q[o]!,
    ay = q[o + 1]!,
    az = q[o + 2]!,
    aw = q[o + 3]!;
  // Hamilton product q0 ⊗ exp(½ φ e), scalar last, written out (no subarray view).
  outQ[0] = aw * bx + ax * bw + ay * bz - az * by;
  outQ[1] = aw * by - ax * bz + ay * bw + az * bx;
  outQ[2] = aw * bz + ax * by - ay * bx + az * bw;
  outQ[3] = aw * bw - ax * bx - ay * by - az * bz;
  // "+ 0" turns −0 (zero rate times a negative axis component) into +0: exports must not write −0.
  outOmega[0] = st[1]! * ex + 0;
  outOmega[1] = st[1]! * ey + 0;
  outOmega[2] = st[1]! * ez + 0;
  outOmegaDot[0] = st[2]! * ex + 0;
  outOmegaDot[1] = st[2]! * ey + 0;
  outOmegaDot[2] = st[2]! * ez + 0;
  return tab.segmentOf ? tab.segmentOf[k]! : k;
}

/**
 * Planned loads at time t: the torque the wheels must put on the body, τ = J ω̇ + ω × (Jω + h_w),
 * and the wheel momentum h_w = R_refᵀ H_I − J ω (loads.ts header), both in body axes. Zero torque
 * and the held momentum at rest. Returns the active timeline entry.
 */
export function evaluatePlannedLoads(
  plan: { reference: ReferenceTable },
  t: number,
  outTorqueBody: Vec3,
  outWheelMomentumBody: Vec3,
): number {
  const tab = plan.reference;
  const k = referenceEntryAt(tab, t);
  if (k < 0) {
    zero3(outTorqueBody);
    outWheelMomentumBody[0] = tab.wheelMomentumInitialBody[0]!;
    outWheelMomentumBody[1] = tab.wheelMomentumInitialBody[1]!;
    outWheelMomentumBody[2] = tab.wheelMomentumInitialBody[2]!;
    return k;
  }
  profileStateAt(st, tab.angle[k]!, tab.accel[k]!, tab.peakRate[k]!, tab.accelTime[k]!, tab.coastTime[k]!, t - tab.slewStartS[k]!);
  const phi = st[0]!,
    w = st[1]!,
    al = st[2]!;
  const J = tab.inertia;
  const ex = tab.axis[3 * k]!,
    ey = tab.axis[3 * k + 1]!,
    ez = tab.axis[3 * k + 2]!;
  const hx = tab.h0[3 * k]!,
    hy = tab.h0[3 * k + 1]!,
    hz = tab.h0[3 * k + 2]!;
  // H_B = R_a(φ, e)ᵀ h0 (Rodrigues with −φ).
  const c = Math.cos(phi),
    s = Math.sin(phi);
  const d = ex * hx + ey * hy + ez * hz,
    kk = (1 - c) * d;
  const cx = ey * hz - ez * hy,
    cy = ez * hx - ex * hz,
    cz = ex * hy - ey * hx;
  const Hx = hx * c - s * cx + kk * ex;
  const Hy = hy * c - s * cy + kk * ey;
  const Hz = hz * c - s * cz + kk * ez;
  const jex = J[0]! * ex + J[3]! * ey + J[6]! * ez;
  const jey = J[1]! * ex + J[4]! * ey + J[7]! * ez;
  const jez = J[2]! * ex + J[5]! * ey + J[8]! * ez;
  outTorqueBody[0] = jex * al + w * (ey * Hz - ez * Hy) + 0;
  outTorqueBody[1] = jey * al + w * (ez * Hx - ex * Hz) + 0;
  outTorqueBody[2] = jez * al + w * (ex * Hy - ey * Hx) + 0;
  outWheelMomentumBody[0] = Hx - w * jex;
  outWheelMomentumBody[1] = Hy - w * jey;
  outWheelMomentumBody[2] = Hz - w * jez;
  return k;
}

function zero3(v: Vec3): void {
  v[0] = 0;
  v[1] = 0;
  v[2] = 0;
}

/**
 * The instants where the planned reference's acceleration steps, ascending: each slew's start, the
 * end of its acceleration, the start of its deceleration and its end (a rest-to-rest profile is
 * piecewise constant in acceleration). With `slewStartsOnly`, each slew's start: where a
 * step-to-target reference changes its target.
 */
export function plannedSwitchTimes(tab: ReferenceTable, slewStartsOnly = false): Float64Array {
  const out: number[] = [];
  for (let k = 0; k < tab.n; k++) {
    const t0 = tab.slewStartS[k]!;
    out.push(t0);
    if (slewStartsOnly) continue;
    const a = tab.accelTime[k]!,
      c = tab.coastTime[k]!;
    out.push(t0 + a, t0 + a + c, tab.slewEndS[k]!);
  }
  return Float64Array.from(out);
}
