/**
 * The scenario file's "study" block (schema.ts, StudySchema) → the engine's SI study definition,
 * with defaults applied and the cross-field rules checked (controller ids exist, [min, max] in
 * order, a torque quantum for quantized cases). Every problem is reported with its path.
 *
 * A file without a study block gets `defaultStudySpec` (100 cases, the scenario's seed, nothing
 * dispersed but the per-case noise realisation), so `slewsmith study` works on any scenario.
 */
import type { Issue } from '../errors';
import { issue } from '../errors';
import type { Scenario, StudySpec } from './schema';
import { RAD_PER_DEG } from '../units';

export type ActuationMode = 'hold' | 'pwm' | 'quantized';

export type AttitudeDispersion =
  { mode: 'nominal' } | { mode: 'uniform' } | { mode: 'cone'; maxAngleRad: number } | { mode: 'near-reversal'; withinRad: number };

export interface StudyDefinition {
  runs: number;
  seed: number;
  /** Controller ids to fly (null = every controller of the scenario). */
  controllers: string[] | null;
  durationS: number;
  mode: 'direct' | 'profiled';
  /** Early stop once settled this long, s (0 = off). */
  stopAfterSettledForS: number;
  worstCases: number;
  attitude: AttitudeDispersion;
  /** 1σ per axis, rad/s. */
  rateSigmaRadPerS: number;
  inertia: { momentSigmaFraction: number; axisMisalignmentSigmaRad: number };
  wheels: { torqueDegradationMax: number; momentumDegradationMax: number; failOneWheelProbability: number };
  sensors: {
    /** Factor on the vehicle's attitude noise, uniform in [min, max]. */
    attitudeNoiseScale: [number, number];
    rateBiasSigmaRadPerS: number;
    adversarialEta: number;
  };
  /** Rates to pick from (null = the vehicle's). */
  controlRateHz: number[] | null;
  /** Modes to pick from (null = the vehicle's). */
  actuation: ActuationMode[] | null;
  /** Quantum for quantized cases, N·m (the vehicle's when it has one). */
  torqueQuantumNm: number | null;
}

/** Defaults: the study block that a file without one is run with. */
export function defaultStudySpec(s: Pick<Scenario, 'simulation'>): StudySpec {
  return { runs: 100, seed: s.simulation.seed };
}

export const DEFAULT_DURATION_S = 600;
export const DEFAULT_SETTLED_FOR_S = 20;
export const DEFAULT_WORST_CASES = 5;

/**
 * Resolve a structurally valid study block against its (valid) scenario. Cross-field problems
 * go to `errors` with paths under `study.`; returns null when there is any.
 */
export function resolveStudy(st: StudySpec, s: Scenario, errors: Issue[], warnings: Issue[]): StudyDefinition | null {
  const before = errors.length;
  const ids = s.controllers.map((c) => c.id);
  st.controllers?.forEach((id, i) => {
    if (!ids.includes(id))
      errors.push(
        issue(
          `study.controllers[${i}]`,
          'unknown-id',
          `study.controllers[${i}] "${id}" is not a controller of this scenario (have: ${ids.join(', ')})`,
        ),
      );
    else if (st.controllers!.indexOf(id) !== i)
      errors.push(issue(`study.controllers[${i}]`, 'unique', `study.controllers[${i}] "${id}" is listed twice`));
  });
  const d = st.dispersions ?? {};
  const scale = d.sensors?.attitudeNoiseScale;
  if (scale && !(scale[0]! <= scale[1]!)) {
    errors.push(
      issue(
        'study.dispersions.sensors.attitudeNoiseScale',
        'min-max',
        `study.dispersions.sensors.attitudeNoiseScale must be [min, max] with min ≤ max (got [${scale[0]}, ${scale[1]}])`,
      ),
    );
  }
  const vehicleQuantum = s.vehicle.actuation.torqueQuantumMNm;
  if (d.actuation?.includes('quantized') && vehicleQuantum === undefined && d.torqueQuantumMNm === undefined) {
    errors.push(
      issue(
        'study.dispersions.torqueQuantumMNm',
        'required-for-mode',
        'study.dispersions.torqueQuantumMNm is required when study.dispersions.actuation lists "quantized" and vehicle.actuation has no torqueQuantumMNm',
      ),
    );
  }
  if (d.wheels?.failOneWheelProbability && s.vehicle.wheels.layout === 'triad') {
    warnings.push(
      issue(
        'study.dispersions.wheels.failOneWheelProbability',
        'unflyable',
        'a triad that loses a wheel cannot produce torque about every axis: every such case is reported as unflyable',
      ),
    );
  }
  const sigma = s.vehicle.sensors.attitudeNoiseArcsec;
  if (scale && sigma === 0 && scale[1]! > 0) {
    warnings.push(
      issue(
        'study.dispersions.sensors.attitudeNoiseScale',
        'no-effect',
        'vehicle.sensors.attitudeNoiseArcsec is 0, so scaling it disperses nothing',
      ),
    );
  }
  if (errors.length > before) return null;

  const a = d.initialAttitude;
  const attitude: AttitudeDispersion = !a
    ? { mode: 'nominal' }
    : a.mode === 'uniform'
      ? { mode: 'uniform' }
      : a.mode === 'cone'
        ? { mode: 'cone', maxAngleRad: a.maxAngleDeg * RAD_PER_DEG }
        : { mode: 'near-reversal', withinRad: a.withinDeg * RAD_PER_DEG };
  const quantum = d.torqueQuantumMNm ?? vehicleQuantum;
  return {
    runs: st.runs,
    seed: st.seed,
    controllers: st.controllers ? [...st.controllers] : null,
    durationS: st.durationS ?? DEFAULT_DURATION_S,
    mode: st.mode ?? 'direct',
    stopAfterSettledForS: st.stopAfterSettledForS ?? DEFAULT_SETTLED_FOR_S,
    worstCases: st.worstCases ?? DEFAULT_WORST_CASES,
    attitude,
    rateSigmaRadPerS: (d.initialRateDegPerS ?? 0) * RAD_PER_DEG,
    inertia: {
      momentSigmaFraction: d.inertia?.momentSigmaFraction ?? 0,
      axisMisalignmentSigmaRad: (d.inertia?.axisMisalignmentDeg ?? 0) * RAD_PER_DEG,
    },
    wheels: {
      torqueDegradationMax: d.wheels?.torqueDegradationMax ?? 0,
      momentumDegradationMax: d.wheels?.momentumDegradationMax ?? 0,
      failOneWheelProbability: d.wheels?.failOneWheelProbability ?? 0,
    },
    sensors: {
      attitudeNoiseScale: scale ? [scale[0]!, scale[1]!] : [1, 1],
      rateBiasSigmaRadPerS: (d.sensors?.rateBiasDegPerS ?? 0) * RAD_PER_DEG,
      adversarialEta: d.sensors?.adversarialEta ?? 0,
    },
    controlRateHz: d.controlRateHz ? [...d.controlRateHz] : null,
    actuation: d.actuation ? [...d.actuation] : null,
    torqueQuantumNm: quantum !== undefined ? quantum * 1e-3 : null,
  };
}
