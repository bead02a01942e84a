/**
 * The Slewsmith scenario file, format "slewsmith-scenario", version 2: one zod source for the
 * TypeScript types, the structural validation (validate.ts) and the published JSON Schema
 * (`scenarioJsonSchema()`). Version 1 files are read through migrate.ts.
 *
 * Controller entries are declared by each law (app/engine/control/laws/<law>/schema.ts) and
 * joined in control/fileSchema.ts; this file takes the union from there.
 * The robustness-study block is declared in studySchema.ts and re-exported here.
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
import { ConstraintsSchema } from './constraintSchema';
import { EULER_SEQUENCES } from '../math/rotation';
import { ControllerFileSchema } from '../control/fileSchema';
import { StudySchema } from './studySchema';
import { SCENARIO_FORMAT, SCENARIO_VERSION } from './formatConstants';
import { OrbitSchema, TargetWindowSchema, TrackSchema, TRACK_FORMS } from './orbitSchema';
import { antipodalNoiseSensorShape, rollFreeTargetShape } from './pointingOnlySchema';

export {
  StudyAttitudeDispersionSchema,
  StudyDispersionsSchema,
  StudyInertiaDispersionSchema,
  StudySchema,
  StudySensorDispersionSchema,
  StudyWheelDispersionSchema,
} from './studySchema';

export { SCENARIO_FORMAT, SCENARIO_VERSION };

/**
 * Longest hold or tail, s (11.6 days): a bound on the file, not the simulation budget (the
 * pipeline estimates that from all durations and rates before it simulates).
 */
export const MAX_DURATION_S = 1e6;
/** Epoch years the file accepts: the leap-second table, the ephemerides and two-digit TLE years (1957–2056) all cover them. */
export const EPOCH_MIN_YEAR = 1960;
export const EPOCH_MAX_YEAR = 2099;

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
    compensatedFraction: z
      .number()
      .min(0)
      .max(1)
      .optional()
      .describe(
        'Friction feedforward: the fraction of this friction model the wheel drives add to each motor command, evaluated at the wheel speed seen at each control sample (common practice for reaction-wheel drives, no single source). The motor torque limit applies to the sum; the rotors feel what is left. 0 or absent: none.',
      ),
  })
  .describe('Wheel bearing friction, the same for every wheel.');

export const SensorsSchema = z.strictObject({
  attitudeNoiseArcsec: nonNegative().max(360000).describe('Attitude measurement noise, arcseconds, 1σ per axis (white, per sample).'),
  rateNoiseDegPerS: nonNegative().max(360).describe('Rate measurement noise, deg/s, 1σ per axis (white, per control sample).'),
  rateBiasDegPerS: z
    .array(z.number().min(-360).max(360))
    .length(3)
    .describe('Constant rate-sensor bias, deg/s, body axes (each within ±360).'),
  boundedNoiseEta: z
    .number()
    .min(0)
    .lt(1)
    .optional()
    .describe(
      'Worst-case bounded noise ē on the error quaternion’s scalar part, a stress test of the laws (Mayhew, Sanfelice & Teel 2011): whenever |η| < ē the measured error is reflected to (ε, −η). Dimensionless; 0 or absent: off.',
    ),
  boundedNoiseMode: z
    .enum(['reflect', 'band-edge'])
    .optional()
    .describe(
      'How the worst-case noise ē acts whenever |η| < ē: "reflect" (default) measures (ε, −η); "band-edge" measures η as −sgn(η)·ē (the vector part rescaled to a unit quaternion), the sign flip at the largest size the bound allows, which also switches a hysteretic law whose δ is below ē (Mayhew, Sanfelice & Teel 2011).',
    ),
  ...antipodalNoiseSensorShape,
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
  modelInertiaKgm2: z
    .array(z.array(num()).length(3))
    .length(3)
    .optional()
    .describe(
      'The inertia the flight software believes, when it differs from the true inertiaKgm2 (model error): controllers and the planner use it, the simulation flies inertiaKgm2. Rows of a symmetric 3×3 matrix, kg·m². Absent: the model is exact.',
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
  attitude: AttitudeSchema.optional().describe('A fixed attitude: exactly one of "attitude" and "track".'),
  track: TrackSchema.optional().describe('A moving target from the orbit (needs "orbit"): exactly one of "attitude" and "track".'),
  window: TargetWindowSchema.optional(),
  holdS: nonNegative().max(MAX_DURATION_S).describe('Time to hold the target after arriving, s.'),
  ...rollFreeTargetShape,
});

// ---------------------------------------------------------------------------------------------
// Controllers: declared by the laws (control/laws/<law>/schema.ts).

export const ControllerSchema = ControllerFileSchema;

// ---------------------------------------------------------------------------------------------
// Planning, simulation, constraints

export const PlanningSchema = z.strictObject({
  torqueMargin: z.number().gt(0).max(1).describe('Fraction of the wheel torque envelope the plan may use, (0, 1].'),
  momentumMargin: z.number().gt(0).max(1).describe('Fraction of the wheel momentum envelope the plan may use, (0, 1].'),
  slewRateLimitDegPerS: positive().describe('Cap on the body rate magnitude during a planned slew, deg/s.'),
  profile: z
    .enum(['bang-bang', 'bang-coast-bang'])
    .describe(
      'Reference profile family of each slew. "bang-coast-bang": the fastest; coasts at the rate cap when the slew-rate limit or the momentum envelope binds. "bang-bang": never coasts (one switch at mid-angle); a rate cap lowers the acceleration instead, so slews that would coast take longer.',
    ),
});

export const SimulationSchema = z.strictObject({
  mode: z
    .enum(['follow-plan', 'step-target', 'both'])
    .describe(
      'follow-plan: the controller tracks the planned slew (attitude, rate and acceleration); step-target: the controller is given each target at once, at rest, when its slew is due; both: every controller flies both ways.',
    ),
  timing: z
    .enum(['sampled', 'continuous-ideal'])
    .describe('sampled: controller at controlRateHz with zero-order hold; continuous-ideal: no sampling (theory check).'),
  settleAngleDeg: positive().describe('A segment has settled when the error angle stays below this, degrees.'),
  settleRateDegPerS: positive().describe('… and the rate error stays below this, deg/s.'),
  tailS: nonNegative().max(MAX_DURATION_S).describe('Extra simulated time after the last hold, s.'),
  durationS: positive()
    .max(MAX_DURATION_S)
    .optional()
    .describe('Total simulated time from t = 0, s, when given; otherwise the end of the last hold plus tailS.'),
  seed: z.number().int().min(0).max(4294967295).describe('Seed of the noise generator (unsigned 32-bit integer).'),
  rk4StepsPerSample: z.number().int().min(1).max(1000).describe('Fixed RK4 steps per control period.'),
  endWhenSettledForS: nonNegative()
    .max(MAX_DURATION_S)
    .optional()
    .describe(
      'End a step-target run once it has stayed within the settle thresholds this long, s (studies use it to save time; 0 or absent: fly to the end). Follow-plan runs always fly to the end.',
    ),
});

export const KeepOutSchema = z.strictObject({
  label: label(),
  bodyAxis: vec3('Body axis that must stay outside the cone (e.g. an instrument boresight); default +Z.').optional(),
  inertialDirection: vec3('Cone axis, inertial frame (e.g. the Sun direction; non-zero, normalised on load).'),
  halfAngleDeg: z.number().gt(0).lt(180).describe('Cone half-angle, degrees.'),
});

// ---------------------------------------------------------------------------------------------
// The file

export const ScenarioSchema = z
  .strictObject({
    format: z.literal(SCENARIO_FORMAT).describe('Always "slewsmith-scenario".'),
    version: z.literal(SCENARIO_VERSION).describe('File format version; this Slewsmith writes version 2 and reads versions 1 and 2.'),
    name: label().describe('Scenario name.'),
    description: z.string().max(4000).describe('Free text for people.'),
    epochUtc: z
      .string()
      .regex(/^\d{4}-\d{2}-\d{2}T\d{2}:\d{2}:\d{2}(\.\d{1,3})?Z$/)
      .describe(
        `Start epoch (t = 0), ISO 8601 UTC with a trailing Z, at most millisecond resolution, from ${EPOCH_MIN_YEAR} through ${EPOCH_MAX_YEAR}.`,
      ),
    vehicle: VehicleSchema,
    initial: InitialSchema,
    targets: z.array(TargetSchema).min(1).max(1000).describe('Targets in the order they are visited.'),
    controllers: z.array(ControllerSchema).min(1).max(20).describe('Controllers to compare on the same maneuver.'),
    planning: PlanningSchema,
    simulation: SimulationSchema,
    keepOut: z.array(KeepOutSchema).max(50).optional().describe('Inertial cones a body axis must stay out of.'),
    constraints: ConstraintsSchema.optional(),
    study: StudySchema.optional(),
    orbit: OrbitSchema.optional(),
  })
  .describe('Slewsmith scenario file, format version 2.');

export type Scenario = z.infer<typeof ScenarioSchema>;
export type AttitudeSpec = z.infer<typeof AttitudeSchema>;
export type WheelsSpec = z.infer<typeof WheelsSchema>;
export type ControllerSpec = z.infer<typeof ControllerSchema>;
export type TargetSpec = z.infer<typeof TargetSchema>;
export type KeepOutSpec = z.infer<typeof KeepOutSchema>;
export type StudySpec = z.infer<typeof StudySchema>;

/** Keys that tell the branches of a keyed (non-discriminated) union apart, in branch order. */
export const KEYED_UNIONS: Record<string, readonly string[]> = {
  attitude: ATTITUDE_FORMS,
  gains: ['kp', 'bandwidthRadPerS'],
  track: TRACK_FORMS,
};

/**
 * JSON Schema (draft 2020-12) of the file, generated from the same zod source, for editors and
 * for other tools. Value ranges are included; cross-field rules (unique ids, counts, unit norms)
 * are only in validateScenario.
 */
export function scenarioJsonSchema(): Record<string, unknown> {
  const s = z.toJSONSchema(ScenarioSchema, { target: 'draft-2020-12' }) as Record<string, unknown>;
  return { ...s, title: 'Slewsmith scenario (version 2)' };
}
