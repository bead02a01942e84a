/**
 * The robustness-study block of the scenario file (schema.ts imports it as `study`): a seeded Monte
 * Carlo study (app/engine/study). Every dispersion is optional; a field left out is not dispersed.
 * Defaults are applied by study/definition.ts, not here, so the JSON Schema stays plain. Units are
 * in the keys or the descriptions, as everywhere in the file.
 */
import { z } from 'zod';
import { antipodalNoiseStudyShape, NearAntipodeDispersionSchema } from './pointingOnlySchema';

export const StudyAttitudeDispersionSchema = z
  .discriminatedUnion('mode', [
    z.strictObject({
      mode: z
        .literal('uniform')
        .describe('Start attitude uniform over SO(3) (Haar measure); a pointed body axis is then uniform over the sphere.'),
    }),
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
    NearAntipodeDispersionSchema,
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
  ...antipodalNoiseStudyShape,
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
  torqueQuantumMNm: z
    .number()
    .positive()
    .optional()
    .describe('Torque quantum for cases drawn as "quantized" when the vehicle has none, mN·m.'),
});

export const StudySchema = z
  .strictObject({
    runs: z.number().int().min(1).max(10000000).describe('Number of dispersed cases; every selected controller flies every case.'),
    seed: z
      .number()
      .int()
      .min(0)
      .max(4294967295)
      .describe('Study seed (unsigned 32-bit integer); a case depends only on (seed, case index).'),
    controllers: z.array(z.string().min(1).max(64)).min(1).max(20).optional().describe('Controller ids to compare (default: all).'),
    durationS: z.number().positive().max(100000).optional().describe('Simulated time per case, s (default 600).'),
    mode: z
      .enum(['step-target', 'follow-plan'])
      .optional()
      .describe(
        'step-target (default): regulate to the first target from the dispersed start; follow-plan: track the slew planned on the nominal model from that start.',
      ),
    stopAfterSettledForS: z
      .number()
      .min(0)
      .max(100000)
      .optional()
      .describe(
        'End a step-target case early once it has stayed settled this long, s (default 20; 0 = always run durationS). Follow-plan cases always run durationS.',
      ),
    worstCases: z.number().int().min(1).max(100).optional().describe('Worst cases listed per controller (default 5).'),
    dispersions: StudyDispersionsSchema.optional(),
  })
  .describe('Seeded Monte Carlo robustness study over attitudes, noise, sampling and vehicle uncertainty.');
