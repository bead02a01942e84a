/**
 * The inverse of resolve: an SI scenario (resolve.ts) written back as a scenario file of the
 * current format, in display units. Wheels are written one entry each (layout "custom"),
 * attitudes as quaternions; resolve(validate(toScenarioFile(r))) gives r back (up to the
 * round-off of the unit conversions). Used to write any study case as a normal scenario file.
 */
import { lawDefinition } from '../control/registry';
import { gainsToFile } from '../control/lawSupport';
import type { ControllerParams, LawId } from '../control/params';
import type { LawDefinition, ParamsOf } from '../control/definition';
import { m3ToRows } from '../math/mat3';
import { ARCSEC_PER_RAD, DEG_PER_RAD, MILLI_PER_SI } from '../units';
import type { ResolvedController, ResolvedScenario } from './resolve';
import type { ControllerSpec, Scenario } from './schema';
import { SCENARIO_FORMAT, SCENARIO_VERSION } from './schema';
import { studyToFile } from './study';
import { orbitToFile, trackToFile, windowToFile } from './orbitResolve';
import { constraintsToFile } from './constraintResolve';
import { rollFreeTargetToFile } from './pointingOnly';

function lawFields<L extends LawId>(def: LawDefinition<L>, c: ControllerParams): Record<string, unknown> {
  return def.toFile(c as unknown as ParamsOf<L>) as Record<string, unknown>;
}

export function controllerToFile(c: ResolvedController): ControllerSpec {
  const fields = lawFields(lawDefinition(c.law), c);
  return {
    id: c.id,
    label: c.label,
    law: c.law,
    gains: gainsToFile(c.gains),
    ...fields,
    ...(c.requireCertificate === false ? { requireCertificate: false } : {}),
  } as ControllerSpec;
}

const deg3 = (v: ArrayLike<number>) => [v[0]! * DEG_PER_RAD, v[1]! * DEG_PER_RAD, v[2]! * DEG_PER_RAD];

export function toScenarioFile(r: ResolvedScenario): Scenario {
  const v = r.vehicle;
  const sim = r.simulation;
  const act = v.actuation;
  const out: Scenario = {
    format: SCENARIO_FORMAT,
    version: SCENARIO_VERSION,
    name: r.name,
    description: r.description,
    epochUtc: r.epoch.utc,
    vehicle: {
      name: v.name,
      inertiaKgm2: m3ToRows(v.inertiaKgm2),
      ...(v.modelInertiaKgm2 ? { modelInertiaKgm2: m3ToRows(v.modelInertiaKgm2) } : {}),
      wheels: {
        layout: 'custom',
        wheels: v.wheels.map((w) => ({
          axis: [w.axis[0]!, w.axis[1]!, w.axis[2]!],
          maxTorqueMNm: w.maxTorqueNm * MILLI_PER_SI,
          maxMomentumMNms: w.maxMomentumNms * MILLI_PER_SI,
          rotorInertiaKgm2: w.rotorInertiaKgm2,
        })),
      },
      ...(v.wheelFriction
        ? {
            wheelFriction: {
              viscousMNmPerRadPerS: v.wheelFriction.viscousNmPerRadPerS * MILLI_PER_SI,
              coulombMNm: v.wheelFriction.coulombNm * MILLI_PER_SI,
              ...(v.wheelFriction.compensatedFraction > 0 ? { compensatedFraction: v.wheelFriction.compensatedFraction } : {}),
            },
          }
        : {}),
      sensors: {
        attitudeNoiseArcsec: v.sensors.attitudeNoiseRad * ARCSEC_PER_RAD,
        rateNoiseDegPerS: v.sensors.rateNoiseRadPerS * DEG_PER_RAD,
        rateBiasDegPerS: deg3(v.sensors.rateBiasRadPerS),
        ...(v.sensors.boundedNoiseEta > 0 ? { boundedNoiseEta: v.sensors.boundedNoiseEta } : {}),
        ...(v.sensors.boundedNoiseMode === 'band-edge' ? { boundedNoiseMode: 'band-edge' as const } : {}),
        ...((v.sensors.antipodalNoiseRad ?? 0) > 0 ? { antipodalNoiseDeg: v.sensors.antipodalNoiseRad! * DEG_PER_RAD } : {}),
      },
      controlRateHz: v.controlRateHz,
      actuation: act.mode === 'quantized' ? { mode: 'quantized', torqueQuantumMNm: act.quantumNm * MILLI_PER_SI } : { mode: act.mode },
    },
    initial: {
      attitude: { quaternion: Array.from(r.initial.qInertialFromBody) },
      bodyRateDegPerS: deg3(r.initial.omegaBody),
      ...(r.initial.hWheelNms.some((h) => h !== 0) ? { wheelMomentumMNms: Array.from(r.initial.hWheelNms, (h) => h * MILLI_PER_SI) } : {}),
    },
    targets: r.targets.map((t) => ({
      ...(t.track && r.orbit
        ? { label: t.label, track: trackToFile(t.track, r.orbit.sites), holdS: t.holdS }
        : t.pointingOnly
          ? rollFreeTargetToFile(t.label, t.holdS, t.pointingOnly)
          : { label: t.label, attitude: { quaternion: Array.from(t.qInertialFromBody) }, holdS: t.holdS }),
      ...(t.window ? { window: windowToFile(t.window) } : {}),
    })),
    controllers: r.controllers.map(controllerToFile),
    planning: {
      torqueMargin: r.planning.torqueMargin,
      momentumMargin: r.planning.momentumMargin,
      slewRateLimitDegPerS: r.planning.slewRateLimitRadPerS * DEG_PER_RAD,
      profile: r.planning.profile,
    },
    simulation: {
      mode: sim.modes.length === 2 ? 'both' : sim.modes[0]!,
      timing: sim.timing,
      settleAngleDeg: sim.settleAngleRad * DEG_PER_RAD,
      settleRateDegPerS: sim.settleRateRadPerS * DEG_PER_RAD,
      tailS: sim.tailS,
      ...(sim.durationS !== null ? { durationS: sim.durationS } : {}),
      seed: sim.seed,
      rk4StepsPerSample: sim.rk4StepsPerSample,
      ...(sim.endWhenSettledForS > 0 ? { endWhenSettledForS: sim.endWhenSettledForS } : {}),
    },
    ...(r.keepOut.length
      ? {
          keepOut: r.keepOut.map((k) => ({
            label: k.label,
            bodyAxis: Array.from(k.bodyAxis),
            inertialDirection: Array.from(k.inertialDirection),
            halfAngleDeg: k.halfAngleRad * DEG_PER_RAD,
          })),
        }
      : {}),
    ...(r.constraints.length ? { constraints: constraintsToFile(r.constraints) } : {}),
    ...(r.study ? { study: studyToFile(r.study) } : {}),
    ...(r.orbit ? { orbit: orbitToFile(r.orbit) } : {}),
  };
  return out;
}
