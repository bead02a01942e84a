/**
 * One study case: draw it, write it as a scenario (disperse.ts), take that through the
 * pipeline's build and plan stages and fly every selected controller on it (the same case and
 * noise seed for each: a paired comparison), keeping per-run metrics and a decimated error-angle
 * trace. Nothing here simulates: the flights are the pipeline's (pipeline/run.ts
 * flyAndSummarise), so a case written as a file (caseScenario.ts) flies the same way.
 */
import { flyAndSummarise, prepareResolved, type Prepared } from '../pipeline/run';
import type { BuiltController, ControllerRun } from '../pipeline/types';
import { qConjMultiply } from '../math/rotation';
import { DEG_PER_RAD } from '../units';
import type { StudyContext } from './context';
import { disperseScenario } from './disperse';
import type { CaseDraw } from './sample';
import { drawCase } from './sample';
import { caseTarget } from './pointingCase';

/** Samples of the decimated error-angle trace kept for every run (fixed grid over durationS). */
export const TRACE_SAMPLES = 120;

/**
 * A run "chatters" when its chatter metric (reversals of the commanded torque direction in the
 * busiest 10 s window, per second, planned switches excluded; metrics/chatter.ts) reaches this:
 * five reversals in ten seconds. Common practice, no source: a clean slew scores 0 (0.1 /s for
 * the one braking reversal of a law stepping to its target), a law held near a 180° error by
 * noise reverses at nearly every sample.
 */
export const CHATTER_THRESHOLD_PER_S = 0.5;

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
  /** Went the long way round although the short way was clearly shorter (metrics/segments.ts). */
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
  /** The run violated an attitude constraint of the scenario (absent: the scenario declares none). */
  constraintViolated?: boolean;
  /** Smallest constraint margin over the run, deg (absent: none declared). */
  constraintMarginDeg?: number;
}

/** A run's outcome, the first that applies: failed | unflyable | unsettled | unwound | chattered | settled. */
export function outcomeOf(r: CaseRun): string {
  if (r.status === 'failed' || r.status === 'unflyable' || r.status === 'unsettled') return r.status;
  if (r.unwound) return 'unwound';
  if (r.chattered) return 'chattered';
  return 'settled';
}

/** One case: what was drawn (plain data) and one run per controller, in the study's order. */
export interface CaseRecord {
  draw: CaseDraw;
  runs: CaseRun[];
}

/** A case ready to fly: its draw and the case scenario through stages 3–4, or why it cannot fly. */
export type PreparedCase = { draw: CaseDraw; ok: true; prepared: Prepared } | { draw: CaseDraw; ok: false; reason: string };

/** Draw case `index`, write it as a scenario and take it through the pipeline's build and plan stages. */
export function prepareCase(ctx: StudyContext, index: number): PreparedCase {
  const d = drawCase(ctx.def, ctx.nominal, index);
  const ids = ctx.controllers.map((c) => c.id);
  const cs = disperseScenario(ctx.prepared.scenario, ctx.def, d, ids, ctx.target);
  if (!cs.ok) return { draw: d, ok: false, reason: cs.reason };
  const p = prepareResolved(cs.scenario, null, ids);
  if (!p.ok) {
    const lost = d.failedWheel >= 0 ? `after losing wheel ${d.failedWheel + 1}, ` : '';
    return { draw: d, ok: false, reason: `${lost}${p.errors[0]!.message}` };
  }
  const seg = p.value.plan.segments[0];
  if (seg && !seg.feasible) return { draw: d, ok: false, reason: `no feasible slew: ${seg.reasons.map((r) => r.message).join('; ')}` };
  return { draw: d, ok: true, prepared: p.value };
}

const qe = new Float64Array(4);

/** Scalar part of q_target* ⊗ q at trace sample k. */
function etaAt(q: Float64Array, k: number, target: Float64Array): number {
  qConjMultiply(qe, target, q.subarray(4 * k, 4 * k + 4));
  return qe[3]!;
}

/** One flown case run → its study row. */
export function caseRunOf(ctx: StudyContext, d: CaseDraw, run: ControllerRun): CaseRun {
  const m = run.metrics;
  const tr = run.trace;
  const n = tr.n;
  const status: CaseStatus = run.verdict.kind;
  // a roll-free target is the reduced one from the case's own start (pointingCase.ts)
  const target = ctx.prepared.scenario.targets[0]?.pointingOnly
    ? caseTarget(ctx.prepared.scenario.targets[0], d.q0).qInertialFromBody
    : ctx.target;
  const finalEta = n > 0 ? etaAt(tr.q, n - 1, target) : d.errorEta;
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
    controllerId: run.controllerId,
    status,
    reason: status === 'failed' ? run.outcome.message : '',
    settleTimeS: m.settleTimeS,
    rotationTravelledDeg: finite(m.rotationTravelledRad * DEG_PER_RAD),
    shortestRotationDeg: finite(m.shortestRotationRad * DEG_PER_RAD),
    extraRotationDeg: finite((m.rotationTravelledRad - m.shortestRotationRad) * DEG_PER_RAD),
    unwound: m.unwound,
    longWay: m.longWay,
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
    ...(run.constraints
      ? { constraintViolated: !run.constraints.clear, constraintMarginDeg: finite(run.constraints.minimumMarginRad * DEG_PER_RAD) }
      : {}),
  };
}

function unflyableRun(c: Pick<BuiltController, 'id'>, reason: string): CaseRun {
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
  const pc = prepareCase(ctx, index);
  if (!pc.ok) return { draw: pc.draw, runs: ctx.controllers.map((c) => unflyableRun(c, pc.reason)) };
  const runs: CaseRun[] = [];
  for (const c of pc.prepared.controllers) {
    const run = flyAndSummarise(pc.prepared, c, ctx.def.mode, { shouldStop, monitor: false, constraintSeries: false });
    if (run.outcome.status === 'cancelled' && shouldStop?.()) return null;
    runs.push(caseRunOf(ctx, pc.draw, run));
  }
  return { draw: pc.draw, runs };
}
