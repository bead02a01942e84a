/**
 * One study case: draw it, build its truth vehicle, fly every selected controller on it (the same
 * case and the same noise seed for each: a paired comparison), and keep per-run metrics plus a
 * decimated error-angle trace. The physics is the pipeline's: runClosedLoop and computeMetrics,
 * configured exactly as pipeline/run.ts runOne configures them, plus the study's per-case noise
 * seed, worst-case noise level ē and early stop.
 */
import { makeGyrostat } from '../body/gyrostat';
import { validateInertia } from '../body/inertia';
import type { RunMetrics } from '../metrics/metrics';
import type { MonitorFlag } from '../metrics/monitor';
import { profiledReference, runMetrics, runMonitor } from '../pipeline/run';
import { planLimits, type BuiltController } from '../pipeline/build';
import { planSequence } from '../plan/sequence';
import { runClosedLoop, type Actuation, type ClosedLoopResult, type ReferenceSource } from '../sim/closedLoop';
import { applyAxes, makeWheelArray, type WheelArray } from '../wheels/array';
import { qConjMultiply } from '../math/rotation';
import type { Gyrostat } from '../body/gyrostat';
import type { StudyContext } from './context';
import type { CaseDraw } from './sample';
import { drawCase } from './sample';
import { DEG_PER_RAD } from '../units';

/** Samples of the decimated error-angle trace kept for every run (fixed grid over durationS). */
export const TRACE_SAMPLES = 120;

/**
 * A run "chatters" when its chatter metric (logic jumps plus torque sign reversals in the busiest
 * 10 s window, per second; metrics.ts) reaches this: ten events in ten seconds, about one a second
 * sustained. Common practice, no source; set from what studies show: a clean settling slew
 * scores 0.1–0.3 /s, a synergistic slew with its one or two intended switches up to 0.7 /s, and the
 * sign-switch law held near a 180° error by worst-case noise 1.2–3.6 /s on the test vehicle.
 */
export const CHATTER_THRESHOLD_PER_S = 1;

export type CaseStatus = 'settled' | 'unsettled' | 'failed' | 'unflyable';

/** One controller on one case. Angles in degrees, times in seconds, fractions of the case's limits. */
export interface CaseRun {
  controllerId: string;
  status: CaseStatus;
  /** Why a run failed or a case is unflyable (empty otherwise). */
  reason: string;
  settleTimeS: number | null;
  rotationTravelledDeg: number;
  shortestRotationDeg: number;
  /** Travelled minus shortest rotation, deg. */
  extraRotationDeg: number;
  /** Lift view of unwinding (see UNWIND_ETA_MIN); false by construction for laws on SO(3). */
  unwound: boolean;
  /** Ended on the quaternion lift opposite to the start's: the body turned through the 180° error attitude. */
  longWay: boolean;
  jumps: number;
  chatterPerS: number;
  chattered: boolean;
  peakWheelTorqueFraction: number;
  peakWheelMomentumFraction: number;
  finalErrorDeg: number;
  /** Scalar part of the error quaternion (continuous along the run) at the end. */
  finalEta: number;
  /** Simulated time the run reached, s (less than durationS after an early stop). */
  endS: number;
  /** Error angle, deg, at t_k = k·durationS/(TRACE_SAMPLES − 1), for k < traceCount. */
  errorTraceDeg: Float32Array;
  traceCount: number;
}

/** One case: what was drawn (plain data) and one run per controller, in the study's order. */
export interface CaseRecord {
  draw: CaseDraw;
  runs: CaseRun[];
}

/** The case's truth vehicle, or why it cannot fly. */
export interface CaseVehicle {
  plant: Gyrostat;
  wheels: WheelArray;
  hWheel0: Float64Array;
  /** Index map case wheel → nominal wheel. */
  kept: number[];
}

export function buildCaseVehicle(ctx: StudyContext, d: CaseDraw): { ok: true; value: CaseVehicle } | { ok: false; reason: string } {
  if (!d.inertiaRows) return { ok: false, reason: `no physical inertia in ${d.inertiaRejections} draws (dispersion too wide)` };
  const inertia = validateInertia(d.inertiaRows, 'inertia');
  if (!inertia.ok) return { ok: false, reason: `inertia: ${inertia.errors[0]!.message}` };
  const kept: number[] = [];
  const specs = ctx.wheelSpecs.flatMap((w, i) => {
    if (i === d.failedWheel) return [];
    kept.push(i);
    return [{ ...w, maxTorqueNm: w.maxTorqueNm * d.wheelTorqueFactor[i]!, maxMomentumNms: w.maxMomentumNms * d.wheelMomentumFactor[i]! }];
  });
  const wheels = makeWheelArray(specs, 'wheels');
  if (!wheels.ok) {
    const lost = d.failedWheel >= 0 ? `after losing wheel ${d.failedWheel + 1}, ` : '';
    return { ok: false, reason: `${lost}${wheels.errors[0]!.message}` };
  }
  const fr = ctx.prepared.scenario.vehicle.wheelFriction;
  const plant = makeGyrostat(
    inertia.value.J,
    wheels.value,
    fr ? { viscousNmsPerRad: fr.viscousNmPerRadPerS, coulombNm: fr.coulombNm } : undefined,
  );
  if (!plant.ok) return { ok: false, reason: plant.errors[0]!.message };
  const h0n = ctx.prepared.scenario.initial.hWheelNms;
  return { ok: true, value: { plant: plant.value, wheels: wheels.value, hWheel0: Float64Array.from(kept.map((i) => h0n[i])), kept } };
}

/** Direct mode: regulation to the first target, at rest. */
function fixedTarget(q: Float64Array): ReferenceSource {
  return {
    at: (_t, qo, w, wd) => {
      qo[0] = q[0]!;
      qo[1] = q[1]!;
      qo[2] = q[2]!;
      qo[3] = q[3]!;
      w[0] = w[1] = w[2] = 0;
      wd[0] = wd[1] = wd[2] = 0;
      return 0;
    },
  };
}

/** Point the shared controller plant model at the case's wheels (restored by restorePlantModel). */
function usePlantModel(ctx: StudyContext, v: CaseVehicle): void {
  const m = ctx.prepared.vehicle.plantModel;
  m.nWheels = v.wheels.n;
  m.axes = v.wheels.axes;
}

function restorePlantModel(ctx: StudyContext): void {
  const m = ctx.prepared.vehicle.plantModel;
  m.nWheels = ctx.nominalWheelCount;
  m.axes = ctx.nominalAxes;
}

interface Flown {
  res: ClosedLoopResult;
  metrics: RunMetrics;
}

/** The reference of a case, or why it has none (profiled mode with an infeasible plan). */
export function caseReference(
  ctx: StudyContext,
  d: CaseDraw,
  v: CaseVehicle,
): { ok: true; ref: ReferenceSource } | { ok: false; reason: string } {
  if (ctx.def.mode === 'direct') return { ok: true, ref: fixedTarget(ctx.target) };
  const p = ctx.prepared;
  const s = p.scenario;
  const hBody = applyAxes(new Float64Array(3), v.wheels, v.hWheel0);
  const plan = planSequence(
    {
      qStart: d.q0,
      inertia: p.vehicle.plant.Jperp,
      wheelMomentumBody: hBody,
      targets: [{ q: ctx.target, holdS: s.targets[0]!.holdS, label: s.targets[0]!.label }],
    },
    planLimits(s, p.vehicle),
  );
  if (!plan.ok) return { ok: false, reason: `no plan: ${plan.errors[0]!.message}` };
  const seg = plan.value.segments[0]!;
  if (!seg.feasible) return { ok: false, reason: `no feasible slew on the nominal model: ${seg.reasons.map((r) => r.message).join('; ')}` };
  return { ok: true, ref: profiledReference(plan.value) };
}

function actuationOf(ctx: StudyContext, d: CaseDraw): Actuation {
  if (d.actuation === 'quantized') return { mode: 'quantized', quantumNm: ctx.def.torqueQuantumNm ?? 1e-5 };
  return { mode: d.actuation };
}

/** Fly one controller on a built case (full run result; used by runCase and the exact re-run). */
export function flyCase(
  ctx: StudyContext,
  d: CaseDraw,
  v: CaseVehicle,
  ref: ReferenceSource,
  c: BuiltController,
  shouldStop?: () => boolean,
): Flown {
  const s = ctx.prepared.scenario;
  usePlantModel(ctx, v);
  try {
    const res = runClosedLoop({
      plant: v.plant,
      wheels: v.wheels,
      controller: c.controller,
      reference: ref,
      q0: d.q0,
      omega0: d.omega0RadPerS,
      hWheel0: v.hWheel0,
      tEnd: ctx.def.durationS,
      timing: s.simulation.timing,
      controlRateHz: d.controlRateHz,
      rk4StepsPerSample: s.simulation.rk4StepsPerSample,
      sensors: {
        attitudeSigmaRad: d.attitudeNoiseRad,
        rateSigmaRadPerS: s.vehicle.sensors.rateNoiseRadPerS,
        rateBiasRadPerS: d.rateBiasRadPerS,
        adversarialEta: d.adversarialEta,
      },
      seed: d.noiseSeed,
      stream: 0,
      actuation: actuationOf(ctx, d),
      allocation: 'min-max',
      // Profiled cases can sit within the settle thresholds of their moving reference while
      // still slewing, so only direct (regulation) cases stop early.
      stopWhenSettledForS: ctx.def.mode === 'direct' ? ctx.def.stopAfterSettledForS : 0,
      settleAngleRad: s.simulation.settleAngleRad,
      settleRateRadPerS: s.simulation.settleRateRadPerS,
      shouldStop,
    });
    const metrics = runMetrics(res, s, v.wheels, ctx.target);
    return { res, metrics };
  } finally {
    restorePlantModel(ctx);
  }
}

/** Lyapunov-monitor flags of a flown case (only for the exact re-run; too slow for every case). */
export function monitorOf(f: Flown, c: BuiltController): MonitorFlag[] {
  return runMonitor(f.res, c);
}

const qe = new Float64Array(4);

/** Scalar part of q_target* ⊗ q at trace sample k. */
function etaAt(q: Float64Array, k: number, target: Float64Array): number {
  qConjMultiply(qe, target, q.subarray(4 * k, 4 * k + 4));
  return qe[3]!;
}

/**
 * Unwinding, the quaternion-lift view (Bhat & Bernstein, Systems & Control Letters 39(1), 2000;
 * Mayhew, Sanfelice & Teel, IEEE TAC 56(11), 2011): the error quaternion is continuous along a
 * run, so a run that starts with scalar part η₀ and ends near the opposite lift (η_end of the
 * other sign, |η_end| ≥ UNWIND_ETA_MIN) has turned the long way round, 360° − θ₀ instead of θ₀.
 * For a law that acts on the quaternion (PD, sign switch, hysteretic, eigenaxis) that is
 * unwinding. A law defined on SO(3) (the synergistic family, methods §4) cannot tell q from −q,
 * so for it the same event only says its path crossed the 180° attitude: reported as `longWay`,
 * not as unwinding. The pipeline's own flag (an extra full turn beyond the shortest rotation)
 * counts as unwinding for every law.
 *
 * Under worst-case noise ē a start with |η₀| < ē may be measured on the other lift: no law can
 * know its lift there, so going the long way from such a start (at most 4·arcsin ē of extra
 * rotation) is reported as `longWay` but not as unwinding.
 */
export const UNWIND_ETA_MIN = 0.5;

const SO3_LAWS: ReadonlySet<string> = new Set(['synergistic']);

function summarizeRun(ctx: StudyContext, d: CaseDraw, c: BuiltController, f: Flown): CaseRun {
  const m = f.metrics;
  const tr = f.res.trace;
  const n = tr.n;
  const status: CaseStatus = f.res.outcome.status !== 'completed' ? 'failed' : m.settled ? 'settled' : 'unsettled';
  const finalEta = n > 0 ? etaAt(tr.q, n - 1, ctx.target) : d.errorEta;
  const farLift = Math.abs(finalEta) >= UNWIND_ETA_MIN && finalEta * d.errorEta < 0;
  // Decimate: the first trace sample at or after each grid time.
  const M = TRACE_SAMPLES;
  const trace = new Float32Array(M);
  const dtGrid = ctx.def.durationS / (M - 1);
  let count = 0;
  for (let k = 0, i = 0; k < M && n > 0; k++) {
    const tk = k * dtGrid;
    if (tk > tr.t[n - 1]! + 1e-9) break;
    while (i < n - 1 && tr.t[i]! < tk - 1e-9) i++;
    trace[k] = tr.errorAngle[i]! * DEG_PER_RAD;
    count = k + 1;
  }
  const finite = (x: number) => (Number.isFinite(x) ? x : 0);
  return {
    controllerId: c.id,
    status,
    reason: status === 'failed' ? f.res.outcome.message : '',
    settleTimeS: m.settleTimeS,
    rotationTravelledDeg: finite(m.rotationTravelledRad * DEG_PER_RAD),
    shortestRotationDeg: finite(m.shortestRotationRad * DEG_PER_RAD),
    extraRotationDeg: finite((m.rotationTravelledRad - m.shortestRotationRad) * DEG_PER_RAD),
    unwound: m.unwound || (farLift && !SO3_LAWS.has(c.law) && Math.abs(d.errorEta) >= d.adversarialEta),
    longWay: farLift,
    jumps: m.jumps,
    chatterPerS: finite(m.chatterPerS),
    chattered: m.chatterPerS >= CHATTER_THRESHOLD_PER_S,
    peakWheelTorqueFraction: finite(m.peakWheelTorqueFraction),
    peakWheelMomentumFraction: finite(m.peakWheelMomentumFraction),
    finalErrorDeg: finite(m.finalErrorRad * DEG_PER_RAD),
    finalEta: finite(finalEta),
    endS: n > 0 ? tr.t[n - 1]! : 0,
    errorTraceDeg: trace,
    traceCount: count,
  };
}

function unflyableRun(c: BuiltController, reason: string): CaseRun {
  return {
    controllerId: c.id,
    status: 'unflyable',
    reason,
    settleTimeS: null,
    rotationTravelledDeg: 0,
    shortestRotationDeg: 0,
    extraRotationDeg: 0,
    unwound: false,
    longWay: false,
    jumps: 0,
    chatterPerS: 0,
    chattered: false,
    peakWheelTorqueFraction: 0,
    peakWheelMomentumFraction: 0,
    finalErrorDeg: 0,
    finalEta: 0,
    endS: 0,
    errorTraceDeg: new Float32Array(TRACE_SAMPLES),
    traceCount: 0,
  };
}

/**
 * Run case `index` for every selected controller. Returns null when `shouldStop` interrupted it
 * (a half-run case is never reported).
 */
export function runCase(ctx: StudyContext, index: number, shouldStop?: () => boolean): CaseRecord | null {
  const d = drawCase(ctx.def, ctx.nominal, index);
  const v = buildCaseVehicle(ctx, d);
  if (!v.ok) return { draw: d, runs: ctx.controllers.map((c) => unflyableRun(c, v.reason)) };
  const ref = caseReference(ctx, d, v.value);
  if (!ref.ok) return { draw: d, runs: ctx.controllers.map((c) => unflyableRun(c, ref.reason)) };
  const runs: CaseRun[] = [];
  for (const c of ctx.controllers) {
    const f = flyCase(ctx, d, v.value, ref.ref, c, shouldStop);
    if (f.res.outcome.status === 'cancelled' && shouldStop?.()) return null;
    runs.push(summarizeRun(ctx, d, c, f));
  }
  return { draw: d, runs };
}
