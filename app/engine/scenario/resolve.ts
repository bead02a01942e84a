/**
 * Stage 2 of the pipeline, resolve: a validated scenario file (display units) → the engine's SI
 * view. Every attitude becomes a unit quaternion qInertialFromBody ([x, y, z, w]); wheel presets
 * are expanded into one entry per wheel (axis and limits), so the limits travel as numbers per
 * wheel from here to the envelopes, the exports and the views; each controller becomes its law's
 * typed parameters (control/laws/<law>/definition.ts).
 *
 * Resolve never validates: its input passed validateScenario (stage 1). Inconsistent input here
 * is a programming error and throws EngineInputError.
 *
 * Conversions: deg → rad, deg/s → rad/s, arcsec → rad, mN·m → N·m, mN·m·s → N·m·s,
 * mN·m per rad/s → N·m·s/rad (units.ts). Matrices are column-major Float64Array(9) (math/mat3.ts).
 */
import type { Issue, Result } from '../errors';
import { EngineInputError, fail } from '../errors';
import type { Mat3, Vec3 } from '../math/mat3';
import { m3FromRows, v3Create } from '../math/mat3';
import type { Quat } from '../math/rotation';
import { qCreate } from '../math/rotation';
import type { ControllerParams } from '../control/params';
import { resolveLawFields } from '../control/registry';
import { resolveGains } from '../control/lawSupport';
import type { WheelSpec } from '../wheels/array';
import { orthogonalTriad, pyramid } from '../wheels/presets';
import type { Actuation, RunMode } from '../sim/types';
import { RAD_PER_ARCSEC, RAD_PER_DEG, SI_PER_MILLI } from '../units';
import { attitudeForm, resolveAttitude } from './attitude';
import { resolveTargetAttitude, type PointingOnlyTarget } from './pointingOnly';
import type { AttitudeForm, AttitudeSpec, Scenario, WheelsSpec } from './schema';
import { resolveStudy, type StudyDefinition } from './study';
import { parseIsoUtcMs } from './utc';
import {
  resolveOrbit,
  resolveTrack,
  resolveWindow,
  trackForm,
  type ResolvedOrbit,
  type ResolvedTrack,
  type ResolvedWindow,
} from './orbitResolve';
import type { TrackForm } from './orbitSchema';
import type { ConstraintSpec } from '../constraints/directions';
import { resolveConstraints } from './constraintResolve';

export type WheelLayout = WheelsSpec['layout'];

/** A controller of the scenario: its id and its law's typed parameters (SI). */
export type ResolvedController = ControllerParams & { id: string };

export interface ResolvedTarget {
  label: string;
  /** How the file gave it: an attitude form, or the track form of a moving target. */
  form: AttitudeForm | TrackForm;
  /**
   * The fixed attitude. For a moving (track) target all four components are NaN: its attitude
   * moves, and the pipeline's plan gives the attitude at which tracking starts (Prepared.targets).
   */
  qInertialFromBody: Quat;
  holdS: number;
  /** A moving target from the orbit (orbitResolve.ts), or null for a fixed attitude. */
  track?: ResolvedTrack | null;
  /** When the target is due (orbitResolve.ts), or null: right after the previous hold. */
  window?: ResolvedWindow | null;
  /** Roll-free target (pointingOnly.ts): its axis and direction; qInertialFromBody is then the reduced target. */
  pointingOnly?: PointingOnlyTarget;
}

export interface KeepOutCone {
  label: string;
  /** Unit body axis that must stay out of the cone. */
  bodyAxis: Vec3;
  /** Unit cone axis, inertial frame. */
  inertialDirection: Vec3;
  halfAngleRad: number;
}

export interface ResolvedVehicle {
  name: string;
  /** The true inertia the simulation flies. */
  inertiaKgm2: Mat3;
  /** The inertia controllers and the planner believe (null: the true one). */
  modelInertiaKgm2: Mat3 | null;
  /** How the file described the array (the wheels below are always one entry per wheel). */
  wheelLayout: WheelLayout;
  /** One entry per wheel, in the file's order: unit-length axis (body), limits, rotor inertia (SI). */
  wheels: WheelSpec[];
  /** Bearing friction of every wheel, and the fraction of it the wheel drives cancel. */
  wheelFriction: { viscousNmPerRadPerS: number; coulombNm: number; compensatedFraction: number } | null;
  sensors: {
    attitudeNoiseRad: number;
    rateNoiseRadPerS: number;
    rateBiasRadPerS: Vec3;
    boundedNoiseEta: number;
    /** How the worst-case noise acts inside |η| < ē (sim/sensors.ts). */
    boundedNoiseMode: 'reflect' | 'band-edge';
    /** Worst-case bounded noise ē on pointing-only targets, rad (absent or 0: off). */
    antipodalNoiseRad?: number;
  };
  controlRateHz: number;
  actuation: Actuation;
}

export interface ResolvedScenario {
  name: string;
  description: string;
  /** t = 0: the file's ISO 8601 UTC string and ms since 1970-01-01T00:00:00Z (POSIX). */
  epoch: { utc: string; unixMs: number };
  vehicle: ResolvedVehicle;
  initial: { form: AttitudeForm; qInertialFromBody: Quat; omegaBody: Vec3; hWheelNms: Float64Array };
  targets: ResolvedTarget[];
  controllers: ResolvedController[];
  planning: {
    torqueMargin: number;
    momentumMargin: number;
    slewRateLimitRadPerS: number;
    profile: 'bang-bang' | 'bang-coast-bang';
  };
  simulation: {
    /** The ways every controller flies, in order. */
    modes: RunMode[];
    timing: 'sampled' | 'continuous-ideal';
    settleAngleRad: number;
    settleRateRadPerS: number;
    tailS: number;
    /** Total simulated time, s, when the file fixes it (else plan end + tailS). */
    durationS: number | null;
    seed: number;
    rk4StepsPerSample: number;
    /** End a step-target run once settled this long, s (0: fly to the end). */
    endWhenSettledForS: number;
  };
  keepOut: KeepOutCone[];
  /** The `constraints` list, SI (constraintResolve.ts); the keepOut cones are not repeated here. */
  constraints: ConstraintSpec[];
  /** The robustness study block, SI with defaults (study.ts); null when the file has none. */
  study: StudyDefinition | null;
  /** The orbit, its sites and horizon (orbitResolve.ts); absent or null when the file has no orbit block. */
  orbit?: ResolvedOrbit | null;
}

function unit3(v: readonly number[]): Vec3 {
  const n = Math.hypot(v[0]!, v[1]!, v[2]!);
  if (n > 1e-300 && Number.isFinite(n)) return v3Create(v[0]! / n, v[1]! / n, v[2]! / n);
  // Extreme lengths (three components near 1.8e308 have an infinite length; denormal ones lose
  // their digits): scaled by the largest component first.
  const m = Math.max(Math.abs(v[0]!), Math.abs(v[1]!), Math.abs(v[2]!));
  if (!(m > 0) || !Number.isFinite(m)) throw new EngineInputError([{ path: '', rule: 'non-zero', message: 'resolve: zero vector' }]);
  const x = v[0]! / m,
    y = v[1]! / m,
    z = v[2]! / m;
  const h = Math.hypot(x, y, z);
  return v3Create(x / h, y / h, z / h);
}

function scaled3(v: readonly number[], k: number): Vec3 {
  return v3Create(v[0]! * k, v[1]! * k, v[2]! * k);
}

/** The wheels of a file entry, one spec per wheel, SI (axes unit length). */
export function wheelSpecsOf(w: WheelsSpec): WheelSpec[] {
  if (w.layout === 'pyramid')
    return pyramid({
      count: w.count,
      cantAngleRad: w.cantAngleDeg * RAD_PER_DEG,
      azimuthOffsetRad: w.azimuthOffsetDeg * RAD_PER_DEG,
      maxTorqueNm: w.maxTorqueMNm * SI_PER_MILLI,
      maxMomentumNms: w.maxMomentumMNms * SI_PER_MILLI,
      rotorInertiaKgm2: w.rotorInertiaKgm2,
    });
  if (w.layout === 'triad')
    return orthogonalTriad({
      maxTorqueNm: w.maxTorqueMNm * SI_PER_MILLI,
      maxMomentumNms: w.maxMomentumMNms * SI_PER_MILLI,
      rotorInertiaKgm2: w.rotorInertiaKgm2,
    });
  return w.wheels.map((x) => ({
    axis: Array.from(unit3(x.axis)),
    maxTorqueNm: x.maxTorqueMNm * SI_PER_MILLI,
    maxMomentumNms: x.maxMomentumMNms * SI_PER_MILLI,
    rotorInertiaKgm2: x.rotorInertiaKgm2,
  }));
}

/** An attitude that validation accepted; throws when it does not resolve (programming error). */
function attitudeOf(spec: AttitudeSpec, previous: Quat | null, path: string, isInitial = false): Quat {
  const q = qCreate();
  const errors: Issue[] = [];
  if (!resolveAttitude(q, spec, previous, path, errors, [], isInitial)) throw new EngineInputError(errors);
  return q;
}

export function resolveController(c: Scenario['controllers'][number]): ResolvedController {
  return {
    id: c.id,
    label: c.label,
    gains: resolveGains(c.gains),
    ...resolveLawFields(c),
    ...('requireCertificate' in c && c.requireCertificate === false ? { requireCertificate: false } : {}),
  };
}

function resolveVehicle(v: Scenario['vehicle']): ResolvedVehicle {
  return {
    name: v.name,
    inertiaKgm2: m3FromRows(v.inertiaKgm2),
    modelInertiaKgm2: v.modelInertiaKgm2 ? m3FromRows(v.modelInertiaKgm2) : null,
    wheelLayout: v.wheels.layout,
    wheels: wheelSpecsOf(v.wheels),
    wheelFriction: v.wheelFriction
      ? {
          viscousNmPerRadPerS: v.wheelFriction.viscousMNmPerRadPerS * SI_PER_MILLI,
          coulombNm: v.wheelFriction.coulombMNm * SI_PER_MILLI,
          compensatedFraction: v.wheelFriction.compensatedFraction ?? 0,
        }
      : null,
    sensors: {
      attitudeNoiseRad: v.sensors.attitudeNoiseArcsec * RAD_PER_ARCSEC,
      rateNoiseRadPerS: v.sensors.rateNoiseDegPerS * RAD_PER_DEG,
      rateBiasRadPerS: scaled3(v.sensors.rateBiasDegPerS, RAD_PER_DEG),
      boundedNoiseEta: v.sensors.boundedNoiseEta ?? 0,
      boundedNoiseMode: v.sensors.boundedNoiseMode ?? 'reflect',
      antipodalNoiseRad: (v.sensors.antipodalNoiseDeg ?? 0) * RAD_PER_DEG,
    },
    controlRateHz: v.controlRateHz,
    actuation:
      v.actuation.mode === 'quantized'
        ? { mode: 'quantized', quantumNm: v.actuation.torqueQuantumMNm! * SI_PER_MILLI }
        : { mode: v.actuation.mode },
  };
}

/** Stage 2: the SI view of a scenario that passed validateScenario. */
export function resolveScenario(s: Scenario): ResolvedScenario {
  const epochUnixMs = parseIsoUtcMs(s.epochUtc);
  if (epochUnixMs === null) throw new EngineInputError([{ path: 'epochUtc', rule: 'calendar', message: 'resolve: epoch not validated' }]);
  const qInit = attitudeOf(s.initial.attitude, null, 'initial.attitude', true);
  const orbit = s.orbit ? resolveOrbit(s.orbit, s.epochUtc) : null;
  let previous: Quat | null = qInit;
  const targets: ResolvedTarget[] = s.targets.map((t, i) => {
    const window = t.window && orbit ? resolveWindow(t.window, orbit.epochTaiS, `targets[${i}].window`) : null;
    if (t.track && orbit) {
      previous = null;
      const q = Float64Array.of(NaN, NaN, NaN, NaN);
      const track = resolveTrack(t.track, orbit.sites, `targets[${i}].track`);
      return { label: t.label, form: trackForm(t.track), qInertialFromBody: q, holdS: t.holdS, track, window };
    }
    const q = qCreate();
    const errors: Issue[] = [];
    const pointingOnly = resolveTargetAttitude(q, t.attitude!, t.rollFree === true, previous, i, errors, []);
    if (pointingOnly === false) throw new EngineInputError(errors);
    previous = q;
    return {
      label: t.label,
      form: attitudeForm(t.attitude!),
      qInertialFromBody: q,
      holdS: t.holdS,
      track: null,
      window,
      ...(pointingOnly ? { pointingOnly } : {}),
    };
  });
  const vehicle = resolveVehicle(s.vehicle);
  const h0 = new Float64Array(vehicle.wheels.length);
  s.initial.wheelMomentumMNms?.forEach((h, i) => (h0[i] = h * SI_PER_MILLI));
  const errors: Issue[] = [];
  const study = s.study ? resolveStudy(s.study, s, errors, []) : null;
  if (errors.length) throw new EngineInputError(errors);
  const mode = s.simulation.mode;
  return {
    name: s.name,
    description: s.description,
    epoch: { utc: s.epochUtc, unixMs: epochUnixMs },
    vehicle,
    initial: {
      form: attitudeForm(s.initial.attitude),
      qInertialFromBody: qInit,
      omegaBody: scaled3(s.initial.bodyRateDegPerS, RAD_PER_DEG),
      hWheelNms: h0,
    },
    targets,
    controllers: s.controllers.map(resolveController),
    planning: {
      torqueMargin: s.planning.torqueMargin,
      momentumMargin: s.planning.momentumMargin,
      slewRateLimitRadPerS: s.planning.slewRateLimitDegPerS * RAD_PER_DEG,
      profile: s.planning.profile,
    },
    simulation: {
      modes: mode === 'both' ? ['follow-plan', 'step-target'] : [mode],
      timing: s.simulation.timing,
      settleAngleRad: s.simulation.settleAngleDeg * RAD_PER_DEG,
      settleRateRadPerS: s.simulation.settleRateDegPerS * RAD_PER_DEG,
      tailS: s.simulation.tailS,
      durationS: s.simulation.durationS ?? null,
      seed: s.simulation.seed,
      rk4StepsPerSample: s.simulation.rk4StepsPerSample,
      endWhenSettledForS: s.simulation.endWhenSettledForS ?? 0,
    },
    keepOut: (s.keepOut ?? []).map((k) => ({
      label: k.label,
      bodyAxis: unit3(k.bodyAxis ?? [0, 0, 1]),
      inertialDirection: unit3(k.inertialDirection),
      halfAngleRad: k.halfAngleDeg * RAD_PER_DEG,
    })),
    constraints: resolveConstraints(s.constraints),
    study,
    orbit,
  };
}

/** Failing result of a load, typed for callers that return other values. */
export function loadFailure<T>(r: Extract<Result<unknown>, { ok: false }>): Result<T> {
  return fail(r.errors, r.warnings);
}
