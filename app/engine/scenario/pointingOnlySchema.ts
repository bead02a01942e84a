/**
 * Scenario-file pieces of the pointing-only (roll-free) mode, joined into the file schema by
 * schema.ts and studySchema.ts (one spread or one union member each). Units in the keys or the
 * descriptions, as everywhere in the file.
 *
 * "Roll free" is a property a TARGET carries, not a separate attitude form: any attitude form that
 * names a pointed body axis (its primary axis) may be flown pointing-only by adding
 * `"rollFree": true` to the target. Only the primary axis must then reach its direction; the roll
 * about it is left to the slew (the shortest rotation that carries the axis onto the direction,
 * control/sphere/slew.ts). The form's secondary constraint stays in the file: it is the attitude the
 * target would hold with its roll held, which the plan times for comparison (the saving of the
 * pointing-only slew). Which forms name a primary axis is one table in pointingOnly.ts.
 */
import { z } from 'zod';

/** Spread into TargetSchema. */
export const rollFreeTargetShape = {
  rollFree: z
    .boolean()
    .optional()
    .describe(
      'Pointing-only target: only the attitude form’s primary body axis must reach its direction (for "pointing": bodyAxis along inertialDirection); the roll about that axis is free, and the slew is the shortest rotation that carries the axis onto the direction. The form’s secondary pair is then used only for the comparison the plan reports (the same target with its roll held). Needs an attitude form with a primary axis. Absent or false: the full attitude.',
    ),
};

/** Spread into SensorsSchema. */
export const antipodalNoiseSensorShape = {
  antipodalNoiseDeg: z
    .number()
    .min(0)
    .max(90)
    .optional()
    .describe(
      'Worst-case bounded noise ē for pointing-only targets, degrees: whenever the pointed body axis is within ē of the antipode of its direction, the measured attitude is turned by at most ē so that the controller sees the axis exactly at the antipode (the stall of a smooth pointing law, control/sphere/noise.ts). A stress test; 0 or absent: off.',
    ),
};

/** A member of the study's initial-attitude dispersion union. */
export const NearAntipodeDispersionSchema = z.strictObject({
  mode: z
    .literal('near-antipode')
    .describe(
      'Pointing-only first target: the pointed body axis starts within withinDeg of the antipode of its direction (uniform over that cap of the sphere), with a uniform roll about it.',
    ),
  withinDeg: z
    .number()
    .gt(0)
    .max(90)
    .describe('Largest angle between the pointed axis at the start and the antipode of its direction, degrees.'),
});

/** Spread into StudySensorDispersionSchema. */
export const antipodalNoiseStudyShape = {
  antipodalNoiseDeg: z
    .number()
    .min(0)
    .max(90)
    .optional()
    .describe(
      'Worst-case bounded noise ē for pointing-only targets (as vehicle.sensors.antipodalNoiseDeg), degrees, the same in every case; 0 or absent = off.',
    ),
};
