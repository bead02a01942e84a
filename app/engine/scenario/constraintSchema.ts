/**
 * The `constraints` list of the scenario file (schema.ts imports it): keep-out and keep-in cones
 * on body axes against a direction — fixed in inertial axes, the Sun, the Moon, the Earth's centre
 * or limb, or a ground station. Units are in the keys (Deg, S, M) or the descriptions; resolve.ts
 * converts to SI and constraints/directions.ts turns each direction into samples over the run.
 *
 * The older `keepOut` list stays valid and means the same as before: each entry is read as a
 * keep-out constraint against a fixed inertial direction (resolve.ts), so old files need no
 * migration and keep their format version.
 */
import { z } from 'zod';

const vec3 = (what: string) => z.array(z.number()).length(3).describe(what);

export const FixedDirectionSchema = z.strictObject({
  kind: z.literal('fixed').describe('A direction fixed in inertial axes (EME2000), e.g. a bright star.'),
  inertialDirection: vec3('The direction in inertial axes (EME2000); any non-zero length, normalised on load.'),
});

const bodyKind = <K extends string>(kind: K, what: string) => z.strictObject({ kind: z.literal(kind).describe(what) });

export const SunDirectionSchema = bodyKind(
  'sun',
  "The Sun's centre (a point: the half-angle is measured from the centre). Geocentric at the scenario epoch onwards; from the spacecraft when the scenario has an orbit.",
);
export const MoonDirectionSchema = bodyKind(
  'moon',
  "The Moon's centre (a point). Geocentric without an orbit (parallax up to about 1° in low Earth orbit); from the spacecraft with one.",
);
export const EarthCentreDirectionSchema = bodyKind(
  'earth-centre',
  "The Earth's centre seen from the spacecraft (nadir); needs the scenario's orbit.",
);
export const EarthLimbDirectionSchema = bodyKind(
  'earth-limb',
  "The Earth's disc seen from the spacecraft: the angle is measured to its nearest edge (the limb), the disc's angular radius asin(R/r) with the WGS-84 equatorial radius; needs the scenario's orbit.",
);

export const GroundStationDirectionSchema = z.strictObject({
  kind: z.literal('ground-station').describe("A ground station seen from the spacecraft; needs the scenario's orbit."),
  latitudeDeg: z.number().min(-90).max(90).describe('Geodetic latitude (WGS-84), degrees, north positive.'),
  longitudeDeg: z.number().min(-180).max(360).describe('Longitude, degrees, east positive.'),
  altitudeM: z.number().min(-1000).max(100000).describe('Height above the WGS-84 ellipsoid, metres.'),
});

export const ConstraintDirectionSchema = z
  .discriminatedUnion('kind', [
    FixedDirectionSchema,
    SunDirectionSchema,
    MoonDirectionSchema,
    EarthCentreDirectionSchema,
    EarthLimbDirectionSchema,
    GroundStationDirectionSchema,
  ])
  .describe('What the body axis is measured against.');

export const ConstraintWindowSchema = z
  .strictObject({
    startS: z.number().min(0).describe('Start, seconds from the scenario epoch (t = 0).'),
    endS: z.number().min(0).describe('End, seconds from the scenario epoch; not before startS.'),
  })
  .describe('When the constraint applies; outside the window it is not checked. Absent: always.');

export const ConstraintSchema = z.strictObject({
  name: z.string().min(1).max(80).describe('Your name for it (reports, plots and the export columns use it); unique within the scenario.'),
  kind: z
    .enum(['keep-out', 'keep-in'])
    .describe(
      'keep-out: the angle between the body axis and the direction stays above halfAngleDeg + marginDeg; keep-in: below halfAngleDeg − marginDeg.',
    ),
  bodyAxis: vec3('The body axis (an instrument boresight, a star-tracker axis, a radiator normal, an antenna), body axes; non-zero.'),
  halfAngleDeg: z.number().gt(0).lt(180).describe('Half-angle of the cone about the direction, degrees, strictly between 0 and 180.'),
  marginDeg: z
    .number()
    .min(0)
    .max(90)
    .optional()
    .describe('Extra clearance, degrees: widens a keep-out cone, narrows a keep-in cone; the planner keeps it. Absent: 0.'),
  window: ConstraintWindowSchema.optional(),
  direction: ConstraintDirectionSchema,
});

export const ConstraintsSchema = z
  .array(ConstraintSchema)
  .max(50)
  .describe('Attitude constraints checked on every plan and run, and planned around (keep-out and keep-in cones on body axes).');

export type ConstraintSpecFile = z.infer<typeof ConstraintSchema>;
export type ConstraintDirectionFile = z.infer<typeof ConstraintDirectionSchema>;
