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
import { DEG_PER_RAD, MILLI_PER_SI, RAD_PER_DEG, SI_PER_MILLI } from '../units';
import type { RunMode } from '../sim/types';

export type ActuationMode = 'hold' | 'pwm' | 'quantized';

export type AttitudeDispersion =
  | { mode: 'nominal' }
  | { mode: 'uniform' }
  | { mode: 'cone'; maxAngleRad: number }
  | { mode: 'near-reversal'; withinRad: number }
  /** Pointing-only first target: the pointed axis within withinRad of its antipode (study/pointingCase.ts). */
  | { mode: 'near-antipode'; withinRad: number };

export interface StudyDefinition {
  runs: number;
  seed: number;
  /** Controller ids to fly (null = every controller of the scenario). */
  controllers: string[] | null;
  durationS: number;
  mode: RunMode;
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
    /** Worst-case bounded noise ē on pointing-only targets, rad (absent or 0 = off). */
    antipodalNoiseRad?: number;
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
  if (d.initialAttitude?.mode === 'near-antipode' && s.targets[0]?.rollFree !== true)
    errors.push(
      issue(
        'study.dispersions.initialAttitude.mode',
        'needs-roll-free',
        'study.dispersions.initialAttitude.mode "near-antipode" places the pointed axis near the antipode of the first target’s direction: the first target must be pointing-only (targets[0].rollFree: true)',
      ),
    );
  if (errors.length > before) return null;

  const a = d.initialAttitude;
  const attitude: AttitudeDispersion = !a
    ? { mode: 'nominal' }
    : a.mode === 'uniform'
      ? { mode: 'uniform' }
      : a.mode === 'cone'
        ? { mode: 'cone', maxAngleRad: a.maxAngleDeg * RAD_PER_DEG }
        : { mode: a.mode, withinRad: a.withinDeg * RAD_PER_DEG };
  const quantum = d.torqueQuantumMNm ?? vehicleQuantum;
  return {
    runs: st.runs,
    seed: st.seed,
    controllers: st.controllers ? [...st.controllers] : null,
    durationS: st.durationS ?? DEFAULT_DURATION_S,
    mode: st.mode ?? 'step-target',
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
      ...((d.sensors?.antipodalNoiseDeg ?? 0) > 0 ? { antipodalNoiseRad: d.sensors!.antipodalNoiseDeg! * RAD_PER_DEG } : {}),
    },
    controlRateHz: d.controlRateHz ? [...d.controlRateHz] : null,
    actuation: d.actuation ? [...d.actuation] : null,
    torqueQuantumNm: quantum !== undefined ? quantum * SI_PER_MILLI : null,
  };
}

/** The file's study block of a definition (the inverse of resolveStudy; defaults written out). */
export function studyToFile(d: StudyDefinition): StudySpec {
  const a = d.attitude;
  const dispersions: NonNullable<StudySpec['dispersions']> = {};
  if (a.mode === 'uniform') dispersions.initialAttitude = { mode: 'uniform' };
  else if (a.mode === 'cone') dispersions.initialAttitude = { mode: 'cone', maxAngleDeg: a.maxAngleRad * DEG_PER_RAD };
  else if (a.mode === 'near-reversal' || a.mode === 'near-antipode')
    dispersions.initialAttitude = { mode: a.mode, withinDeg: a.withinRad * DEG_PER_RAD };
  if (d.rateSigmaRadPerS > 0) dispersions.initialRateDegPerS = d.rateSigmaRadPerS * DEG_PER_RAD;
  if (d.inertia.momentSigmaFraction > 0 || d.inertia.axisMisalignmentSigmaRad > 0)
    dispersions.inertia = {
      momentSigmaFraction: d.inertia.momentSigmaFraction,
      axisMisalignmentDeg: d.inertia.axisMisalignmentSigmaRad * DEG_PER_RAD,
    };
  const w = d.wheels;
  if (w.torqueDegradationMax > 0 || w.momentumDegradationMax > 0 || w.failOneWheelProbability > 0) dispersions.wheels = { ...w };
  const sn = d.sensors;
  if (
    sn.attitudeNoiseScale[0] !== 1 ||
    sn.attitudeNoiseScale[1] !== 1 ||
    sn.rateBiasSigmaRadPerS > 0 ||
    sn.adversarialEta > 0 ||
    (sn.antipodalNoiseRad ?? 0) > 0
  )
    dispersions.sensors = {
      attitudeNoiseScale: [sn.attitudeNoiseScale[0], sn.attitudeNoiseScale[1]],
      rateBiasDegPerS: sn.rateBiasSigmaRadPerS * DEG_PER_RAD,
      adversarialEta: sn.adversarialEta,
      ...((sn.antipodalNoiseRad ?? 0) > 0 ? { antipodalNoiseDeg: sn.antipodalNoiseRad! * DEG_PER_RAD } : {}),
    };
  if (d.controlRateHz) dispersions.controlRateHz = [...d.controlRateHz];
  if (d.actuation) dispersions.actuation = [...d.actuation];
  if (d.torqueQuantumNm !== null) dispersions.torqueQuantumMNm = d.torqueQuantumNm * MILLI_PER_SI;
  return {
    runs: d.runs,
    seed: d.seed,
    ...(d.controllers ? { controllers: [...d.controllers] } : {}),
    durationS: d.durationS,
    mode: d.mode,
    stopAfterSettledForS: d.stopAfterSettledForS,
    worstCases: d.worstCases,
    ...(Object.keys(dispersions).length ? { dispersions } : {}),
  };
}
