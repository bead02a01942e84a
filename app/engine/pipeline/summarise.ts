/**
 * Stage 6 of the pipeline, summarise: a flown run → its metrics and Lyapunov-monitor flags (one
 * definition each, in metrics/), the comparison table with its best marks, and the summaries of
 * the vehicle, the certificates and the scenario that views and exports read.
 */
import { symmetricEigen3 } from '../math/mat3';
import { computeMetrics, type RunMetrics } from '../metrics/metrics';
import { lyapunovMonitor, type MonitorFlag } from '../metrics/monitor';
import type { ClosedLoopResult } from '../sim/closedLoop';
import type { RunMode, RunTrace, JumpEvent } from '../sim/types';
import type { ResolvedScenario } from '../scenario/resolve';
import type { Scenario } from '../scenario/schema';
import type { Zonotope } from '../wheels/envelope';
import { DEG_PER_RAD } from '../units';
import type {
  BestMarks,
  BuiltController,
  CertificateSummary,
  ComparisonRow,
  ControllerRun,
  EnvelopeSummary,
  ScenarioSummary,
  Vehicle,
  VehicleSummary,
} from './types';
import { certificateSummary } from './types';

/** Chatter is counted over sliding windows of this length (s); metrics.ts defines the measure. */
export const CHATTER_WINDOW_S = 10;

/** What the metrics need of the scenario and the vehicle. */
export interface MetricContext {
  settleAngleRad: number;
  settleRateRadPerS: number;
  maxTorqueNm: Float64Array;
  maxMomentumNms: Float64Array;
  /** Target attitude of each segment, 4 per segment. */
  targets: Float64Array;
}

/** Metrics of a flown run with the scenario's settle thresholds and the wheels' own limits. */
export function runMetrics(res: { trace: RunTrace; jumps: readonly JumpEvent[] }, m: MetricContext): RunMetrics {
  return computeMetrics(res.trace, res.jumps, {
    settleAngleRad: m.settleAngleRad,
    settleRateRadPerS: m.settleRateRadPerS,
    chatterWindowS: CHATTER_WINDOW_S,
    maxTorqueNm: m.maxTorqueNm,
    maxMomentumNms: m.maxMomentumNms,
    segmentTargets: m.targets,
  });
}

/** Lyapunov-monitor flags with the law's promised jump decrease (tolerance 1e-3 of max W). */
export function runMonitor(res: { trace: RunTrace; jumps: readonly JumpEvent[] }, c: BuiltController): MonitorFlag[] {
  return lyapunovMonitor(res.trace, res.jumps, { jumpDecrease: c.controller.jumpDecrease, relTol: 1e-3, absTol: 1e-12 });
}

export function metricContext(s: ResolvedScenario, v: Pick<Vehicle, 'wheels'>, targets: Float64Array): MetricContext {
  return {
    settleAngleRad: s.simulation.settleAngleRad,
    settleRateRadPerS: s.simulation.settleRateRadPerS,
    maxTorqueNm: v.wheels.maxTorqueNm,
    maxMomentumNms: v.wheels.maxMomentumNms,
    targets,
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
    metrics: runMetrics(res, m),
    monitor: withMonitor ? runMonitor(res, c) : [],
    gainNote: c.gainNote,
  };
}

export function comparisonRow(r: ControllerRun): ComparisonRow {
  const m = r.metrics;
  return {
    key: r.key,
    controllerId: r.controllerId,
    label: r.label,
    mode: r.mode,
    status: r.outcome.status,
    settleTimeS: m.settleTimeS,
    rotationTravelledDeg: m.rotationTravelledRad * DEG_PER_RAD,
    shortestRotationDeg: m.shortestRotationRad * DEG_PER_RAD,
    unwound: m.unwound,
    jumps: m.jumps,
    chatterPerS: m.chatterPerS,
    peakWheelTorqueFraction: m.peakWheelTorqueFraction,
    peakWheelMomentumFraction: m.peakWheelMomentumFraction,
    controlEffortNms: m.controlEffortNms,
    finalErrorDeg: m.finalErrorRad * DEG_PER_RAD,
    monitorFlags: r.monitor.length,
  };
}

/** Lowest value wins in each numeric column; settle time: unsettled rows never win. */
export function bestMarks(rows: readonly ComparisonRow[]): BestMarks {
  const cols: (keyof ComparisonRow)[] = [
    'settleTimeS',
    'rotationTravelledDeg',
    'jumps',
    'chatterPerS',
    'peakWheelTorqueFraction',
    'peakWheelMomentumFraction',
    'controlEffortNms',
    'finalErrorDeg',
    'monitorFlags',
  ];
  const best: BestMarks = {};
  for (const col of cols) {
    let bestKey: string | null = null;
    let bestVal = Infinity;
    let distinct = false;
    for (const r of rows) {
      const v = r[col];
      if (typeof v !== 'number' || !Number.isFinite(v)) continue;
      if (bestKey !== null && v !== bestVal) distinct = true;
      if (v < bestVal) {
        bestVal = v;
        bestKey = r.key;
      }
    }
    best[col] = rows.length > 1 && (distinct || col === 'settleTimeS') ? bestKey : null;
  }
  return best;
}

export function certificates(cs: readonly BuiltController[]): CertificateSummary[] {
  return cs.flatMap((c) => (c.controller.certificate ? [certificateSummary(c.id, c.controller.certificate)] : []));
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
    targets: s.targets.map((t) => ({ label: t.label, form: t.form, q: Float64Array.from(t.qInertialFromBody), holdS: t.holdS })),
    settleAngleRad: s.simulation.settleAngleRad,
    settleRateRadPerS: s.simulation.settleRateRadPerS,
    file,
  };
}
