/**
 * Mean Keplerian elements at an epoch → the same SGP4 propagator as TLEs, through satellite.js
 * `json2satrec` with the fields of a CCSDS Orbit Mean-elements Message (OMM, CCSDS 502.0-B).
 *
 * Conventions (the units are the ones element sets are written in, and are named in the keys):
 * - Exactly one of `semiMajorAxisKm` or `meanMotionRevPerDay`. A semi-major axis becomes a mean
 *   motion by Kepler's third law with SGP4's own μ (WGS-72, 398 600.8 km³/s²); that is the Kozai
 *   mean motion an element set carries, so SGP4's internal (Brouwer) semi-major axis differs from
 *   the input by the J2 terms (a few km in LEO). These are SGP4 MEAN elements, not osculating ones.
 * - Angles in degrees: inclination in [0, 180]; RAAN, argument of perigee and mean anomaly any
 *   finite value (reduced to [0, 360)). Eccentricity 0 ≤ e < 1; perigee above the Earth.
 * - `bstarPerEarthRadii` (B*, 1/Earth radii) defaults to 0 (no drag); ṅ and n̈ are 0.
 * - The epoch is an ISO 8601 UTC string (time/iso.ts). satellite.js reads it with millisecond
 *   resolution, so finer digits are rounded to 1 ms (with a warning); an epoch inside a leap
 *   second is refused (SGP4 counts the epoch in days of 86 400 s).
 */
import { json2satrec, type OMMJsonObject } from 'satellite.js';
import { fail, issue, ok, type Issue, type Result } from '../errors';
import { parseUtcIso, utcLabelFromTai } from '../time/iso';
import { checkMeanOrbit, meanMotionRevPerDayFromSemiMajorAxis, sgp4ErrorText, type Sgp4Orbit } from './propagate';

export interface MeanElementsInput {
  name?: string;
  epochUtcIso: string;
  semiMajorAxisKm?: number;
  meanMotionRevPerDay?: number;
  eccentricity: number;
  inclinationDeg: number;
  raanDeg: number;
  argPerigeeDeg: number;
  meanAnomalyDeg: number;
  bstarPerEarthRadii?: number;
}

function finite(v: unknown): v is number {
  return typeof v === 'number' && Number.isFinite(v);
}

function wrap360(deg: number): number {
  const w = deg % 360;
  return w < 0 ? w + 360 : w;
}

/** Validate mean elements and initialise SGP4; every problem is reported together. */
export function orbitFromElements(input: MeanElementsInput, path = 'elements'): Result<Sgp4Orbit> {
  const errors: Issue[] = [];
  const warnings: Issue[] = [];
  const e = input as unknown as Record<string, unknown>;
  const need = (key: string, what: string) => {
    if (!finite(e[key]))
      errors.push(issue(`${path}.${key}`, 'finite', `${path}.${key}: ${what} must be a finite number (got ${String(e[key])})`));
  };
  need('eccentricity', 'eccentricity');
  need('inclinationDeg', 'inclination (deg)');
  need('raanDeg', 'right ascension of the ascending node (deg)');
  need('argPerigeeDeg', 'argument of perigee (deg)');
  need('meanAnomalyDeg', 'mean anomaly (deg)');
  if (e.bstarPerEarthRadii !== undefined) need('bstarPerEarthRadii', 'B* (1/Earth radii)');

  const hasA = e.semiMajorAxisKm !== undefined,
    hasN = e.meanMotionRevPerDay !== undefined;
  let n = NaN;
  if (hasA === hasN) errors.push(issue(path, 'one-of', `${path}: give exactly one of semiMajorAxisKm and meanMotionRevPerDay`));
  else if (hasA) {
    need('semiMajorAxisKm', 'semi-major axis (km)');
    if (finite(input.semiMajorAxisKm)) {
      if (input.semiMajorAxisKm <= 0) errors.push(issue(`${path}.semiMajorAxisKm`, 'positive', `${path}.semiMajorAxisKm must be > 0`));
      else n = meanMotionRevPerDayFromSemiMajorAxis(input.semiMajorAxisKm);
    }
  } else {
    need('meanMotionRevPerDay', 'mean motion (rev/day)');
    if (finite(input.meanMotionRevPerDay)) n = input.meanMotionRevPerDay;
  }
  if (finite(input.inclinationDeg) && (input.inclinationDeg < 0 || input.inclinationDeg > 180))
    errors.push(
      issue(`${path}.inclinationDeg`, 'range', `${path}.inclinationDeg: inclination must be in [0, 180]° (got ${input.inclinationDeg})`),
    );
  if (finite(input.eccentricity)) {
    const paths = {
      eccentricity: `${path}.eccentricity`,
      meanMotion: `${path}.${hasA ? 'semiMajorAxisKm' : 'meanMotionRevPerDay'}`,
      perigee: path,
    };
    if (finite(n)) checkMeanOrbit(n, input.eccentricity, paths, errors, warnings);
    else if (!(input.eccentricity >= 0 && input.eccentricity < 1)) checkMeanOrbit(1, input.eccentricity, paths, errors, []);
  }

  const ep = parseUtcIso(input.epochUtcIso, `${path}.epochUtcIso`);
  if (!ep.ok) errors.push(...ep.errors);
  else {
    warnings.push(...ep.warnings);
    if (ep.value.second >= 60)
      errors.push(
        issue(`${path}.epochUtcIso`, 'leap-second', `${path}.epochUtcIso: an element epoch inside a leap second cannot be given to SGP4`),
      );
  }
  if (errors.length || !ep.ok) return fail(errors, warnings);

  // satellite.js reads EPOCH with Date (1 ms); use the same rounded instant for our time base.
  const epochIsoMs = utcLabelFromTai(ep.value.taiS, 3) + 'Z';
  const rounded = parseUtcIso(epochIsoMs);
  if (!rounded.ok) return fail(rounded.errors, warnings);
  if (Math.abs(rounded.value.taiS - ep.value.taiS) > 1e-7)
    warnings.push(
      issue(`${path}.epochUtcIso`, 'epoch-rounded', `${path}.epochUtcIso: rounded to the millisecond (${epochIsoMs}) for SGP4`),
    );

  const omm: OMMJsonObject = {
    OBJECT_NAME: input.name ?? 'ELEMENTS',
    OBJECT_ID: 'UNKNOWN',
    EPOCH: epochIsoMs,
    MEAN_MOTION: n,
    ECCENTRICITY: input.eccentricity,
    INCLINATION: input.inclinationDeg,
    RA_OF_ASC_NODE: wrap360(input.raanDeg),
    ARG_OF_PERICENTER: wrap360(input.argPerigeeDeg),
    MEAN_ANOMALY: wrap360(input.meanAnomalyDeg),
    NORAD_CAT_ID: 0,
    ELEMENT_SET_NO: 0,
    BSTAR: input.bstarPerEarthRadii ?? 0,
    MEAN_MOTION_DOT: 0,
    MEAN_MOTION_DDOT: 0,
  };
  const satrec = json2satrec(omm);
  if (satrec.error !== 0)
    return fail([issue(path, 'propagator-init', `${path}: SGP4 initialisation failed: ${sgp4ErrorText(satrec.error)}`)], warnings);
  return ok(
    { name: input.name ?? 'elements', origin: 'elements', satrec, epochTaiS: rounded.value.taiS, epochUtcIso: epochIsoMs },
    warnings,
  );
}
