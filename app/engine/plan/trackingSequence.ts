/**
 * The orbit-aware sequence planner: targets that move (a ground site, a station, the Sun, nadir;
 * orbit/targets.ts) or stay fixed, each due at a window (the start of a pass, or a time) or right
 * after the previous hold, planned as slews onto the target's attitude AND rate (trackingSlew.ts)
 * followed by a tracking hold with feedforward (the target's ω and ω̇).
 *
 * Scheduling (ours): targets are taken in file order. A target without a window is slewed to as
 * soon as the previous requested hold ends. A target with a window must be tracking at the window
 * start W: its slew starts at W − T, and the previous target is held (tracked) until then. For a
 * pass window the first pass whose slew can start after the previous requested hold is chosen;
 * passes passed over are noted.
 *
 * Timing (ours): the slew duration T is the shortest (bisection to 0.5 %) for which the sampled
 * reference stays within the margined wheel envelopes: wheel momentum h_w = R_refᵀH − J ω_ref and
 * the wheel torque on the body τ = J ω̇_ref + ω_ref × (J ω_ref + h_w) (Euler's equation for a
 * rigid body with wheels, e.g. Markley & Crassidis, Fundamentals of Spacecraft Attitude
 * Determination and Control, 2014, §3.3, from memory), with H the constant total momentum in the
 * inertial frame (no external torque modelled), and the rate relative to the target within the
 * slew-rate limit. The tracking hold is checked on the same terms at LIFT_STEP_S samples.
 * Feasibility is not strictly monotone in T for a moving start; the search doubles T from 4 s
 * until feasible, then bisects between the last infeasible and the first feasible T.
 *
 * Hemisphere: the reference quaternion is kept continuous over the whole plan: each entry's
 * target attitudes are "lifted" (a sign chosen per LIFT_STEP_S node, continuous between nodes) and
 * the first node's sign makes the slew start equal the previous reference exactly.
 */
import { fail, issue, ok, type Issue, type Result } from '../errors';
import type { Mat3, Vec3 } from '../math/mat3';
import { m3MulVec } from '../math/mat3';
import { qConjMultiply, qFromRotationVector, qMultiply, qRotate, qRotateInverse, qToRotationVector, type Quat } from '../math/rotation';
import { createTargetState, targetStateAt } from '../orbit/targets';
import { envelopeFraction } from './loads';
import { rightJacobianInverseMul, trackingSlewReference, type QuinticOffset } from './trackingSlew';
import type {
  ScheduledWindow,
  TrackingEntry,
  TrackingPlan,
  TrackingSegmentPlan,
  TrackingSequenceInput,
  TrackingSource,
  TrackingTargetInput,
} from './trackingTypes';
import type { BindingLimit, InfeasibleSegment, PlanLimits, ReferenceTable, SequencePlan } from './types';

/** Spacing of the lift nodes and of the hold's envelope samples, s. */
export const LIFT_STEP_S = 10;
/** Samples over a slew when checking the envelopes. */
const SLEW_SAMPLES = 48;
/** Longest slew the search tries, s. */
export const MAX_TRACKING_SLEW_S = 4000;
/** Hold samples are capped at this count (the step grows for longer holds). */
const MAX_HOLD_SAMPLES = 2000;

const ts = createTargetState();
const qA = new Float64Array(4),
  qB = new Float64Array(4),
  qR = new Float64Array(4),
  wR = new Float64Array(3),
  wdR = new Float64Array(3),
  relW = new Float64Array(3),
  vA = new Float64Array(3),
  vB = new Float64Array(3),
  vC = new Float64Array(3),
  hB = new Float64Array(3),
  tau = new Float64Array(3),
  hw = new Float64Array(3);

/** Raw (unsigned) state of a source at t into ts.q / ts.omegaBody / ts.omegaDotBody. */
function sourceRaw(eph: TrackingPlan['ephemeris'], src: TrackingSource, t: number): boolean {
  if (src.kind === 'fixed') {
    ts.q.set(src.q);
    ts.omegaBody.fill(0);
    ts.omegaDotBody.fill(0);
    return true;
  }
  return targetStateAt(ts, eph, src.target, t);
}

interface Fractions {
  torque: number;
  momentum: number;
  rate: number;
  peakRate: number;
  peakAccel: number;
  finite: boolean;
}

/** Envelope use of one reference state (q, ω, ω̇) with total momentum H (inertial). */
function loadFractions(f: Fractions, J: Mat3, H: Vec3, q: ArrayLike<number>, w: Float64Array, wd: Float64Array, limits: PlanLimits): void {
  qRotateInverse(hB, q, H);
  m3MulVec(vA, J, w);
  for (let i = 0; i < 3; i++) hw[i] = hB[i]! - vA[i]!;
  m3MulVec(vB, J, wd);
  // τ = J ω̇ + ω × H_body
  tau[0] = vB[0]! + (w[1]! * hB[2]! - w[2]! * hB[1]!);
  tau[1] = vB[1]! + (w[2]! * hB[0]! - w[0]! * hB[2]!);
  tau[2] = vB[2]! + (w[0]! * hB[1]! - w[1]! * hB[0]!);
  const ft = envelopeFraction(tau, limits.torqueCapacity);
  const fm = envelopeFraction(hw, limits.momentumCapacity);
  if (ft > f.torque) f.torque = ft;
  if (fm > f.momentum) f.momentum = fm;
  if (!Number.isFinite(ft + fm)) f.finite = false;
}

function newFractions(): Fractions {
  return { torque: 0, momentum: 0, rate: 0, peakRate: 0, peakAccel: 0, finite: true };
}

/** The quintic's start data for a slew starting at tStart from (q0, ω0) onto src. */
function slewStartData(
  out: QuinticOffset,
  eph: TrackingPlan['ephemeris'],
  src: TrackingSource,
  tStart: number,
  q0: ArrayLike<number>,
  w0: ArrayLike<number>,
): boolean {
  if (!sourceRaw(eph, src, tStart)) return false;
  qConjMultiply(qA, ts.q, q0); // δ₀ = q_T* ⊗ q0 (up to sign)
  qToRotationVector(out.rho0, qA);
  // ω_δ0 = ω0 − R_δ0ᵀ ω_T
  qFromRotationVector(qB, out.rho0);
  qRotateInverse(vC, qB, ts.omegaBody);
  for (let i = 0; i < 3; i++) vC[i] = w0[i]! - vC[i]!;
  rightJacobianInverseMul(out.rhoDot0, out.rho0, vC);
  return true;
}

/** Envelope use over a slew of duration T starting at tStart (out.durationS set). */
function slewFractions(
  f: Fractions,
  p: QuinticOffset,
  eph: TrackingPlan['ephemeris'],
  src: TrackingSource,
  tStart: number,
  J: Mat3,
  H: Vec3,
  limits: PlanLimits,
): void {
  const T = p.durationS;
  for (let i = 0; i <= SLEW_SAMPLES; i++) {
    const s = (T * i) / SLEW_SAMPLES;
    if (!sourceRaw(eph, src, tStart + s)) {
      f.finite = false;
      return;
    }
    trackingSlewReference(qR, wR, wdR, ts.q, ts.omegaBody, ts.omegaDotBody, p, s, relW);
    loadFractions(f, J, H, qR, wR, wdR, limits);
    const rel = Math.hypot(relW[0]!, relW[1]!, relW[2]!);
    if (limits.slewRateLimitRadPerS) f.rate = Math.max(f.rate, rel / limits.slewRateLimitRadPerS);
    f.peakRate = Math.max(f.peakRate, Math.hypot(wR[0]!, wR[1]!, wR[2]!));
    f.peakAccel = Math.max(f.peakAccel, Math.hypot(wdR[0]!, wdR[1]!, wdR[2]!));
  }
}

/** Envelope use while tracking src over [t0, t1]. */
function holdFractions(
  f: Fractions,
  eph: TrackingPlan['ephemeris'],
  src: TrackingSource,
  t0: number,
  t1: number,
  J: Mat3,
  H: Vec3,
  limits: PlanLimits,
): void {
  const span = Math.max(0, t1 - t0);
  const n = Math.min(MAX_HOLD_SAMPLES, Math.max(1, Math.ceil(span / LIFT_STEP_S)));
  for (let i = 0; i <= n; i++) {
    const t = t0 + (span * i) / n;
    if (!sourceRaw(eph, src, t)) {
      f.finite = false;
      return;
    }
    loadFractions(f, J, H, ts.q, ts.omegaBody, ts.omegaDotBody, limits);
  }
}

function within(f: Fractions, limits: PlanLimits): boolean {
  return f.finite && f.torque <= limits.torqueMargin && f.momentum <= limits.momentumMargin && f.rate <= 1;
}

/** The previous reference's state at t (raw sign), for the next slew's start. */
type StartState = (t: number, qOut: Float64Array, wOut: Float64Array) => boolean;

interface SlewSearch {
  offset: QuinticOffset;
  slew: Fractions;
  slewStartS: number;
}

/**
 * Shortest feasible slew onto src. `startOf(T)` gives the slew start for a duration T (a fixed
 * time, or W − T for a window W).
 */
function searchSlew(
  input: TrackingSequenceInput,
  src: TrackingSource,
  startOf: (T: number) => number,
  prev: StartState,
  H: Vec3,
  limits: PlanLimits,
): SlewSearch | null {
  const J = input.inertia as Mat3;
  const q0 = new Float64Array(4),
    w0 = new Float64Array(3);
  const tryT = (T: number): SlewSearch | null => {
    const tStart = startOf(T);
    if (!(tStart >= 0) || tStart + T > input.ephemeris.endS) return null;
    if (!prev(tStart, q0, w0)) return null;
    const offset: QuinticOffset = { durationS: T, rho0: new Float64Array(3), rhoDot0: new Float64Array(3) };
    if (!slewStartData(offset, input.ephemeris, src, tStart, q0, w0)) return null;
    const f = newFractions();
    slewFractions(f, offset, input.ephemeris, src, tStart, J, H, limits);
    return within(f, limits) ? { offset, slew: f, slewStartS: tStart } : null;
  };
  let lo = 0,
    T = 4,
    best: SlewSearch | null = null;
  while (T <= MAX_TRACKING_SLEW_S) {
    best = tryT(T);
    if (best) break;
    lo = T;
    T *= 2;
  }
  if (!best) return null;
  let hi = T;
  while (hi - lo > 0.005 * hi && hi - lo > 0.01) {
    const mid = 0.5 * (lo + hi);
    const r = tryT(mid);
    if (r) {
      best = r;
      hi = mid;
    } else lo = mid;
  }
  return best;
}

function bindingOf(f: Fractions, limits: PlanLimits): BindingLimit {
  const t = f.torque / limits.torqueMargin,
    m = f.momentum / limits.momentumMargin,
    r = f.rate;
  if (t <= 0 && m <= 0 && r <= 0) return 'none';
  return t >= m && t >= r ? 'torque' : m >= r ? 'momentum' : 'slew-rate';
}

/** An empty eigenaxis reference table (orbit plans fly the tracking plan instead). */
function emptyReference(J: ArrayLike<number>, q: ArrayLike<number>, h: ArrayLike<number>): ReferenceTable {
  const z = new Float64Array(0);
  return {
    n: 0,
    inertia: Float64Array.from(J),
    qInitial: Float64Array.from(q),
    wheelMomentumInitialBody: Float64Array.from(h),
    qFinal: Float64Array.from(q),
    wheelMomentumFinalBody: Float64Array.from(h),
    slewStartS: z,
    slewEndS: z,
    holdEndS: z,
    q0: z,
    axis: z,
    h0: z,
    angle: z,
    accel: z,
    peakRate: z,
    accelTime: z,
    coastTime: z,
  };
}

/** Lift nodes of an entry's source over [t0, t1], the first node signed by `sign0`. */
function buildLift(eph: TrackingPlan['ephemeris'], src: TrackingSource, t0: number, t1: number, firstSign: number): Float64Array {
  const n = Math.max(1, Math.ceil((t1 - t0) / LIFT_STEP_S)) + 1;
  const out = new Float64Array(4 * n);
  let px = 0,
    py = 0,
    pz = 0,
    pw = 0;
  for (let i = 0; i < n; i++) {
    const t = Math.min(t0 + i * LIFT_STEP_S, eph.endS);
    if (!sourceRaw(eph, src, t)) ts.q.set(i > 0 ? out.subarray(4 * i - 4, 4 * i) : [0, 0, 0, 1]);
    const q = ts.q;
    let s = i === 0 ? firstSign : 1;
    if (i > 0 && q[0]! * px + q[1]! * py + q[2]! * pz + q[3]! * pw < 0) s = -1;
    px = s * q[0]!;
    py = s * q[1]!;
    pz = s * q[2]!;
    pw = s * q[3]!;
    out[4 * i] = px;
    out[4 * i + 1] = py;
    out[4 * i + 2] = pz;
    out[4 * i + 3] = pw;
  }
  return out;
}

/**
 * The lifted state of an entry's target at t into (q, ω, ω̇); false outside the ephemeris (the
 * last lifted attitude at rest is written).
 */
export function liftedTargetAt(
  e: TrackingEntry,
  plan: Pick<TrackingPlan, 'ephemeris'>,
  t: number,
  q: Float64Array,
  w: Float64Array,
  wd: Float64Array,
): boolean {
  if (e.source.kind === 'fixed') {
    q.set(e.qTrack);
    w.fill(0);
    wd.fill(0);
    return true;
  }
  const n = e.lift.length >> 2;
  let i = Math.round((t - e.liftStartS) / LIFT_STEP_S);
  i = i < 0 ? 0 : i >= n ? n - 1 : i;
  if (!targetStateAt(ts, plan.ephemeris, e.source.target, t)) {
    for (let k = 0; k < 4; k++) q[k] = e.lift[4 * (n - 1) + k]!;
    w.fill(0);
    wd.fill(0);
    return false;
  }
  const l = e.lift,
    o = 4 * i;
  const s = ts.q[0]! * l[o]! + ts.q[1]! * l[o + 1]! + ts.q[2]! * l[o + 2]! + ts.q[3]! * l[o + 3]! < 0 ? -1 : 1;
  for (let k = 0; k < 4; k++) q[k] = s * ts.q[k]!;
  w.set(ts.omegaBody);
  wd.set(ts.omegaDotBody);
  return true;
}

const eq = new Float64Array(4),
  ew = new Float64Array(3),
  ewd = new Float64Array(3);

/**
 * The planned reference of one entry at t (follow-plan): the slew onto the target, then tracking.
 * Writes (q, ω, ω̇); q is continuous over the plan (hemisphere kept).
 */
export function entryReferenceAt(
  e: TrackingEntry,
  plan: Pick<TrackingPlan, 'ephemeris'>,
  t: number,
  q: Float64Array,
  w: Float64Array,
  wd: Float64Array,
): void {
  const okState = liftedTargetAt(e, plan, t, eq, ew, ewd);
  if (t < e.trackStartS && okState && e.slew.kind === 'quintic') {
    trackingSlewReference(q, w, wd, eq, ew, ewd, e.slew.offset, t - e.slewStartS);
    return;
  }
  q.set(eq);
  w.set(ew);
  wd.set(ewd);
}

/**
 * Plan a sequence of fixed and moving targets with windows. Returns the SequencePlan with
 * `tracking` set (timeline empty, reference the initial attitude) and per-target verdicts.
 */
export function planTrackingSequence(input: TrackingSequenceInput, limits: PlanLimits): Result<SequencePlan> {
  const warnings: Issue[] = [];
  const eph = input.ephemeris;
  const J = input.inertia as Mat3;
  const qInitial = Float64Array.from(input.qStart);
  const H = qRotate(new Float64Array(3), qInitial, input.wheelMomentumBody);
  if (!(input.horizonS > 0) || input.horizonS > eph.endS + 1e-9)
    return fail([
      issue('orbit.horizonS', 'ephemeris', `the plan horizon (${input.horizonS} s) must lie within the ephemeris (ends at ${eph.endS} s)`),
    ]);
  const entries: TrackingEntry[] = [];
  const segments: SequencePlan['segments'] = [];
  let cursor = 0;
  let feasible = true;
  const prevState: StartState = (t, qo, wo) => {
    const last = entries[entries.length - 1];
    if (!last) {
      qo.set(qInitial);
      wo.fill(0);
      return true;
    }
    if (!sourceRaw(eph, last.source, t)) return false;
    qo.set(ts.q);
    wo.set(ts.omegaBody);
    return true;
  };
  const hStart = Float64Array.from(input.wheelMomentumBody);
  for (let i = 0; i < input.targets.length; i++) {
    const tg = input.targets[i]!;
    const path = `targets[${i}]`;
    const notes: string[] = [];
    const { found: f0, win, requestedEnd } = scheduleTarget(input, tg, cursor, prevState, H, limits, notes);
    let found = f0;
    const reasonOf = (): Issue => noSlewReason(input, tg, path, cursor);
    let hold: Fractions | null = null;
    if (found) {
      const trackStart = found.slewStartS + found.offset.durationS;
      if (requestedEnd > input.horizonS + 1e-9) {
        found = null;
      } else {
        hold = newFractions();
        holdFractions(hold, eph, tg.source, trackStart, requestedEnd, J, H, limits);
        if (!within(hold, limits)) {
          segments.push(
            infeasible(qInitial, hStart, [
              issue(
                path,
                'tracking-envelope',
                `${tg.label}: tracking the target needs ${(100 * hold.torque).toFixed(1)} % of the torque and ${(100 * hold.momentum).toFixed(1)} % of the momentum envelope (margins ${(100 * limits.torqueMargin).toFixed(0)} %, ${(100 * limits.momentumMargin).toFixed(0)} %)`,
              ),
            ]),
          );
          feasible = false;
          break;
        }
      }
    }
    if (!found || !hold) {
      const reason =
        found === null && requestedEnd > input.horizonS
          ? issue(path, 'horizon', `${tg.label}: the hold would end after the orbit horizon (${input.horizonS} s)`)
          : reasonOf();
      segments.push(infeasible(qInitial, hStart, [reason]));
      feasible = false;
      break;
    }
    const T = found.offset.durationS;
    const trackStart = found.slewStartS + T;
    // The previous entry holds until this slew starts.
    const prev = entries[entries.length - 1];
    if (prev) prev.holdEndS = found.slewStartS;
    const q0 = new Float64Array(4),
      w0 = new Float64Array(3);
    prevState(found.slewStartS, q0, w0);
    sourceRaw(eph, tg.source, trackStart);
    const qTrackRaw = Float64Array.from(ts.q);
    const seg = trackingSegmentOf(found, hold, q0, w0, qTrackRaw, tg, limits, J, H);
    segments.push(seg);
    entries.push({
      target: i,
      label: tg.label,
      slewStartS: found.slewStartS,
      trackStartS: trackStart,
      holdEndS: requestedEnd,
      requestedHoldEndS: requestedEnd,
      window: win,
      slew: { kind: 'quintic', offset: found.offset },
      source: tg.source,
      qTrack: qTrackRaw,
      liftStartS: found.slewStartS,
      lift: new Float64Array(0),
      holdTorqueFraction: hold.torque,
      holdMomentumFraction: hold.momentum,
      notes,
    });
    cursor = requestedEnd;
  }
  liftEntries(entries, eph, qInitial);
  const last = entries[entries.length - 1];
  const tracking: TrackingPlan = { entries, ephemeris: eph, qInitial, hInertial: H };
  return ok(
    {
      feasible,
      segments,
      timeline: [],
      firstInfeasible: feasible ? -1 : segments.length - 1,
      totalS: last ? last.requestedHoldEndS : 0,
      reference: emptyReference(J, qInitial, input.wheelMomentumBody),
      tracking,
    },
    warnings,
  );
}

/** The plan row of one tracked target: the slew onto it and what its hold needs of the envelopes. */
function trackingSegmentOf(
  found: SlewSearch,
  hold: Fractions,
  q0: Float64Array,
  w0: Float64Array,
  qTrackRaw: Float64Array,
  tg: TrackingSequenceInput['targets'][number],
  limits: PlanLimits,
  J: Mat3,
  H: Float64Array,
): TrackingSegmentPlan {
  const T = found.offset.durationS;
  const trackStart = found.slewStartS + T;
  const binding = bindingOf(found.slew, limits);
  return {
    feasible: true,
    method: 'tracking',
    qStart: q0,
    qEnd: qTrackRaw,
    axisBody: unitOr(found.offset.rho0),
    angleRad: Math.hypot(found.offset.rho0[0]!, found.offset.rho0[1]!, found.offset.rho0[2]!),
    wheelMomentumStartBody: wheelMomentum(q0, w0, J, H),
    wheelMomentumEndBody: wheelMomentum(qTrackRaw, ts.omegaBody, J, H),
    durationS: T,
    peakRateRadPerS: found.slew.peakRate,
    peakAccelRadPerS2: found.slew.peakAccel,
    binding,
    peakTorqueFraction: Math.max(found.slew.torque, hold.torque),
    peakMomentumFraction: Math.max(found.slew.momentum, hold.momentum),
    slewRateFraction: found.slew.rate,
    summary: `slew of ${T.toFixed(1)} s onto ${tg.source.kind === 'moving' ? 'the moving target (ends on its attitude and rate)' : 'the fixed attitude'}, ${binding === 'none' ? 'no limit binds' : `${binding} binds`}; tracking from ${trackStart.toFixed(1)} s`,
  };
}

/** When the target is due and the slew onto it: right after the previous hold, at a time, or at the first pass it can reach. */
function scheduleTarget(
  input: TrackingSequenceInput,
  tg: TrackingSequenceInput['targets'][number],
  cursor: number,
  prevState: StartState,
  H: Float64Array,
  limits: PlanLimits,
  notes: string[],
): { found: SlewSearch | null; win: ScheduledWindow | null; requestedEnd: number } {
  let found: SlewSearch | null = null;
  let win: ScheduledWindow | null = null;
  let requestedEnd = NaN;
  const w = tg.window;
  if (!w) {
    found = searchSlew(input, tg.source, () => cursor, prevState, H, limits);
    if (found) requestedEnd = found.slewStartS + found.offset.durationS + tg.holdS;
  } else if (w.kind === 'time') {
    found = searchSlew(input, tg.source, (T) => w.atS - T, prevState, H, limits);
    if (found && found.slewStartS < cursor - 1e-9) found = null;
    if (found) {
      win = { kind: 'time', startS: w.atS, endS: null, passIndex: null, maxElevationRad: null };
      requestedEnd = w.atS + tg.holdS;
    }
  } else {
    for (let pi = 0; pi < w.passes.length && !found; pi++) {
      const pass = w.passes[pi]!;
      if (pass.startClipped || pass.startS < cursor) continue;
      const r = searchSlew(input, tg.source, (T) => pass.startS - T, prevState, H, limits);
      if (!r || r.slewStartS < cursor - 1e-9) {
        notes.push(`pass ${pi + 1} (starting at ${pass.startS.toFixed(1)} s) is too soon to slew onto`);
        continue;
      }
      found = r;
      win = { kind: 'pass', startS: pass.startS, endS: pass.endS, passIndex: pi, maxElevationRad: pass.maxElevationRad };
      requestedEnd = w.untilPassEnd ? pass.endS : pass.startS + tg.holdS;
    }
  }
  return { found, win, requestedEnd };
}

/** Why no slew could be planned onto target i (no pass left, too late for its time, or no envelope-feasible slew). */
function noSlewReason(input: TrackingSequenceInput, tg: TrackingSequenceInput['targets'][number], path: string, cursor: number): Issue {
  const w = tg.window;
  if (w && w.kind === 'pass' && !w.passes.some((p) => !p.startClipped && p.startS >= cursor))
    return issue(
      `${path}.window`,
      'no-pass',
      `${tg.label}: no pass of its site starts between ${cursor.toFixed(1)} s and the horizon (${input.horizonS} s)`,
    );
  if (w && w.kind === 'time')
    return issue(
      `${path}.window.atUtc`,
      'too-soon',
      `${tg.label}: no feasible slew reaches the target by its window start (${w.atS.toFixed(1)} s from the epoch) after the previous hold (${cursor.toFixed(1)} s)`,
    );
  return issue(
    path,
    'envelope',
    `${tg.label}: no slew up to ${MAX_TRACKING_SLEW_S} s stays within the margined wheel envelopes (or the ephemeris ends)`,
  );
}

/** Lift every entry in order so the reference is continuous (one hemisphere across the whole plan). */
function liftEntries(entries: TrackingEntry[], eph: TrackingSequenceInput['ephemeris'], qInitial: Float64Array): void {
  const refQ = Float64Array.from(qInitial);
  for (let k = 0; k < entries.length; k++) {
    const e = entries[k]!;
    if (k > 0) entryReferenceAt(entries[k - 1]!, { ephemeris: eph }, e.slewStartS, refQ, wR, wdR);
    const end = k + 1 < entries.length ? entries[k + 1]!.slewStartS : eph.endS;
    sourceRaw(eph, e.source, e.slewStartS);
    if (e.slew.kind === 'quintic') qFromRotationVector(qB, e.slew.offset.rho0);
    qMultiply(qA, ts.q, qB);
    const sign = qA[0]! * refQ[0]! + qA[1]! * refQ[1]! + qA[2]! * refQ[2]! + qA[3]! * refQ[3]! < 0 ? -1 : 1;
    if (e.source.kind === 'fixed') {
      for (let c = 0; c < 4; c++) e.qTrack[c] = sign * ts.q[c]!;
      e.lift = Float64Array.from(e.qTrack);
    } else {
      e.lift = buildLift(eph, e.source, e.slewStartS, end, sign);
      liftedTargetAt(e, { ephemeris: eph }, e.trackStartS, e.qTrack, ew, ewd);
    }
  }
}

function unitOr(v: ArrayLike<number>): Float64Array {
  const n = Math.hypot(v[0]!, v[1]!, v[2]!);
  return n > 0 ? Float64Array.of(v[0]! / n, v[1]! / n, v[2]! / n) : Float64Array.of(1, 0, 0);
}

function wheelMomentum(q: ArrayLike<number>, w: ArrayLike<number>, J: Mat3, H: Vec3): Float64Array {
  const hb = qRotateInverse(new Float64Array(3), q, H);
  const jw = m3MulVec(new Float64Array(3), J, w);
  return Float64Array.of(hb[0]! - jw[0]!, hb[1]! - jw[1]!, hb[2]! - jw[2]!);
}

function infeasible(q: Quat, h: ArrayLike<number>, reasons: Issue[]): InfeasibleSegment {
  return {
    feasible: false,
    qStart: Float64Array.from(q),
    qEnd: Float64Array.from(q),
    axisBody: Float64Array.of(1, 0, 0),
    angleRad: 0,
    wheelMomentumStartBody: Float64Array.from(h),
    wheelMomentumEndBody: Float64Array.from(h),
    reasons,
  };
}

/** The tracking input's target labels (for summaries). */
export type { TrackingTargetInput };
