/**
 * The scenario file's orbit pieces (format version 2, all optional, so older files stay valid):
 *  - `orbit`: the spacecraft's orbit — a two-line element set (`tle`, its lines as pasted) or SGP4
 *    mean elements at an epoch (`meanElements`, units in the keys) — the invented ground sites and
 *    stations it points at (`sites`), and how far from the scenario epoch the ephemeris, the
 *    windows and the plan may reach (`horizonS`);
 *  - `track` on a target, beside its `attitude` forms: a moving target taken from the orbit (a
 *    ground site, a ground station, the Sun, nadir with a yaw rule), each with its body axis and
 *    the reference its secondary body axis is kept near;
 *  - `window` on a target: when tracking starts (the start of the site's next pass above its
 *    elevation mask, or a UTC time) and, for a pass, whether the hold lasts to the pass end.
 * Cross-field rules (exactly one of attitude/track, known site ids, TLE columns and checksums,
 * windows that fit the horizon) are in orbitValidate.ts; SI resolution in orbitResolve.ts.
 */
import { z } from 'zod';
import { DEFAULT_HORIZON_S } from './formatConstants';

const vec3 = (what: string) => z.array(z.number()).length(3).describe(what);

/** Longest horizon, s (7 days): the ephemeris, windows and plan never reach beyond it. */
export const MAX_HORIZON_S = 7 * 86400;
export { DEFAULT_HORIZON_S };

/** ISO 8601 UTC with a trailing Z, fractions to 1 ns (time/iso.ts checks the calendar and leap seconds). */
const isoUtc = () => z.string().regex(/^\d{4}-\d{2}-\d{2}T\d{2}:\d{2}:\d{2}(\.\d{1,9})?Z$/);

export const MeanElementsSchema = z
  .strictObject({
    name: z.string().min(1).max(60).optional().describe('Name of the element set (shown in exports).'),
    epochUtc: isoUtc().describe('Element epoch, ISO 8601 UTC with a trailing Z (millisecond resolution is used).'),
    semiMajorAxisKm: z
      .number()
      .positive()
      .optional()
      .describe('Mean semi-major axis, km (give this or meanMotionRevPerDay); becomes a mean motion by Kepler’s third law with SGP4’s μ.'),
    meanMotionRevPerDay: z.number().positive().optional().describe('Mean motion, revolutions per day (give this or semiMajorAxisKm).'),
    eccentricity: z.number().min(0).lt(1).describe('Mean eccentricity, 0 ≤ e < 1.'),
    inclinationDeg: z.number().min(0).max(180).describe('Inclination, degrees, 0–180.'),
    raanDeg: z.number().describe('Right ascension of the ascending node, degrees (reduced to 0–360).'),
    argPerigeeDeg: z.number().describe('Argument of perigee, degrees (reduced to 0–360).'),
    meanAnomalyDeg: z.number().describe('Mean anomaly at the epoch, degrees (reduced to 0–360).'),
    bstarPerEarthRadii: z.number().optional().describe('SGP4 drag term B*, 1/Earth radii; 0 (no drag) when absent.'),
  })
  .describe('SGP4 mean Keplerian elements at an epoch (not osculating elements).');

export const GroundSiteSchema = z
  .strictObject({
    id: z
      .string()
      .regex(/^[A-Za-z0-9][A-Za-z0-9_-]{0,39}$/)
      .describe('Identifier targets use to name the site: letters, digits, "_" and "-", at most 40.'),
    label: z.string().min(1).max(200).describe('Name shown in plots and exports.'),
    latitudeDeg: z.number().min(-90).max(90).describe('Geodetic latitude on WGS-84, degrees, north positive.'),
    longitudeDeg: z.number().min(-360).max(360).describe('Longitude, degrees, east positive.'),
    heightM: z.number().min(-1000).max(100000).describe('Height above the WGS-84 ellipsoid, m.'),
    elevationMaskDeg: z
      .number()
      .min(-90)
      .lt(90)
      .optional()
      .describe('Elevation mask, degrees: passes are the times the spacecraft is above it (0 when absent).'),
  })
  .describe('A ground site or station on the WGS-84 ellipsoid (Earth-fixed).');

export const OrbitSchema = z
  .strictObject({
    tle: z
      .array(z.string().max(200))
      .min(2)
      .max(3)
      .optional()
      .describe(
        'Two-line element set as its lines: an optional title line, then line 1 and line 2 (69 characters each, standard NORAD columns and checksums). Give this or meanElements.',
      ),
    meanElements: MeanElementsSchema.optional(),
    sites: z.array(GroundSiteSchema).max(100).optional().describe('Ground sites and stations that targets point at.'),
    horizonS: z
      .number()
      .positive()
      .max(MAX_HORIZON_S)
      .optional()
      .describe(
        `How far past the scenario epoch the ephemeris, the pass and eclipse windows and the plan reach, s (default ${DEFAULT_HORIZON_S}, at most ${MAX_HORIZON_S}).`,
      ),
  })
  .describe('The spacecraft orbit (SGP4 through satellite.js), EME2000 frame, and the ground sites it points at.');

export const SecondaryTowardSchema = z
  .union([
    z.enum(['orbit-normal', 'nadir', 'velocity', 'sun']),
    z.strictObject({ inertialDirection: vec3('Fixed EME2000 direction (any non-zero length).') }),
  ])
  .describe(
    'What the secondary body axis is kept as close as possible to: "orbit-normal" (r × v), "nadir" (−r), "velocity" (v), "sun" (spacecraft → Sun) or a fixed EME2000 direction. Default "orbit-normal".',
  );

const aimed = {
  bodyAxis: vec3('Body axis pointed exactly along the target direction (any non-zero length).'),
  bodySecondary: vec3('Body axis kept as close as possible to secondaryToward; not parallel to bodyAxis.'),
  secondaryToward: SecondaryTowardSchema.optional(),
};

export const SiteTrackSchema = z
  .strictObject({ id: z.string().min(1).max(40).describe('The orbit.sites entry to point at.'), ...aimed })
  .describe('Point bodyAxis at a ground site and track it (the site moves with the Earth).');

export const TrackSchema = z
  .union([
    z.strictObject({ site: SiteTrackSchema }),
    z.strictObject({
      station: SiteTrackSchema.describe(
        'Point bodyAxis at a ground station (e.g. an antenna) and track it; its pass is the time above its elevation mask.',
      ),
    }),
    z.strictObject({ sun: z.strictObject(aimed).describe('Point bodyAxis (e.g. a panel normal) at the Sun, seen from the spacecraft.') }),
    z.strictObject({
      nadir: z
        .strictObject({
          yaw: z
            .enum(['lvlh', 'sun-steering'])
            .describe(
              '"lvlh": body axes on the orbit frame (bodyAxis to nadir, bodySecondary to the negative orbit normal); "sun-steering": bodyAxis to nadir, turned about it so bodySecondary lies toward the Sun in the nadir–Sun plane.',
            ),
          bodyAxis: vec3('Body axis held on nadir; +Z when absent.').optional(),
          bodySecondary: vec3('Body axis the yaw rule places; +Y (lvlh) or +X (sun-steering) when absent.').optional(),
        })
        .describe('Hold bodyAxis on nadir with a yaw rule about it.'),
    }),
  ])
  .describe('A moving target from the orbit: exactly one of "site", "station", "sun", "nadir".');

/** The keys that tell the track forms apart (issues.ts reports the chosen branch's problems). */
export const TRACK_FORMS = ['site', 'station', 'sun', 'nadir'] as const;
export type TrackForm = (typeof TRACK_FORMS)[number];

export const TargetWindowSchema = z
  .discriminatedUnion('start', [
    z.strictObject({
      start: z.literal('pass-start'),
      holdUntil: z.literal('pass-end').optional().describe('Hold to the end of the pass (holdS is then not used); absent: hold for holdS.'),
    }),
    z.strictObject({
      start: z.literal('time'),
      atUtc: isoUtc().describe('When tracking starts, ISO 8601 UTC with a trailing Z (23:59:60 allowed on a leap second).'),
    }),
  ])
  .describe(
    'When the target is due: "pass-start" — tracking starts when the next pass of its site or station above the elevation mask begins (the slew ends there); "time" — tracking starts at atUtc. The previous target is held until the slew must start.',
  );

export type OrbitSpec = z.infer<typeof OrbitSchema>;
export type TrackSpec = z.infer<typeof TrackSchema>;
export type TargetWindowSpec = z.infer<typeof TargetWindowSchema>;
export type SecondaryTowardSpec = z.infer<typeof SecondaryTowardSchema>;
export type GroundSiteSpec = z.infer<typeof GroundSiteSchema>;
