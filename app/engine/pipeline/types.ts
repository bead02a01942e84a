/**
 * What one pass of the pipeline produces (design.md data flow):
 * scenario → validate → resolve targets → plan → simulate each controller → metrics → views/exports.
 * The CLI, the app's worker and the robustness study all call `runPipeline` (pipeline/run.ts) and
 * read this structure; nothing downstream recomputes physics.
 */
import type { Issue } from '../errors';
import type { JumpEvent, RunOutcome, RunTrace } from '../sim/types';
import type { RunMetrics } from '../metrics/metrics';
import type { MonitorFlag } from '../metrics/monitor';

export type RunMode = 'profiled' | 'direct';
export type LogicKind = 'none' | 'sign' | 'index';

export interface ControllerRun {
  /** `${controllerId}:${mode}` — unique within one pipeline output. */
  key: string;
  controllerId: string;
  label: string;
  law: string;
  mode: RunMode;
  logicKind: LogicKind;
  trace: RunTrace;
  jumps: JumpEvent[];
  outcome: RunOutcome;
  metrics: RunMetrics;
  monitor: MonitorFlag[];
  /** Torque the chosen gains imply, for the UI's "what these gains mean" read-out. */
  gainNote: string;
}

/** Mesh of a zonotope envelope for views: vertices 3V, outward triangles 3T. */
export interface EnvelopeMesh {
  vertices: Float64Array;
  triangles: Uint32Array;
}

export interface VehicleSummary {
  name: string;
  inertiaKgm2: number[][];
  principalMomentsKgm2: [number, number, number];
  /** Principal axes as rows (each a unit body vector), matching principalMomentsKgm2. */
  principalAxes: [number, number, number][];
  nWheels: number;
  wheelAxes: Float64Array;
  maxTorqueNm: Float64Array;
  maxMomentumNms: Float64Array;
  torqueEnvelope: EnvelopeMesh;
  momentumEnvelope: EnvelopeMesh;
  /** Smallest capacity over all body directions (the worst face), N·m and N·m·s. */
  worstTorqueCapacityNm: number;
  worstMomentumCapacityNms: number;
}

export type BindingLimit = 'torque' | 'momentum' | 'slew-rate' | 'none';

export interface SegmentSummary {
  index: number;
  label: string;
  tStart: number;
  slewTimeS: number;
  holdS: number;
  tEnd: number;
  angleRad: number;
  axisBody: [number, number, number];
  feasible: boolean;
  binding: BindingLimit;
  peakRateRadPerS: number;
  accelRadPerS2: number;
  peakTorqueFraction: number;
  peakMomentumFraction: number;
  /** Why the slew is infeasible, or what binds, in words. */
  reason: string;
}

export interface PlanSummary {
  feasible: boolean;
  totalTimeS: number;
  segments: SegmentSummary[];
}

export interface CertificateSummary {
  controllerId: string;
  admissible: boolean;
  deltaStar: number;
  delta: number;
  margin: number;
  diffeomorphismMargin: number;
  message: string;
}

export interface ComparisonRow {
  key: string;
  controllerId: string;
  label: string;
  mode: RunMode;
  status: string;
  settleTimeS: number | null;
  rotationTravelledDeg: number;
  shortestRotationDeg: number;
  unwound: boolean;
  jumps: number;
  chatterPerS: number;
  peakWheelTorqueFraction: number;
  peakWheelMomentumFraction: number;
  controlEffortNms: number;
  finalErrorDeg: number;
  monitorFlags: number;
}

/** Column → key of the best row (lowest value wins; null when not comparable). */
export type BestMarks = Partial<Record<keyof ComparisonRow, string | null>>;

export interface PipelineOutput {
  vehicle: VehicleSummary;
  plan: PlanSummary;
  /** Resolved target attitudes, 4 per segment ([x,y,z,w]), and the initial attitude. */
  targets: Float64Array;
  initialQ: Float64Array;
  runs: ControllerRun[];
  comparison: ComparisonRow[];
  best: BestMarks;
  certificates: CertificateSummary[];
  warnings: Issue[];
  /** Wall time of the pass, ms (for the UI's status line; not a test value). */
  elapsedMs: number;
}
