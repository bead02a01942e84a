/**
 * What the pipeline's stages hand each other and what one pass produces (DEVELOPERS.md has the
 * stage diagram):
 *   validate → resolve → build → plan → fly → summarise.
 * Everything in PipelineOutput is plain data (numbers, strings, typed arrays) that crosses a
 * Web Worker boundary; the views and the exports read it and never rebuild engine objects or
 * re-read the scenario file.
 */
import type { Issue } from '../errors';
import type { CertificateResult } from '../control/certificate';
import type { AttitudeController, DesignModel, LogicKind } from '../control/types';
import type { LawId } from '../control/params';
import type { Gyrostat } from '../body/gyrostat';
import type { InertiaInfo } from '../body/inertia';
import type { WheelArray } from '../wheels/array';
import type { Zonotope } from '../wheels/envelope';
import type { JumpEvent, RunMode, RunOutcome, RunTrace } from '../sim/types';
import type { RunMetrics } from '../metrics/metrics';
import type { MonitorFlag } from '../metrics/monitor';
import type { MetricInputs } from './metricInputs';
import type { KeepOutCone } from '../scenario/resolve';
import type { ConstraintInfo, ConstraintReport, RunConstraintReport } from './constraints';
import type { ConstrainedSegment } from './constrainedPlan';
import type { AttitudeForm, Scenario } from '../scenario/schema';
import type { TrackForm } from '../scenario/orbitSchema';
import type { OrbitExportInfo, OrbitOutput, WindowError } from './orbit';
import type { OrbitViewSamples } from '../orbit/viewSamples';

export type { RunMode } from '../sim/types';
export type { LogicKind } from '../control/types';

// ---------------------------------------------------------------------------------------------
// Stage 3 (build): engine objects, in this thread only.

/** The vehicle as the engine models it (truth plant, wheel array, envelopes) and as its controllers know it (design). */
export interface Vehicle {
  name: string;
  inertia: InertiaInfo;
  wheels: WheelArray;
  plant: Gyrostat;
  torqueEnvelope: Zonotope;
  momentumEnvelope: Zonotope;
  /** What a controller designed for this vehicle knows of it. */
  design: DesignModel;
  /** Fraction of the bearing friction model the wheel drives feed forward (0: none). */
  frictionFeedforward: number;
}

export interface BuiltController {
  id: string;
  label: string;
  law: LawId;
  logicKind: LogicKind;
  /** The law acts on the quaternion and picks a lift (control/definition.ts). */
  liftDependent: boolean;
  controller: AttitudeController;
  /** What the gains ask of the wheels, in words. */
  gainNote: string;
}

// ---------------------------------------------------------------------------------------------
// Stage 6 (summarise) and the output.

/** Whether a run met the pointing requirement (summarise.ts verdictOf), in a word and in a sentence. */
export interface RunVerdict {
  kind: 'settled' | 'unsettled' | 'failed';
  text: string;
}

export interface ControllerRun {
  /** `${controllerId}:${mode}`, unique within one pipeline output. */
  key: string;
  controllerId: string;
  label: string;
  law: LawId;
  mode: RunMode;
  logicKind: LogicKind;
  trace: RunTrace;
  jumps: JumpEvent[];
  /** How the simulation ended (it may run to its end without meeting the pointing requirement). */
  outcome: RunOutcome;
  /** Whether it met the pointing requirement. */
  verdict: RunVerdict;
  metrics: RunMetrics;
  monitor: MonitorFlag[];
  /** The run checked against the scenario's constraints (absent when it declares none). */
  constraints?: RunConstraintReport;
  /** Torque the chosen gains imply, for the UI's "what these gains mean" read-out. */
  gainNote: string;
  /** The settings the metrics and the monitor used (SI), for the JSON export. */
  metricInputs: MetricInputs;
  /** Orbit plans: the pointing error achieved while tracking each planned target (pipeline/orbit.ts). */
  windowErrors?: WindowError[];
  /**
   * What `trace` (and the constraint margin series) hold: absent or 'full', every sample flown;
   * 'display', the subset a long run keeps for the views (pipeline/displayTrace.ts). Exports refuse
   * a display trace: they fly the run again at full rate (pipeline/refly.ts).
   */
  traceKind?: 'full' | 'display';
  /** A display trace: what was flown and what was kept. */
  display?: DisplayTraceInfo;
}

/** How a display trace was made from its run's full trace (pipeline/displayTrace.ts). */
export interface DisplayTraceInfo {
  /** Samples the run recorded at full rate. */
  fullSamples: number;
  /** Stride of the regular grid of kept samples. */
  stride: number;
  /** Samples kept (= trace.n). */
  kept: number;
}

/** An envelope for views and capacity queries: mesh (vertices 3V, outward triangles 3T) and facet planes. */
export interface EnvelopeSummary {
  vertices: Float64Array;
  triangles: Uint32Array;
  /** 3F unit outward facet normals and F offsets (n·x = offset): envelopeCapacity reads these. */
  faceNormals: Float64Array;
  faceOffsets: Float64Array;
}

export interface VehicleSummary {
  name: string;
  inertiaKgm2: number[][];
  principalMomentsKgm2: [number, number, number];
  /** Principal axes as rows (each a unit body vector), matching principalMomentsKgm2. */
  principalAxes: [number, number, number][];
  nWheels: number;
  /** 3 per wheel, unit, body axes. */
  wheelAxes: Float64Array;
  /** Per-wheel torque and momentum limits, N·m and N·m·s. */
  maxTorqueNm: Float64Array;
  maxMomentumNms: Float64Array;
  torqueEnvelope: EnvelopeSummary;
  momentumEnvelope: EnvelopeSummary;
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
  /** Orbit plans: when tracking the target starts (the slew ends on its attitude and rate), s. */
  trackStartS?: number;
  /** A pointing-only target: what its reduced slew saves against the held-roll slew (rollFreePlan.ts). */
  rollFree?: RollFreeSaving;
}

/** A pointing-only segment's reduced slew against the full-attitude slew to the same pointing (same start, same planner). */
export interface RollFreeSaving {
  /** Pointed body axis (unit, body) and its direction (unit, inertial). */
  bodyAxis: [number, number, number];
  inertialDirection: [number, number, number];
  /** Reduced slew: angle (= the pointing error at the start), rad; time, s; peak wheel momentum, fraction of the envelope (null: infeasible). */
  angleRad: number;
  slewTimeS: number | null;
  peakMomentumFraction: number | null;
  /** The same target with its roll held (the form's full attitude). */
  heldRollAngleRad: number;
  heldRollFeasible: boolean;
  heldRollTimeS: number | null;
  heldRollPeakMomentumFraction: number | null;
  /** Held-roll minus reduced, signed (null when either is infeasible): s, and fraction of the envelope. */
  timeSavedS: number | null;
  peakMomentumFractionSaved: number | null;
  /** One sentence for tables. */
  summary: string;
}

export interface PlanSummary {
  feasible: boolean;
  totalTimeS: number;
  segments: SegmentSummary[];
  /** The planned reference checked against the scenario's constraints (absent when it declares none). */
  constraints?: ConstraintReport;
  /** Slews planned around the constraints, with their extra time (absent when none was needed). */
  constrainedSlews?: ConstrainedSegment[];
}

export interface CertificateSummary {
  controllerId: string;
  /** Where the family lives: SO(3) (full attitude) or the sphere S² (pointing-only); absent: SO(3). */
  space?: 'SO(3)' | 'S2';
  admissible: boolean;
  deltaStar: number;
  /** Numerical error bound of δ* (absent on older outputs: 0). */
  deltaStarTolerance?: number;
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
  /** settled / unsettled / failed, and the sentence that says why. */
  verdict: RunVerdict['kind'];
  status: string;
  settleTimeS: number | null;
  trackingErrorPeakDeg: number;
  trackingErrorRmsDeg: number;
  rotationTravelledDeg: number;
  shortestRotationDeg: number;
  unwound: boolean;
  jumps: number;
  chatterPerS: number;
  peakWheelTorqueFraction: number;
  peakWheelMomentumFraction: number;
  controlEffortNms: number;
  finalErrorDeg: number;
  /** Lyapunov-monitor violations (flow rises and weak jumps; planned reference steps not counted). */
  monitorViolations: number;
  /** Smallest attitude-constraint margin over the run, degrees (negative: violated); null when the scenario declares none. */
  constraintMarginDeg: number | null;
}

/**
 * Column → key of the best row: lowest value wins, among settled runs only, and only when one run
 * is strictly best (ties and single comparable rows get no mark); null when not comparable.
 */
export type BestMarks = Partial<Record<keyof ComparisonRow, string | null>>;

/** The scenario as exports and views need it: names, epoch, frame, targets, settle thresholds. */
export interface ScenarioSummary {
  name: string;
  description: string;
  vehicleName: string;
  /** t = 0, ISO 8601 UTC, and as ms since 1970 (POSIX). */
  epochUtc: string;
  epochUnixMs: number;
  /** The inertial frame every attitude is given in (CCSDS REF_FRAME_A). */
  inertialFrame: 'EME2000';
  wheelCount: number;
  initialQ: Float64Array;
  targets: {
    label: string;
    /** q: the fixed attitude, or for a moving (track) target the attitude at which tracking starts in the plan. */
    form: AttitudeForm | TrackForm;
    q: Float64Array;
    holdS: number;
    /** A pointing-only (roll-free) target: its pointed body axis and inertial direction (unit). */
    pointingOnly?: { bodyAxis: number[]; inertialDirection: number[] };
  }[];
  settleAngleRad: number;
  settleRateRadPerS: number;
  /** The validated scenario file in the current format, kept for provenance (the JSON export copies it). */
  file: Scenario;
  /** Orbit scenarios: the frame, element set, sites, planned windows and eclipses the exports name (pipeline/orbit.ts). */
  orbit?: OrbitExportInfo | null;
}

export interface PipelineOutput {
  scenario: ScenarioSummary;
  vehicle: VehicleSummary;
  plan: PlanSummary;
  /** Resolved target attitudes, 4 per segment ([x,y,z,w]), and the initial attitude. */
  targets: Float64Array;
  initialQ: Float64Array;
  runs: ControllerRun[];
  comparison: ComparisonRow[];
  best: BestMarks;
  certificates: CertificateSummary[];
  /** Keep-out cones, SI (unit axes), as the scenario declares them. */
  keepOut: KeepOutCone[];
  /** Every constraint checked (keepOut cones first, then the constraints list); absent or empty when none. */
  constraints?: ConstraintInfo[];
  warnings: Issue[];
  /** Wall time of the pass, ms (for the UI's status line; not a test value). */
  elapsedMs: number;
  /** Scenarios with an orbit block: the orbit, sky, sites with their passes, eclipses and planned windows (pipeline/orbit.ts). */
  orbit?: OrbitOutput | null;
  /** Orbit scenarios: the geometry the 3D orbit view interpolates per frame, sampled once per pass (orbit/viewSamples.ts). */
  orbitView?: OrbitViewSamples | null;
}

/** A certificate as a summary row (an S² certificate has the same fields). */
export function certificateSummary(
  controllerId: string,
  k: Pick<CertificateResult, 'admissible' | 'deltaStar' | 'deltaStarTolerance' | 'delta' | 'margin' | 'diffeomorphismMargin' | 'summary'>,
  space: 'SO(3)' | 'S2' = 'SO(3)',
): CertificateSummary {
  return {
    controllerId,
    ...(space === 'S2' ? { space, deltaStarTolerance: k.deltaStarTolerance } : {}),
    admissible: k.admissible,
    deltaStar: k.deltaStar,
    delta: k.delta,
    margin: k.margin,
    diffeomorphismMargin: k.diffeomorphismMargin,
    message: k.summary,
  };
}
