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
import { flyOnline, onlineFlightPossible, type OnlineRun } from '../pipeline/flyOnline';
import type { RunMetrics } from '../metrics/metrics';
import type { ErrorGrid } from '../metrics/online';
import type { RunConstraintReport } from '../pipeline/constraints';
import { SensorNoiseTape } from '../sim/noiseTape';

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

/** What a study row is made of, from a trace (caseRunOf) or from the online recorder (caseRunOnline). */
interface RowParts {
  controllerId: string;
  status: CaseStatus;
  /** The outcome's message (the reason of a failed run). */
  message: string;
  metrics: RunMetrics;
  /** Samples recorded, the last one's time and attitude (null when none). */
  n: number;
  endS: number;
  lastQ: ArrayLike<number> | null;
  /** Error angle, rad, at the first `gridCount` grid times (TRACE_SAMPLES over durationS). */
  gridRad: ArrayLike<number>;
  gridCount: number;
  constraints?: RunConstraintReport;
}

/** The error-angle grid of a study row: TRACE_SAMPLES times k·durationS/(TRACE_SAMPLES − 1). */
export function caseErrorGrid(ctx: StudyContext): ErrorGrid {
  return { stepS: ctx.def.durationS / (TRACE_SAMPLES - 1), count: TRACE_SAMPLES };
}

function caseRunFromParts(ctx: StudyContext, d: CaseDraw, p: RowParts): CaseRun {
  const m = p.metrics;
  const status = p.status;
  // a roll-free target is the reduced one from the case's own start (pointingCase.ts)
  const target = ctx.prepared.scenario.targets[0]?.pointingOnly
    ? caseTarget(ctx.prepared.scenario.targets[0], d.q0).qInertialFromBody
    : ctx.target;
  const finalEta = p.n > 0 && p.lastQ ? qConjMultiply(qe, target, p.lastQ)[3]! : d.errorEta;
  const trace = new Float32Array(TRACE_SAMPLES);
  for (let k = 0; k < p.gridCount; k++) trace[k] = p.gridRad[k]! * DEG_PER_RAD;
  const finite = (x: number) => (Number.isFinite(x) ? x : 0);
  return {
    controllerId: p.controllerId,
    status,
    reason: status === 'failed' ? p.message : '',
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
    endS: p.n > 0 ? p.endS : 0,
    errorTraceDeg: trace,
    traceCount: p.gridCount,
    ...(p.constraints
      ? { constraintViolated: !p.constraints.clear, constraintMarginDeg: finite(p.constraints.minimumMarginRad * DEG_PER_RAD) }
      : {}),
  };
}

/** One flown case run → its study row. */
export function caseRunOf(ctx: StudyContext, d: CaseDraw, run: ControllerRun): CaseRun {
  const tr = run.trace;
  const n = tr.n;
  // Decimate: the first trace sample at or after each grid time.
  const M = TRACE_SAMPLES;
  const gridRad = new Float64Array(M);
  const dtGrid = ctx.def.durationS / (M - 1);
  let count = 0;
  for (let k = 0, i = 0; k < M && n > 0; k++) {
    const tk = k * dtGrid;
    if (tk > tr.t[n - 1]! + 1e-9) break;
    while (i < n - 1 && tr.t[i]! < tk - 1e-9) i++;
    gridRad[k] = tr.errorAngle[i]!;
    count = k + 1;
  }
  return caseRunFromParts(ctx, d, {
    controllerId: run.controllerId,
    status: run.verdict.kind,
    message: run.outcome.message,
    metrics: run.metrics,
    n,
    endS: n > 0 ? tr.t[n - 1]! : 0,
    lastQ: n > 0 ? tr.q.subarray(4 * (n - 1), 4 * n) : null,
    gridRad,
    gridCount: count,
    ...(run.constraints ? { constraints: run.constraints } : {}),
  });
}

/** A case run flown with its metrics computed as it went (pipeline/flyOnline.ts) → the same study row as caseRunOf. */
export function caseRunOnline(ctx: StudyContext, d: CaseDraw, run: OnlineRun): CaseRun {
  const r = run.recorder;
  return caseRunFromParts(ctx, d, {
    controllerId: run.controllerId,
    status: run.verdict.kind,
    message: run.outcome.message,
    metrics: run.metrics,
    n: r.count,
    endS: r.lastT,
    lastQ: r.count > 0 ? r.lastQ : null,
    gridRad: r.gridErrorRad,
    gridCount: r.gridFilled,
  });
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

export interface RunCaseOptions {
  /**
   * Summarise runs as they fly, without a trace, where the scenario allows it (default true;
   * false: always the trace path; both give the same rows, test/property/metrics-online.test.ts).
   */
  online?: boolean;
  /**
   * Draw a case's sensor noise once and let every law read it (sim/noiseTape.ts; default true;
   * false: each law draws it again, as a lone flight does). The same rows either way
   * (test/unit/noise-tape.test.ts).
   */
  shareNoise?: boolean;
}

/** This thread's tape: a case's laws fly one after another with the same noise seed. */
const caseNoiseTape = new SensorNoiseTape();

/**
 * Run case `index` for every selected controller. Returns null when `shouldStop` interrupted it
 * (a half-run case is never reported).
 */
export function runCase(ctx: StudyContext, index: number, shouldStop?: () => boolean, options: RunCaseOptions = {}): CaseRecord | null {
  const pc = prepareCase(ctx, index);
  if (!pc.ok) return { draw: pc.draw, runs: ctx.controllers.map((c) => unflyableRun(c, pc.reason)) };
  const runs: CaseRun[] = [];
  // Without constraints or orbit tracking a row needs only the metrics: fly without a trace.
  const online = (options.online ?? true) && onlineFlightPossible(pc.prepared);
  const grid = caseErrorGrid(ctx);
  const tape = (options.shareNoise ?? true) ? caseNoiseTape : undefined;
  for (const c of pc.prepared.controllers) {
    if (online) {
      const run = flyOnline(pc.prepared, c, ctx.def.mode, grid, shouldStop, tape, 'study-row');
      if (run.outcome.status === 'cancelled' && shouldStop?.()) return null;
      runs.push(caseRunOnline(ctx, pc.draw, run));
      continue;
    }
    const run = flyAndSummarise(pc.prepared, c, ctx.def.mode, { shouldStop, monitor: false, constraintSeries: false });
    if (run.outcome.status === 'cancelled' && shouldStop?.()) return null;
    runs.push(caseRunOf(ctx, pc.draw, run));
  }
  return { draw: pc.draw, runs };
}
