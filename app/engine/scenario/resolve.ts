/**
 * resolveScenario: a validated scenario file (display units) → the engine's SI view, with every
 * attitude resolved to a unit quaternion qInertialFromBody ([x, y, z, w], Float64Array(4)).
 *
 * Conversions: deg → rad, deg/s → rad/s, arcsec → rad, mN·m → N·m, mN·m·s → N·m·s,
 * mN·m per rad/s → N·m·s/rad. Matrices are column-major Float64Array(9) (math/mat3.ts).
 * Wheel geometry is NOT expanded here: the wheels module builds the axis matrix from the preset.
 */
import type { Issue, Result } from '../errors';
import { fail, ok } from '../errors';
import type { Mat3, Vec3 } from '../math/mat3';
import { m3Create, m3FromRows, v3Create } from '../math/mat3';
import type { Quat } from '../math/rotation';
import { qCreate } from '../math/rotation';
import { attitudeForm, resolveAttitude } from './attitude';
import type { AttitudeForm, ControlLaw, Scenario } from './schema';
import { validateScenario, wheelCount } from './validate';
import { parseIsoUtcMs } from './utc';
import { resolveStudy, type StudyDefinition } from './study';
import { RAD_PER_ARCSEC, RAD_PER_DEG, SI_PER_MILLI } from '../units';

export type ResolvedWheels =
  | {
      layout: 'pyramid';
      count: 4;
      cantAngleRad: number;
      azimuthOffsetRad: number;
      maxTorqueNm: number;
      maxMomentumNms: number;
      rotorInertiaKgm2: number;
    }
  | { layout: 'triad'; count: 3; maxTorqueNm: number; maxMomentumNms: number; rotorInertiaKgm2: number }
  | {
      layout: 'custom';
      count: number;
      /** Unit spin axes (body), limits per wheel. */
      wheels: { axis: Vec3; maxTorqueNm: number; maxMomentumNms: number; rotorInertiaKgm2: number }[];
    };

export type ResolvedGains =
  { form: 'kp-kd'; kp: number; kd: number } | { form: 'bandwidth'; bandwidthRadPerS: number; dampingRatio: number };

interface ControllerCommon {
  id: string;
  label: string;
  gains: ResolvedGains;
}

export type ResolvedController =
  | (ControllerCommon & { law: 'quaternion-pd' | 'sign-switch' })
  | (ControllerCommon & { law: 'eigenaxis'; maxRateRadPerS: number })
  | (ControllerCommon & { law: 'hysteretic'; hysteresis: number })
  | (ControllerCommon & {
      law: 'synergistic';
      /** Eigenvalues λ of A (dimensionless). */
      potentialWeights: Vec3;
      /** Unit eigenvectors of A as COLUMNS (column-major); identity by default. */
      potentialAxes: Mat3;
      /** A = V diag(λ) Vᵀ, column-major. */
      potentialMatrix: Mat3;
      warpGain: number;
      /** Unit warping directions u_q, one per potential of the family. */
      warpDirections: Vec3[];
      hysteresis: number;
    });

export interface ResolvedTarget {
  label: string;
  /** How the file gave it. */
  form: AttitudeForm;
  qInertialFromBody: Quat;
  holdS: number;
}

export interface ResolvedScenario {
  /** The validated file as read (display units), for exports and the UI. */
  source: Scenario;
  name: string;
  description: string;
  epochUtc: string;
  /** t = 0 in ms since 1970-01-01T00:00:00Z (POSIX, no leap seconds). */
  epochUnixMs: number;
  vehicle: {
    name: string;
    inertiaKgm2: Mat3;
    wheels: ResolvedWheels;
    wheelCount: number;
    wheelFriction: { viscousNmPerRadPerS: number; coulombNm: number } | null;
    sensors: { attitudeNoiseRad: number; rateNoiseRadPerS: number; rateBiasRadPerS: Vec3 };
    controlRateHz: number;
    controlPeriodS: number;
    actuation: { mode: 'hold' | 'pwm' | 'quantized'; torqueQuantumNm: number | null };
  };
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
    mode: 'profiled' | 'direct' | 'both';
    timing: 'sampled' | 'continuous-ideal';
    settleAngleRad: number;
    settleRateRadPerS: number;
    tailS: number;
    seed: number;
    rk4StepsPerSample: number;
  };
  keepOut: { label: string; bodyAxis: Vec3; inertialDirection: Vec3; halfAngleRad: number }[];
  /** The robustness study block, SI with defaults (study/definition.ts); null when the file has none. */
  study: StudyDefinition | null;
}

/** Unit copy of v; a zero or non-finite v is reported at `path` and gives +X (never NaN). */
function unit3(v: readonly number[], path: string, errors: Issue[]): Vec3 {
  const n = Math.hypot(v[0]!, v[1]!, v[2]!);
  if (!(n > 0) || !Number.isFinite(n)) {
    errors.push({ path, rule: 'non-zero', message: `${path} must be a non-zero, finite vector` });
    return v3Create(1, 0, 0);
  }
  return v3Create(v[0]! / n, v[1]! / n, v[2]! / n);
}

function vec3Scaled(v: readonly number[], k: number): Vec3 {
  return v3Create(v[0]! * k, v[1]! * k, v[2]! * k);
}

/**
 * SI view of a scenario that passed validateScenario. Re-checks what it needs (attitudes, epoch)
 * so that a hand-built Scenario object fails with issues rather than producing NaN.
 */
export function resolveScenario(s: Scenario): Result<ResolvedScenario> {
  const errors: Issue[] = [];
  const warnings: Issue[] = [];

  const epochUnixMs = parseIsoUtcMs(s.epochUtc);
  if (epochUnixMs === null)
    errors.push({
      path: 'epochUtc',
      rule: 'calendar',
      message: `epochUtc ${JSON.stringify(s.epochUtc)} is not a valid ISO 8601 UTC instant`,
    });

  const qInit = qCreate();
  const initOk = resolveAttitude(qInit, s.initial.attitude, null, 'initial.attitude', errors, warnings, true);
  let previous: Quat | null = initOk ? qInit : null;
  const targets: ResolvedTarget[] = s.targets.map((t, i) => {
    const q = qCreate();
    previous = resolveAttitude(q, t.attitude, previous, `targets[${i}].attitude`, errors, warnings) ? q : null;
    return { label: t.label, form: attitudeForm(t.attitude), qInertialFromBody: q, holdS: t.holdS };
  });

  const v = s.vehicle;
  const w = v.wheels;
  const nW = wheelCount(w);
  let wheels: ResolvedWheels;
  if (w.layout === 'pyramid') {
    wheels = {
      layout: 'pyramid',
      count: 4,
      cantAngleRad: w.cantAngleDeg * RAD_PER_DEG,
      azimuthOffsetRad: w.azimuthOffsetDeg * RAD_PER_DEG,
      maxTorqueNm: w.maxTorqueMNm * SI_PER_MILLI,
      maxMomentumNms: w.maxMomentumMNms * SI_PER_MILLI,
      rotorInertiaKgm2: w.rotorInertiaKgm2,
    };
  } else if (w.layout === 'triad') {
    wheels = {
      layout: 'triad',
      count: 3,
      maxTorqueNm: w.maxTorqueMNm * SI_PER_MILLI,
      maxMomentumNms: w.maxMomentumMNms * SI_PER_MILLI,
      rotorInertiaKgm2: w.rotorInertiaKgm2,
    };
  } else {
    wheels = {
      layout: 'custom',
      count: nW,
      wheels: w.wheels.map((x, i) => ({
        axis: unit3(x.axis, `vehicle.wheels.wheels[${i}].axis`, errors),
        maxTorqueNm: x.maxTorqueMNm * SI_PER_MILLI,
        maxMomentumNms: x.maxMomentumMNms * SI_PER_MILLI,
        rotorInertiaKgm2: x.rotorInertiaKgm2,
      })),
    };
  }

  const h0 = new Float64Array(nW);
  if (s.initial.wheelMomentumMNms) {
    if (s.initial.wheelMomentumMNms.length !== nW) {
      errors.push({
        path: 'initial.wheelMomentumMNms',
        rule: 'count',
        message: `initial.wheelMomentumMNms must have one value per wheel (${nW})`,
      });
    } else s.initial.wheelMomentumMNms.forEach((h, i) => (h0[i] = h * SI_PER_MILLI));
  }

  const controllers = s.controllers.map((c, ci): ResolvedController => {
    const gains: ResolvedGains =
      'kp' in c.gains
        ? { form: 'kp-kd', kp: c.gains.kp, kd: c.gains.kd }
        : { form: 'bandwidth', bandwidthRadPerS: c.gains.bandwidthRadPerS, dampingRatio: c.gains.dampingRatio };
    const base = { id: c.id, label: c.label, gains };
    switch (c.law) {
      case 'eigenaxis':
        return { ...base, law: c.law, maxRateRadPerS: c.maxRateDegPerS * RAD_PER_DEG };
      case 'hysteretic':
        return { ...base, law: c.law, hysteresis: c.hysteresis };
      case 'synergistic': {
        const axesRows = c.potentialAxes ?? [
          [1, 0, 0],
          [0, 1, 0],
          [0, 0, 1],
        ];
        const axes = axesRows.map((a, k) => unit3(a, `controllers[${ci}].potentialAxes[${k}]`, errors));
        const V = m3Create();
        for (let k = 0; k < 3; k++) for (let r = 0; r < 3; r++) V[3 * k + r] = axes[k]![r]!;
        const lam = c.potentialWeights;
        const A = m3Create();
        for (let r = 0; r < 3; r++)
          for (let col = 0; col < 3; col++) {
            let sum = 0;
            for (let k = 0; k < 3; k++) sum += lam[k]! * axes[k]![r]! * axes[k]![col]!;
            A[3 * col + r] = sum;
          }
        const dirs = c.warpDirections
          ? c.warpDirections.map((u, k) => unit3(u, `controllers[${ci}].warpDirections[${k}]`, errors))
          : axes.map((a) => v3Create(a[0], a[1], a[2]));
        return {
          ...base,
          law: c.law,
          potentialWeights: v3Create(lam[0], lam[1], lam[2]),
          potentialAxes: V,
          potentialMatrix: A,
          warpGain: c.warpGain,
          warpDirections: dirs,
          hysteresis: c.hysteresis,
        };
      }
      default:
        return { ...base, law: c.law as Extract<ControlLaw, 'quaternion-pd' | 'sign-switch'> };
    }
  });

  const keepOut = (s.keepOut ?? []).map((k, i) => ({
    label: k.label,
    bodyAxis: unit3(k.bodyAxis ?? [0, 0, 1], `keepOut[${i}].bodyAxis`, errors),
    inertialDirection: unit3(k.inertialDirection, `keepOut[${i}].inertialDirection`, errors),
    halfAngleRad: k.halfAngleDeg * RAD_PER_DEG,
  }));

  const study = s.study ? resolveStudy(s.study, s, errors, warnings) : null;

  if (errors.length) return fail(errors, warnings);

  const resolved: ResolvedScenario = {
    source: s,
    name: s.name,
    description: s.description,
    epochUtc: s.epochUtc,
    epochUnixMs: epochUnixMs as number,
    vehicle: {
      name: v.name,
      inertiaKgm2: m3FromRows(v.inertiaKgm2),
      wheels,
      wheelCount: nW,
      wheelFriction: v.wheelFriction
        ? { viscousNmPerRadPerS: v.wheelFriction.viscousMNmPerRadPerS * SI_PER_MILLI, coulombNm: v.wheelFriction.coulombMNm * SI_PER_MILLI }
        : null,
      sensors: {
        attitudeNoiseRad: v.sensors.attitudeNoiseArcsec * RAD_PER_ARCSEC,
        rateNoiseRadPerS: v.sensors.rateNoiseDegPerS * RAD_PER_DEG,
        rateBiasRadPerS: vec3Scaled(v.sensors.rateBiasDegPerS, RAD_PER_DEG),
      },
      controlRateHz: v.controlRateHz,
      controlPeriodS: 1 / v.controlRateHz,
      actuation: {
        mode: v.actuation.mode,
        torqueQuantumNm: v.actuation.torqueQuantumMNm !== undefined ? v.actuation.torqueQuantumMNm * SI_PER_MILLI : null,
      },
    },
    initial: {
      form: attitudeForm(s.initial.attitude),
      qInertialFromBody: qInit,
      omegaBody: vec3Scaled(s.initial.bodyRateDegPerS, RAD_PER_DEG),
      hWheelNms: h0,
    },
    targets,
    controllers,
    planning: {
      torqueMargin: s.planning.torqueMargin,
      momentumMargin: s.planning.momentumMargin,
      slewRateLimitRadPerS: s.planning.slewRateLimitDegPerS * RAD_PER_DEG,
      profile: s.planning.profile,
    },
    simulation: {
      mode: s.simulation.mode,
      timing: s.simulation.timing,
      settleAngleRad: s.simulation.settleAngleDeg * RAD_PER_DEG,
      settleRateRadPerS: s.simulation.settleRateDegPerS * RAD_PER_DEG,
      tailS: s.simulation.tailS,
      seed: s.simulation.seed,
      rk4StepsPerSample: s.simulation.rk4StepsPerSample,
    },
    keepOut,
    study,
  };
  return ok(resolved, warnings);
}

/** validateScenario then resolveScenario, warnings of both kept once. */
export function loadScenario(json: unknown): Result<ResolvedScenario> {
  const v = validateScenario(json);
  if (!v.ok) return v;
  const r = resolveScenario(v.value);
  // resolveScenario repeats the attitude warnings validateScenario already gave.
  const seen = new Set(v.warnings.map((i) => `${i.path}|${i.rule}`));
  const extra = r.warnings.filter((i) => !seen.has(`${i.path}|${i.rule}`));
  return r.ok ? ok(r.value, [...v.warnings, ...extra]) : fail(r.errors, [...v.warnings, ...extra]);
}
