/**
 * Stage 6 of the pipeline, summarise: a flown run → its metrics and Lyapunov-monitor flags (one
 * definition each, in metrics/), the comparison table with its best marks, and the summaries of
 * the vehicle, the certificates and the scenario that views and exports read.
 */
import { symmetricEigen3 } from '../math/mat3';
import { CHATTER_FLOOR_FRACTION } from '../metrics/chatter';
import { computeMetrics, type MetricOptions, type RunMetrics } from '../metrics/metrics';
import { lyapunovMonitor, type MonitorFlag } from '../metrics/monitor';
import { plannedSwitchTimes } from '../plan/reference';
import { trackingSwitchTimes } from '../sim/trackingReference';
import type { SequencePlan } from '../plan/types';
import type { SensorModel } from '../sim/sensors';
import { makeDiagnostics } from '../control/types';
import type { ClosedLoopResult } from '../sim/closedLoop';
import type { RunMode, RunOutcome, RunTrace, JumpEvent } from '../sim/types';
import type { ResolvedScenario } from '../scenario/resolve';
import type { Scenario } from '../scenario/schema';
import type { Zonotope } from '../wheels/envelope';
import type {
  BuiltController,
  CertificateSummary,
  ControllerRun,
  EnvelopeSummary,
  RunVerdict,
  ScenarioSummary,
  Vehicle,
  VehicleSummary,
} from './types';
import { certificateSummary } from './types';
import { metricInputsOf } from './metricInputs';
import { pointingAxesOf } from './pointing';

/** Chatter is counted over sliding windows of this length (s); metrics/chatter.ts defines the measure. */
export const CHATTER_WINDOW_S = 10;
/** The monitor flags a rise above this fraction of the run's largest W, plus the noise energy (monitor.ts). */
export const MONITOR_REL_TOL = 1e-3;
/** …plus this absolute floor (J), so round-off in a constant W is never a rise. */
export const MONITOR_ABS_TOL = 1e-12;

/** What the metrics and the monitor need of the scenario, the vehicle and the flight. */
export interface MetricContext {
  settleAngleRad: number;
  settleRateRadPerS: number;
  maxTorqueNm: Float64Array;
  maxMomentumNms: Float64Array;
  /** Target attitude of each segment, 4 per segment. */
  targets: Float64Array;
  /** Planned switches of the flight's reference (s). */
  plannedSwitchTimes: Float64Array;
  /** Chatter floor, N·m: CHATTER_FLOOR_FRACTION of the smallest wheel torque limit. */
  chatterFloorNm: number;
  sensors: SensorModel;
  /** Orbit plans: segments are measured against the moving reference (metrics/segments.ts). */
  movingTargets?: boolean;
  /** Pointed body axis per segment, 3 each (zeros: full attitude); absent when no target is pointing-only. */
  segmentAxes?: Float64Array;
}

/** Metrics of a flown run with the scenario's settle thresholds and the wheels' own limits. */
export function runMetrics(res: { trace: RunTrace; jumps: readonly JumpEvent[] }, m: MetricContext, liftDependent = true): RunMetrics {
  return computeMetrics(res.trace, res.jumps, metricOptionsOf(m, liftDependent));
}

/** The metric options of a run (the trace path above and the online one, pipeline/flyOnline.ts). */
export function metricOptionsOf(m: MetricContext, liftDependent = true): MetricOptions {
  return {
    settleAngleRad: m.settleAngleRad,
    settleRateRadPerS: m.settleRateRadPerS,
    chatterWindowS: CHATTER_WINDOW_S,
    maxTorqueNm: m.maxTorqueNm,
    maxMomentumNms: m.maxMomentumNms,
    segmentTargets: m.targets,
    plannedSwitchTimes: m.plannedSwitchTimes,
    chatterFloorNm: m.chatterFloorNm,
    boundedNoiseEta: m.sensors.adversarialEta,
    liftDependent,
    movingTargets: m.movingTargets ?? false,
    ...(m.segmentAxes ? { segmentAxes: m.segmentAxes } : {}),
  };
}

/**
 * The energy sensor noise alone moves a law's W by: W of a state 3σ off in attitude and 3σ (plus
 * the bias) off in rate, measured with the law's own Lyapunov function (monitor.ts header).
 */
export function noiseEnergy(c: BuiltController, sensors: SensorModel, nWheels: number): number {
  const th = 3 * sensors.attitudeSigmaRad;
  const b = sensors.rateBiasRadPerS;
  const w = 3 * sensors.rateSigmaRadPerS + Math.hypot(b[0]!, b[1]!, b[2]!);
  if (!(th > 0) && !(w > 0)) return 0;
  const input = {
    q: Float64Array.of(Math.sin(th / 2), 0, 0, Math.cos(th / 2)),
    omega: Float64Array.of(w, 0, 0),
    hWheel: new Float64Array(nWheels),
    qRef: Float64Array.of(0, 0, 0, 1),
    omegaRef: new Float64Array(3),
    omegaDotRef: new Float64Array(3),
  };
  const d = makeDiagnostics();
  const logic = c.controller.initialLogic(input);
  const v = c.controller.diagnostics(d, input, logic).lyapunov;
  return Number.isFinite(v) ? Math.abs(v) : 0;
}

/** Lyapunov-monitor flags with the law's promised jump decrease and a physically scaled tolerance. */
export function runMonitor(res: { trace: RunTrace; jumps: readonly JumpEvent[] }, c: BuiltController, m: MetricContext): MonitorFlag[] {
  return lyapunovMonitor(res.trace, res.jumps, {
    jumpDecrease: c.controller.jumpDecrease,
    relTol: MONITOR_REL_TOL,
    absTol: MONITOR_ABS_TOL,
    noiseEnergy: noiseEnergy(c, m.sensors, m.maxTorqueNm.length),
    plannedSwitchTimes: m.plannedSwitchTimes,
  });
}

export function metricContext(
  s: ResolvedScenario,
  v: Pick<Vehicle, 'wheels'>,
  targets: Float64Array,
  plan: SequencePlan,
  mode: RunMode,
  sensors: SensorModel,
): MetricContext {
  const axes = pointingAxesOf(s.targets);
  return {
    settleAngleRad: s.simulation.settleAngleRad,
    settleRateRadPerS: s.simulation.settleRateRadPerS,
    maxTorqueNm: v.wheels.maxTorqueNm,
    maxMomentumNms: v.wheels.maxMomentumNms,
    targets,
    plannedSwitchTimes: plan.tracking
      ? trackingSwitchTimes(plan.tracking, mode === 'step-target')
      : plannedSwitchTimes(plan.reference, mode === 'step-target'),
    chatterFloorNm: CHATTER_FLOOR_FRACTION * Math.min(...Array.from(v.wheels.maxTorqueNm)),
    sensors,
    movingTargets: !!plan.tracking,
    ...(axes ? { segmentAxes: axes } : {}),
  };
}

/** Stage 6 for one run: the flown result with its metrics and monitor. */
export function summariseRun(
  res: ClosedLoopResult,
  c: BuiltController,
  mode: RunMode,
  m: MetricContext,
  withMonitor = true,
): ControllerRun {
  const metrics = runMetrics(res, m, c.liftDependent);
  return {
    key: `${c.id}:${mode}`,
    controllerId: c.id,
    label: c.label,
    law: c.law,
    mode,
    logicKind: c.logicKind,
    trace: res.trace,
    jumps: res.jumps,
    outcome: res.outcome,
    verdict: verdictOf(res.outcome, metrics),
    metrics,
    monitor: withMonitor ? runMonitor(res, c, m) : [],
    gainNote: c.gainNote,
    metricInputs: metricInputsOf({
      settleAngleRad: m.settleAngleRad,
      settleRateRadPerS: m.settleRateRadPerS,
      chatterWindowS: CHATTER_WINDOW_S,
      chatterFloorNm: m.chatterFloorNm,
      plannedSwitchTimes: m.plannedSwitchTimes,
      boundedNoiseEta: m.sensors.adversarialEta,
      liftDependent: c.liftDependent,
      monitor: {
        relTol: MONITOR_REL_TOL,
        absTol: MONITOR_ABS_TOL,
        noiseEnergy: noiseEnergy(c, m.sensors, m.maxTorqueNm.length),
        jumpDecrease: c.controller.jumpDecrease,
      },
    }),
  };
}

/**
 * Whether a run met the pointing requirement, apart from how the simulation ended: failed (the
 * run did not reach its end: non-finite state, too many jumps at one instant, cancelled),
 * unsettled (it ran to the end but some segment never stayed within the settle thresholds), or
 * settled.
 */
export function verdictOf(o: RunOutcome, m: RunMetrics): RunVerdict {
  if (o.status !== 'completed') return { kind: 'failed', text: `failed: ${o.message}` };
  if (!m.settled) {
    const bad = m.segments.filter((s) => s.settleTimeS === null).map((s) => s.segment + 1);
    return { kind: 'unsettled', text: `not settled (segment${bad.length === 1 ? '' : 's'} ${bad.join(', ')})` };
  }
  return { kind: 'settled', text: `settled in ${m.settleTimeS!.toFixed(1)} s` };
}

export function certificates(cs: readonly BuiltController[]): CertificateSummary[] {
  return cs.flatMap((c) =>
    c.controller.certificate
      ? [certificateSummary(c.id, c.controller.certificate)]
      : c.controller.sphereCertificate
        ? [certificateSummary(c.id, c.controller.sphereCertificate, 'S2')]
        : [],
  );
}

function envelopeSummary(z: Zonotope): EnvelopeSummary {
  return { vertices: z.vertices, triangles: z.triangles, faceNormals: z.faceNormals, faceOffsets: z.faceOffsets };
}

export function vehicleSummary(v: Vehicle): VehicleSummary {
  const eig = symmetricEigen3(v.inertia.J);
  const axes = [0, 1, 2].map((k) => [eig.vectors[3 * k]!, eig.vectors[3 * k + 1]!, eig.vectors[3 * k + 2]!] as [number, number, number]);
  return {
    name: v.name,
    inertiaKgm2: [0, 1, 2].map((r) => [0, 1, 2].map((c) => v.inertia.J[3 * c + r]!)),
    principalMomentsKgm2: [eig.values[0]!, eig.values[1]!, eig.values[2]!],
    principalAxes: axes,
    nWheels: v.wheels.n,
    wheelAxes: v.wheels.axes,
    maxTorqueNm: v.wheels.maxTorqueNm,
    maxMomentumNms: v.wheels.maxMomentumNms,
    torqueEnvelope: envelopeSummary(v.torqueEnvelope),
    momentumEnvelope: envelopeSummary(v.momentumEnvelope),
    worstTorqueCapacityNm: Math.min(...Array.from(v.torqueEnvelope.faceOffsets)),
    worstMomentumCapacityNms: Math.min(...Array.from(v.momentumEnvelope.faceOffsets)),
  };
}

export function scenarioSummary(s: ResolvedScenario, file: Scenario): ScenarioSummary {
  return {
    name: s.name,
    description: s.description,
    vehicleName: s.vehicle.name,
    epochUtc: s.epoch.utc,
    epochUnixMs: s.epoch.unixMs,
    inertialFrame: 'EME2000',
    wheelCount: s.vehicle.wheels.length,
    initialQ: Float64Array.from(s.initial.qInertialFromBody),
    targets: s.targets.map((t) => ({
      label: t.label,
      form: t.form,
      q: Float64Array.from(t.qInertialFromBody),
      holdS: t.holdS,
      ...(t.pointingOnly
        ? {
            pointingOnly: {
              bodyAxis: Array.from(t.pointingOnly.bodyAxis),
              inertialDirection: Array.from(t.pointingOnly.inertialDirection),
            },
          }
        : {}),
    })),
    settleAngleRad: s.simulation.settleAngleRad,
    settleRateRadPerS: s.simulation.settleRateRadPerS,
    file,
  };
}
