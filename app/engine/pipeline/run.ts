/**
 * runPipeline: one pass of design.md's data flow, shared by the CLI, the app's worker and the
 * robustness study. Synchronous and pure (no I/O); progress and cancellation via callbacks.
 */
import type { Issue, Result } from '../errors';
import { fail, ok } from '../errors';
import { loadScenario } from '../scenario/resolve';
import type { ResolvedScenario } from '../scenario/resolve';
import { planSequence } from '../plan/sequence';
import { evaluateReference } from '../plan/reference';
import type { SequencePlan } from '../plan/types';
import { envelopeCapacity } from '../wheels/envelope';
import { applyAxes } from '../wheels/array';
import { runClosedLoop, type ReferenceSource } from '../sim/closedLoop';
import { computeMetrics } from '../metrics/metrics';
import { lyapunovMonitor } from '../metrics/monitor';
import { symmetricEigen3 } from '../math/mat3';
import { buildControllers, buildVehicle, planLimits, type BuiltController, type VehicleModel } from './build';
import type {
  BestMarks,
  CertificateSummary,
  ComparisonRow,
  ControllerRun,
  LogicKind,
  PipelineOutput,
  PlanSummary,
  RunMode,
  VehicleSummary,
} from './types';
import { DEG_PER_RAD } from '../units';

export interface PipelineOptions {
  /** Run only these controller ids (default: all in the scenario). */
  controllers?: readonly string[];
  /** Override the scenario's simulation.mode. */
  modes?: readonly RunMode[];
  /** Called after each run: (done, total, label). */
  onProgress?: (done: number, total: number, label: string) => void;
  shouldStop?: () => boolean;
}

export interface Prepared {
  scenario: ResolvedScenario;
  vehicle: VehicleModel;
  plan: SequencePlan;
  controllers: BuiltController[];
  warnings: Issue[];
}

/** Validate, resolve, build the vehicle, plan, build the controllers. */
export function prepareScenario(json: unknown, only?: readonly string[]): Result<Prepared> {
  const loaded = loadScenario(json);
  if (!loaded.ok) return fail(loaded.errors, loaded.warnings);
  const s = loaded.value;
  const warnings: Issue[] = [...loaded.warnings];
  const veh = buildVehicle(s);
  if (!veh.ok) return fail(veh.errors, [...warnings, ...veh.warnings]);
  warnings.push(...veh.warnings);
  const v = veh.value;
  const ctrls = buildControllers(s, v, only);
  const hBody = applyAxes(new Float64Array(3), v.wheels, s.initial.hWheelNms);
  const plan = planSequence(
    {
      qStart: s.initial.qInertialFromBody,
      inertia: v.plant.Jperp,
      wheelMomentumBody: hBody,
      targets: s.targets.map((t) => ({ q: t.qInertialFromBody, holdS: t.holdS, label: t.label })),
    },
    planLimits(s, v),
  );
  const errors: Issue[] = [];
  if (!ctrls.ok) errors.push(...ctrls.errors);
  else warnings.push(...ctrls.warnings);
  if (!plan.ok)
    errors.push(
      ...plan.errors.map((e) => ({
        ...e,
        path: e.path.startsWith('targets') || e.path.startsWith('qStart') ? e.path : `planning.${e.path}`,
      })),
    );
  if (errors.length || !ctrls.ok || !plan.ok) return fail(errors, warnings);
  return ok({ scenario: s, vehicle: v, plan: plan.value, controllers: ctrls.value, warnings }, warnings);
}

/** Slew start times of the flyable timeline (where the reference changes segment). */
function slewStarts(plan: SequencePlan): Float64Array {
  return Float64Array.from(plan.timeline, (e) => e.slewStartS);
}

/** Profiled mode: the planned eigenaxis reference. */
export function profiledReference(plan: SequencePlan): ReferenceSource {
  return { at: (t, q, w, wd) => Math.max(0, evaluateReference(plan, t, q, w, wd)), switchTimes: slewStarts(plan) };
}

/**
 * Direct mode: the target of the active segment, at rest (no profile), switched at the planned
 * slew starts. Target quaternions are copied into one flat table up front, so a call allocates
 * nothing (it runs at every sample, and at every flow evaluation in the ideal mode).
 */
export function directReference(plan: SequencePlan, targets: Float64Array, qInitial: ArrayLike<number>): ReferenceSource {
  const starts = slewStarts(plan);
  const m = starts.length;
  const table = new Float64Array(4 * (m + 1)); // entry 0: the initial attitude, k + 1: segment k's target
  const segOf = new Int32Array(m + 1);
  for (let i = 0; i < 4; i++) table[i] = qInitial[i]!;
  for (let k = 0; k < m; k++) {
    const tg = plan.timeline[k]!.target;
    for (let i = 0; i < 4; i++) table[4 * (k + 1) + i] = targets[4 * tg + i]!;
    segOf[k + 1] = Math.max(0, tg);
  }
  return {
    switchTimes: starts,
    at: (t, q, w, wd) => {
      let k = 0;
      while (k < m && t >= starts[k]! - 1e-12) k++;
      const o = 4 * k;
      q[0] = table[o]!;
      q[1] = table[o + 1]!;
      q[2] = table[o + 2]!;
      q[3] = table[o + 3]!;
      w[0] = w[1] = w[2] = 0;
      wd[0] = wd[1] = wd[2] = 0;
      return segOf[k]!;
    },
  };
}

const LOGIC_KIND: Record<string, LogicKind> = {
  'quaternion-pd': 'none',
  'sign-switch': 'sign',
  eigenaxis: 'none',
  hysteretic: 'sign',
  synergistic: 'index',
};

/** Chatter is counted over sliding windows of this length (s); metrics.ts defines the measure. */
export const CHATTER_WINDOW_S = 10;

/** Metrics of a flown run with the scenario's settle thresholds and the wheels' own limits. */
export function runMetrics(
  res: { trace: ControllerRun['trace']; jumps: ControllerRun['jumps'] },
  s: ResolvedScenario,
  wheels: { maxTorqueNm: Float64Array; maxMomentumNms: Float64Array },
  targets: Float64Array,
) {
  return computeMetrics(res.trace, res.jumps, {
    settleAngleRad: s.simulation.settleAngleRad,
    settleRateRadPerS: s.simulation.settleRateRadPerS,
    chatterWindowS: CHATTER_WINDOW_S,
    maxTorqueNm: wheels.maxTorqueNm,
    maxMomentumNms: wheels.maxMomentumNms,
    segmentTargets: targets,
  });
}

/** Lyapunov-monitor flags with the law's promised jump decrease (tolerance 1e-3 of max W). */
export function runMonitor(res: { trace: ControllerRun['trace']; jumps: ControllerRun['jumps'] }, c: BuiltController) {
  return lyapunovMonitor(res.trace, res.jumps, { jumpDecrease: c.controller.jumpDecrease, relTol: 1e-3, absTol: 1e-12 });
}

export function runOne(p: Prepared, c: BuiltController, mode: RunMode, targets: Float64Array, shouldStop?: () => boolean): ControllerRun {
  const s = p.scenario;
  const v = p.vehicle;
  const reference = mode === 'profiled' ? profiledReference(p.plan) : directReference(p.plan, targets, s.initial.qInertialFromBody);
  const tEnd = Math.max(p.plan.totalS, 1) + s.simulation.tailS;
  const act = s.vehicle.actuation;
  const res = runClosedLoop({
    plant: v.plant,
    wheels: v.wheels,
    controller: c.controller,
    reference,
    q0: s.initial.qInertialFromBody,
    omega0: s.initial.omegaBody,
    hWheel0: s.initial.hWheelNms,
    tEnd,
    timing: s.simulation.timing,
    controlRateHz: s.vehicle.controlRateHz,
    rk4StepsPerSample: s.simulation.rk4StepsPerSample,
    sensors: {
      attitudeSigmaRad: s.vehicle.sensors.attitudeNoiseRad,
      rateSigmaRadPerS: s.vehicle.sensors.rateNoiseRadPerS,
      rateBiasRadPerS: s.vehicle.sensors.rateBiasRadPerS,
      adversarialEta: 0,
    },
    seed: s.simulation.seed,
    actuation: act.mode === 'quantized' ? { mode: 'quantized', quantumNm: act.torqueQuantumNm ?? 1e-5 } : { mode: act.mode },
    allocation: 'min-max',
    shouldStop,
  });
  const metrics = runMetrics(res, s, v.wheels, targets);
  const monitor = runMonitor(res, c);
  return {
    key: `${c.id}:${mode}`,
    controllerId: c.id,
    label: c.label,
    law: c.law,
    mode,
    logicKind: LOGIC_KIND[c.law] ?? 'none',
    trace: res.trace,
    jumps: res.jumps,
    outcome: res.outcome,
    metrics,
    monitor,
    gainNote: c.gainNote,
  };
}

export function runPipeline(json: unknown, opts: PipelineOptions = {}): Result<PipelineOutput> {
  const t0 = Date.now();
  const prep = prepareScenario(json, opts.controllers);
  if (!prep.ok) return fail(prep.errors, prep.warnings);
  const p = prep.value;
  const s = p.scenario;
  const targets = new Float64Array(4 * s.targets.length);
  s.targets.forEach((t, i) => targets.set(t.qInertialFromBody, 4 * i));
  const modes: RunMode[] = opts.modes ? [...opts.modes] : s.simulation.mode === 'both' ? ['profiled', 'direct'] : [s.simulation.mode];
  const runs: ControllerRun[] = [];
  const total = p.controllers.length * modes.length;
  for (const c of p.controllers) {
    for (const mode of modes) {
      if (opts.shouldStop?.()) break;
      runs.push(runOne(p, c, mode, targets, opts.shouldStop));
      opts.onProgress?.(runs.length, total, `${c.label} (${mode})`);
    }
  }
  const comparison = runs.map(comparisonRow);
  return ok(
    {
      vehicle: vehicleSummary(s, p.vehicle),
      plan: planSummary(p.plan, s),
      targets,
      initialQ: Float64Array.from(s.initial.qInertialFromBody),
      runs,
      comparison,
      best: bestMarks(comparison),
      certificates: certificates(p.controllers),
      warnings: p.warnings,
      elapsedMs: Date.now() - t0,
    },
    p.warnings,
  );
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

function certificates(cs: readonly BuiltController[]): CertificateSummary[] {
  return cs
    .filter((c) => c.controller.certificate)
    .map((c) => {
      const k = c.controller.certificate!;
      return {
        controllerId: c.id,
        admissible: k.admissible,
        deltaStar: k.deltaStar,
        delta: k.delta,
        margin: k.margin,
        diffeomorphismMargin: k.diffeomorphismMargin,
        message: k.summary,
      };
    });
}

function vehicleSummary(s: ResolvedScenario, v: VehicleModel): VehicleSummary {
  const eig = symmetricEigen3(v.inertia.J);
  const axes = [0, 1, 2].map((k) => [eig.vectors[3 * k], eig.vectors[3 * k + 1], eig.vectors[3 * k + 2]] as [number, number, number]);
  return {
    name: s.vehicle.name,
    inertiaKgm2: [0, 1, 2].map((r) => [0, 1, 2].map((c) => v.inertia.J[3 * c + r]!)),
    principalMomentsKgm2: [eig.values[0]!, eig.values[1]!, eig.values[2]!],
    principalAxes: axes,
    nWheels: v.wheels.n,
    wheelAxes: v.wheels.axes,
    maxTorqueNm: v.wheels.maxTorqueNm,
    maxMomentumNms: v.wheels.maxMomentumNms,
    torqueEnvelope: { vertices: v.torqueZ.vertices, triangles: v.torqueZ.triangles },
    momentumEnvelope: { vertices: v.momentumZ.vertices, triangles: v.momentumZ.triangles },
    worstTorqueCapacityNm: Math.min(...Array.from(v.torqueZ.faceOffsets)),
    worstMomentumCapacityNms: Math.min(...Array.from(v.momentumZ.faceOffsets)),
  };
}

/** Capacity helper for views (the engine's envelope along a unit body direction). */
export function capacityFunction(v: VehicleModel, which: 'torque' | 'momentum'): (d: Float64Array) => number {
  const z = which === 'torque' ? v.torqueZ : v.momentumZ;
  return (d) => envelopeCapacity(z, d);
}

export function planSummary(plan: SequencePlan, s: ResolvedScenario): PlanSummary {
  let tCursor = 0;
  const segments = plan.segments.map((seg, i) => {
    const tl = plan.timeline.find((e) => e.target === i);
    const label = s.targets[i]?.label ?? `target ${i + 1}`;
    const holdS = s.targets[i]?.holdS ?? 0;
    if (seg.feasible) {
      const tStart = tl ? tl.slewStartS : tCursor;
      const tEnd = tl ? tl.holdEndS : tStart + seg.durationS + holdS;
      tCursor = tEnd;
      return {
        index: i,
        label,
        tStart,
        slewTimeS: seg.durationS,
        holdS,
        tEnd,
        angleRad: seg.angleRad,
        axisBody: [seg.axisBody[0], seg.axisBody[1], seg.axisBody[2]] as [number, number, number],
        feasible: true,
        binding: seg.binding,
        peakRateRadPerS: seg.peakRateRadPerS,
        accelRadPerS2: seg.profile.accelRadPerS2,
        peakTorqueFraction: seg.peakTorqueFraction,
        peakMomentumFraction: seg.peakMomentumFraction,
        reason: seg.summary,
      };
    }
    return {
      index: i,
      label,
      tStart: tCursor,
      slewTimeS: 0,
      holdS,
      tEnd: tCursor,
      angleRad: seg.angleRad,
      axisBody: [seg.axisBody[0], seg.axisBody[1], seg.axisBody[2]] as [number, number, number],
      feasible: false,
      binding: 'none' as const,
      peakRateRadPerS: 0,
      accelRadPerS2: 0,
      peakTorqueFraction: 0,
      peakMomentumFraction: 0,
      reason: seg.reasons.map((r) => r.message).join('; '),
    };
  });
  return { feasible: plan.feasible, totalTimeS: plan.totalS, segments };
}
