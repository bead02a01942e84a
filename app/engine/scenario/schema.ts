/**
 * The Slewsmith scenario file, format "slewsmith-scenario", version 1: one zod source for the
 * TypeScript types, the structural validation (validate.ts) and the published JSON Schema
 * (`scenarioJsonSchema()`).
 *
 * Units: the file is written in display units and every such field carries its unit in the key
 * (Deg, DegPerS, MNm = mN·m, MNms = mN·m·s, Arcsec, Kgm2, S, Hz); resolve.ts converts to SI.
 * Fields without a unit suffix say their unit in their description. Vectors are body- or
 * inertial-frame components as named; quaternions are Hamilton, scalar-last [x, y, z, w], and an
 * attitude quaternion is qInertialFromBody (rotates body vectors into the inertial frame).
 *
 * Physics checks (inertia symmetric/positive definite/triangle inequality, wheel-array rank) are
 * not here: body/inertia.ts and the wheels module own them. This schema checks structure, types,
 * ranges and units; validate.ts adds the cross-field checks.
 */
import { z } from 'zod';
import { EULER_SEQUENCES } from '../math/rotation';

export const SCENARIO_FORMAT = 'slewsmith-scenario';
export const SCENARIO_VERSION = 1;

/** Finite number (zod 4's number already rejects ±Infinity and NaN). */
const num = () => z.number();
const positive = () => z.number().positive();
const nonNegative = () => z.number().min(0);
const vec3 = (what: string) => z.array(num()).length(3).describe(what);
const label = () => z.string().min(1).max(200);

// ---------------------------------------------------------------------------------------------
// Attitudes

export const QuaternionAttitudeSchema = z.strictObject({
  quaternion: z
    .array(num())
    .length(4)
    .describe(
      'Attitude quaternion qInertialFromBody, Hamilton, scalar-last [x, y, z, w]; must have unit norm ' +
        '(normalised with a warning when within 1e-6 of 1, rejected otherwise). Its sign is kept as given.',
    ),
});

export const EulerAttitudeSchema = z.strictObject({
  euler: z
    .strictObject({
      sequence: z
        .enum(EULER_SEQUENCES)
        .describe(
          'Intrinsic rotation sequence from the inertial frame to the body frame: "ZYX" with angles ' +
            '(a, b, c) is R = R_z(a) R_y(b) R_x(c), each rotation about an axis of the already rotated frame.',
        ),
      anglesDeg: vec3('The three sequence angles, degrees, in the order of the sequence letters.'),
    })
    .describe('Attitude as an intrinsic Euler sequence (all 12 Tait–Bryan and proper sequences).'),
});

export const PointingAttitudeSchema = z.strictObject({
  pointing: z
    .strictObject({
      bodyAxis: vec3('Body-frame axis pointed exactly along inertialDirection (any non-zero length).'),
      inertialDirection: vec3('Inertial-frame direction for bodyAxis (any non-zero length).'),
      bodySecondary: vec3('Body-frame axis kept as close as possible to inertialSecondary; not parallel to bodyAxis.'),
      inertialSecondary: vec3('Inertial-frame direction for bodySecondary; not parallel to inertialDirection.'),
    })
    .describe('Two-vector attitude (TRIAD construction): primary exact, secondary as close as possible.'),
});

export const RelativeAttitudeSchema = z.strictObject({
  relative: z
    .strictObject({
      axis: vec3('Rotation axis in the body frame of the previous attitude (any non-zero length).'),
      angleDeg: num().describe('Right-handed rotation angle about axis, degrees.'),
    })
    .describe(
      "Rotation of the PREVIOUS target's attitude (or the initial attitude, for the first target) about one " +
        'of its body axes: q_k = q_(k-1) ⊗ q_rel. Not allowed for the initial attitude.',
    ),
});

/** The four attitude forms; each object has exactly one of these keys. */
export const ATTITUDE_FORMS = ['quaternion', 'euler', 'pointing', 'relative'] as const;
export type AttitudeForm = (typeof ATTITUDE_FORMS)[number];

export const AttitudeSchema = z
  .union([QuaternionAttitudeSchema, EulerAttitudeSchema, PointingAttitudeSchema, RelativeAttitudeSchema])
  .describe('An attitude: exactly one of "quaternion", "euler", "pointing", "relative".');

// ---------------------------------------------------------------------------------------------
// Vehicle

const wheelLimits = {
  maxTorqueMNm: positive().describe('Largest motor torque of one wheel, mN·m.'),
  maxMomentumMNms: positive().describe('Largest stored axial momentum of one wheel, mN·m·s.'),
  rotorInertiaKgm2: positive().describe('Rotor axial moment of inertia of one wheel, kg·m².'),
};

export const PyramidWheelsSchema = z.strictObject({
  layout: z.literal('pyramid'),
  count: z.literal(4).describe('A pyramid has four wheels; use layout "custom" for other arrays.'),
  cantAngleDeg: z
    .number()
    .gt(0)
    .lt(90)
    .describe(
      'Angle between each wheel spin axis and the body +Z symmetry axis, degrees (arccos(1/√3) = 54.7356° puts the axes on cube diagonals).',
    ),
  azimuthOffsetDeg: z
    .number()
    .min(-360)
    .max(360)
    .describe('Azimuth of wheel 1 about +Z from +X, degrees; wheels k = 1..4 sit at azimuthOffsetDeg + 90°(k-1).'),
  ...wheelLimits,
});

export const TriadWheelsSchema = z.strictObject({
  layout: z.literal('triad'),
  ...wheelLimits,
});

export const CustomWheelSchema = z.strictObject({
  axis: vec3('Spin axis in body axes (normalised on load; non-zero).'),
  ...wheelLimits,
});

export const CustomWheelsSchema = z.strictObject({
  layout: z.literal('custom'),
  wheels: z.array(CustomWheelSchema).min(3).max(12).describe('The wheels, in the order exports list them.'),
});

export const WheelsSchema = z
  .discriminatedUnion('layout', [PyramidWheelsSchema, TriadWheelsSchema, CustomWheelsSchema])
  .describe('Reaction-wheel array: a pyramid preset, an orthogonal triad along body X, Y, Z, or explicit axes.');

export const WheelFrictionSchema = z
  .strictObject({
    viscousMNmPerRadPerS: nonNegative().describe('Viscous friction coefficient, mN·m per rad/s of wheel speed.'),
    coulombMNm: nonNegative().describe('Coulomb (dry) friction torque magnitude, mN·m.'),
  })
  .describe('Wheel bearing friction, the same for every wheel.');

export const SensorsSchema = z.strictObject({
  attitudeNoiseArcsec: nonNegative().describe('Attitude measurement noise, arcseconds, 1σ per axis (white, per sample).'),
  rateNoiseDegPerS: nonNegative().describe('Rate measurement noise, deg/s, 1σ per axis (white, per control sample).'),
  rateBiasDegPerS: vec3('Constant rate-sensor bias, deg/s, body axes.'),
});

export const ActuationSchema = z.strictObject({
  mode: z
    .enum(['hold', 'pwm', 'quantized'])
    .describe('How a sampled torque command reaches the wheels: zero-order hold, pulse-width modulated, or quantized.'),
  torqueQuantumMNm: positive().optional().describe('Torque resolution, mN·m; required when mode is "quantized".'),
});

export const VehicleSchema = z.strictObject({
  name: label().describe('Vehicle name (exports use it as OBJECT_NAME).'),
  inertiaKgm2: z
    .array(z.array(num()).length(3))
    .length(3)
    .describe(
      'Whole-spacecraft inertia tensor about the centre of mass, body axes, kg·m², rows of a symmetric 3×3 matrix (products of inertia enter with their sign in the tensor).',
    ),
  wheels: WheelsSchema,
  wheelFriction: WheelFrictionSchema.optional(),
  sensors: SensorsSchema,
  controlRateHz: z.number().positive().max(1000).describe('Controller sample rate, Hz.'),
  actuation: ActuationSchema,
});

// ---------------------------------------------------------------------------------------------
// Maneuver

export const InitialSchema = z.strictObject({
  attitude: AttitudeSchema,
  bodyRateDegPerS: vec3('Initial body rate, deg/s, body axes.'),
  wheelMomentumMNms: z
    .array(num())
    .optional()
    .describe('Initial axial momentum of each wheel, mN·m·s, in wheel order; one value per wheel; zero when absent.'),
});

export const TargetSchema = z.strictObject({
  label: label().describe('Name shown in plots and exports.'),
  attitude: AttitudeSchema,
  holdS: nonNegative().describe('Time to hold the target after arriving, s.'),
});

// ---------------------------------------------------------------------------------------------
// Controllers

export const KpKdGainsSchema = z.strictObject({
  kp: positive().describe(
    'Stiffness gain, SI. quaternion-pd, sign-switch, hysteretic: N·m per unit of the error quaternion vector part; ' +
      'synergistic: N·m per unit of the potential gradient; eigenaxis (inertia-normalised law): 1/s².',
  ),
  kd: positive().describe('Damping gain, SI: N·m·s/rad (N·m per rad/s); eigenaxis (inertia-normalised): 1/s.'),
});

export const BandwidthGainsSchema = z.strictObject({
  bandwidthRadPerS: positive().describe(
    'Small-error closed-loop natural frequency ω_n, rad/s; the controller derives its gains from ω_n, ζ and the inertia.',
  ),
  dampingRatio: z.number().positive().max(10).describe('Small-error damping ratio ζ (dimensionless).'),
});

export const GainsSchema = z
  .union([KpKdGainsSchema, BandwidthGainsSchema])
  .describe('Either explicit gains { kp, kd } or a bandwidth and damping ratio { bandwidthRadPerS, dampingRatio }.');

const controllerBase = {
  id: z
    .string()
    .min(1)
    .max(64)
    .regex(/^[A-Za-z0-9_.-]+$/)
    .describe('Unique key: letters, digits, "_", ".", "-".'),
  label: label().describe('Name shown in the comparison table and exports.'),
  gains: GainsSchema,
};

export const QuaternionPdControllerSchema = z.strictObject({
  ...controllerBase,
  law: z.literal('quaternion-pd').describe('Continuous quaternion PD (unwinds from the far hemisphere).'),
});

export const SignSwitchControllerSchema = z.strictObject({
  ...controllerBase,
  law: z.literal('sign-switch').describe('Memoryless shortest-path PD, torque −kp·sgn(η)·ε − kd·ω.'),
});

export const EigenaxisControllerSchema = z.strictObject({
  ...controllerBase,
  law: z.literal('eigenaxis').describe('Eigenaxis feedback with gyroscopic cancellation and a slew-rate limit.'),
  maxRateDegPerS: positive().describe('Slew-rate limit of the eigenaxis law, deg/s.'),
});

export const HystereticControllerSchema = z.strictObject({
  ...controllerBase,
  law: z.literal('hysteretic').describe('Hysteretic hybrid quaternion feedback with logic h ∈ {−1, 1}.'),
  hysteresis: z.number().gt(0).lt(1).describe('Hysteresis half-width δ on h·η, dimensionless, 0 < δ < 1.'),
});

export const SynergisticControllerSchema = z.strictObject({
  ...controllerBase,
  law: z.literal('synergistic').describe('Synergistic hybrid feedback over a family of warped trace potentials.'),
  potentialWeights: z
    .array(positive())
    .length(3)
    .describe('Eigenvalues of the potential matrix A in Φ(R) = tr(A(I − R)), dimensionless, positive and distinct.'),
  potentialAxes: z
    .array(z.array(num()).length(3))
    .length(3)
    .optional()
    .describe('Unit eigenvectors of A, one per weight, body axes of the error frame; orthonormal. Default: x, y, z.'),
  warpGain: positive().describe('Warping gain k in θ(R) = k·Φ(R), rad per unit potential; (A, k) → (cA, k/c) keeps the family’s shape.'),
  warpDirections: z
    .array(z.array(num()).length(3))
    .min(2)
    .max(12)
    .optional()
    .describe('Warping directions u_q, one potential per direction (non-zero; normalised on load). Default: potentialAxes.'),
  hysteresis: positive().describe('Switching margin δ on the synergy gap, in potential units; must be below the certified gap.'),
});

export const CONTROL_LAWS = ['quaternion-pd', 'sign-switch', 'eigenaxis', 'hysteretic', 'synergistic'] as const;
export type ControlLaw = (typeof CONTROL_LAWS)[number];

export const ControllerSchema = z.discriminatedUnion('law', [
  QuaternionPdControllerSchema,
  SignSwitchControllerSchema,
  EigenaxisControllerSchema,
  HystereticControllerSchema,
  SynergisticControllerSchema,
]);

// ---------------------------------------------------------------------------------------------
// Planning, simulation, constraints

export const PlanningSchema = z.strictObject({
  torqueMargin: z.number().gt(0).max(1).describe('Fraction of the wheel torque envelope the plan may use, (0, 1].'),
  momentumMargin: z.number().gt(0).max(1).describe('Fraction of the wheel momentum envelope the plan may use, (0, 1].'),
  slewRateLimitDegPerS: positive().describe('Cap on the body rate magnitude during a planned slew, deg/s.'),
  profile: z.enum(['bang-bang', 'bang-coast-bang']).describe('Reference profile shape of each slew.'),
});

export const SimulationSchema = z.strictObject({
  mode: z
    .enum(['profiled', 'direct', 'both'])
    .describe('profiled: track the planned reference; direct: step to each target; both: run each controller both ways.'),
  timing: z
    .enum(['sampled', 'continuous-ideal'])
    .describe('sampled: controller at controlRateHz with zero-order hold; continuous-ideal: no sampling (theory check).'),
  settleAngleDeg: positive().describe('A segment has settled when the error angle stays below this, degrees.'),
  settleRateDegPerS: positive().describe('… and the rate error stays below this, deg/s.'),
  tailS: nonNegative().describe('Extra simulated time after the last hold, s.'),
  seed: z.number().int().min(0).max(4294967295).describe('Seed of the noise generator (unsigned 32-bit integer).'),
  rk4StepsPerSample: z.number().int().min(1).max(1000).describe('Fixed RK4 steps per control period.'),
});

export const KeepOutSchema = z.strictObject({
  label: label(),
  bodyAxis: vec3('Body axis that must stay outside the cone (e.g. an instrument boresight); default +Z.').optional(),
  inertialDirection: vec3('Cone axis, inertial frame (e.g. the Sun direction; non-zero, normalised on load).'),
  halfAngleDeg: z.number().gt(0).lt(180).describe('Cone half-angle, degrees.'),
});

// ---------------------------------------------------------------------------------------------
// Robustness study (seeded Monte Carlo; app/engine/study). Every dispersion is optional; a field
// left out is not dispersed. Defaults are applied by study/definition.ts, not here, so the JSON
// Schema stays plain.

export const StudyAttitudeDispersionSchema = z
  .discriminatedUnion('mode', [
    z.strictObject({ mode: z.literal('uniform').describe('Start attitude uniform over SO(3) (Haar measure).') }),
    z.strictObject({
      mode: z.literal('cone').describe('Start attitude uniform (Haar) within a ball of rotations about the nominal initial attitude.'),
      maxAngleDeg: z.number().gt(0).max(180).describe('Largest rotation away from the nominal initial attitude, degrees.'),
    }),
    z.strictObject({
      mode: z
        .literal('near-reversal')
        .describe('Error to the first target within withinDeg of 180°; the quaternion sign (hemisphere) is drawn at random.'),
      withinDeg: z.number().gt(0).max(90).describe('Largest distance of the initial error angle from 180°, degrees.'),
    }),
  ])
  .describe('How the initial attitude is dispersed.');

export const StudyInertiaDispersionSchema = z.strictObject({
  momentSigmaFraction: z
    .number()
    .min(0)
    .max(0.5)
    .optional()
    .describe('1σ relative error of each principal moment (Gaussian), dimensionless fraction.'),
  axisMisalignmentDeg: z
    .number()
    .min(0)
    .max(45)
    .optional()
    .describe('1σ per axis of a small random rotation of the principal axes, degrees.'),
});

export const StudyWheelDispersionSchema = z.strictObject({
  torqueDegradationMax: z
    .number()
    .min(0)
    .lt(1)
    .optional()
    .describe('Each wheel loses a fraction of its torque limit drawn uniformly in [0, this], dimensionless.'),
  momentumDegradationMax: z
    .number()
    .min(0)
    .lt(1)
    .optional()
    .describe('Each wheel loses a fraction of its momentum limit drawn uniformly in [0, this], dimensionless.'),
  failOneWheelProbability: z
    .number()
    .min(0)
    .max(1)
    .optional()
    .describe('Probability that one wheel (chosen at random) is lost for the whole case, dimensionless.'),
});

export const StudySensorDispersionSchema = z.strictObject({
  attitudeNoiseScale: z
    .array(z.number().min(0).max(1000))
    .length(2)
    .optional()
    .describe('[min, max] factor on vehicle.sensors.attitudeNoiseArcsec, drawn uniformly per case, dimensionless.'),
  rateBiasDegPerS: z.number().min(0).optional().describe('1σ per axis of an extra constant rate bias, deg/s.'),
  adversarialEta: z
    .number()
    .min(0)
    .lt(1)
    .optional()
    .describe(
      'Worst-case bounded noise level ē on the error quaternion scalar part (measured η reflected when |η| < ē), dimensionless; 0 = off.',
    ),
});

export const StudyDispersionsSchema = z.strictObject({
  initialAttitude: StudyAttitudeDispersionSchema.optional(),
  initialRateDegPerS: z.number().min(0).optional().describe('1σ per body axis of the initial rate added to the nominal one, deg/s.'),
  inertia: StudyInertiaDispersionSchema.optional(),
  wheels: StudyWheelDispersionSchema.optional(),
  sensors: StudySensorDispersionSchema.optional(),
  controlRateHz: z
    .array(z.number().positive().max(1000))
    .min(1)
    .max(20)
    .optional()
    .describe('Control rates to pick from uniformly per case, Hz.'),
  actuation: z
    .array(z.enum(['hold', 'pwm', 'quantized']))
    .min(1)
    .max(3)
    .optional()
    .describe('Actuation modes to pick from uniformly per case.'),
  torqueQuantumMNm: positive().optional().describe('Torque quantum for cases drawn as "quantized" when the vehicle has none, mN·m.'),
});

export const StudySchema = z
  .strictObject({
    runs: z.number().int().min(1).max(1000000).describe('Number of dispersed cases; every selected controller flies every case.'),
    seed: z
      .number()
      .int()
      .min(0)
      .max(4294967295)
      .describe('Study seed (unsigned 32-bit integer); a case depends only on (seed, case index).'),
    controllers: z.array(z.string().min(1).max(64)).min(1).max(20).optional().describe('Controller ids to compare (default: all).'),
    durationS: positive().max(100000).optional().describe('Simulated time per case, s (default 600).'),
    mode: z
      .enum(['direct', 'profiled'])
      .optional()
      .describe(
        'direct (default): regulate to the first target from the dispersed start; profiled: track the slew planned on the nominal model from that start.',
      ),
    stopAfterSettledForS: nonNegative()
      .max(100000)
      .optional()
      .describe(
        'End a direct-mode case early once it has stayed settled this long, s (default 20; 0 = always run durationS). Profiled cases always run durationS.',
      ),
    worstCases: z.number().int().min(1).max(100).optional().describe('Worst cases listed per controller (default 5).'),
    dispersions: StudyDispersionsSchema.optional(),
  })
  .describe('Seeded Monte Carlo robustness study over attitudes, noise, sampling and vehicle uncertainty.');

// ---------------------------------------------------------------------------------------------
// The file

export const ScenarioSchema = z
  .strictObject({
    format: z.literal(SCENARIO_FORMAT).describe('Always "slewsmith-scenario".'),
    version: z.literal(SCENARIO_VERSION).describe('File format version; this Slewsmith reads version 1.'),
    name: label().describe('Scenario name.'),
    description: z.string().max(4000).describe('Free text for people.'),
    epochUtc: z
      .string()
      .regex(/^\d{4}-\d{2}-\d{2}T\d{2}:\d{2}:\d{2}(\.\d{1,3})?Z$/)
      .describe('Start epoch (t = 0), ISO 8601 UTC with a trailing Z, at most millisecond resolution.'),
    vehicle: VehicleSchema,
    initial: InitialSchema,
    targets: z.array(TargetSchema).min(1).max(1000).describe('Targets in the order they are visited.'),
    controllers: z.array(ControllerSchema).min(1).max(20).describe('Controllers to compare on the same maneuver.'),
    planning: PlanningSchema,
    simulation: SimulationSchema,
    keepOut: z.array(KeepOutSchema).max(50).optional().describe('Inertial cones a body axis must stay out of.'),
    study: StudySchema.optional(),
  })
  .describe('Slewsmith scenario file, format version 1.');

export type Scenario = z.infer<typeof ScenarioSchema>;
export type AttitudeSpec = z.infer<typeof AttitudeSchema>;
export type WheelsSpec = z.infer<typeof WheelsSchema>;
export type ControllerSpec = z.infer<typeof ControllerSchema>;
export type GainsSpec = z.infer<typeof GainsSchema>;
export type TargetSpec = z.infer<typeof TargetSchema>;
export type KeepOutSpec = z.infer<typeof KeepOutSchema>;
export type StudySpec = z.infer<typeof StudySchema>;

/** Keys that tell the branches of a keyed (non-discriminated) union apart, in branch order. */
export const KEYED_UNIONS: Record<string, readonly string[]> = {
  attitude: ATTITUDE_FORMS,
  gains: ['kp', 'bandwidthRadPerS'],
};

/**
 * JSON Schema (draft 2020-12) of the file, generated from the same zod source, for editors and
 * for other tools. Value ranges are included; cross-field rules (unique ids, counts, unit norms)
 * are only in validateScenario.
 */
export function scenarioJsonSchema(): Record<string, unknown> {
  const s = z.toJSONSchema(ScenarioSchema, { target: 'draft-2020-12' }) as Record<string, unknown>;
  return { ...s, title: 'Slewsmith scenario (version 1)' };
}
