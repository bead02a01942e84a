/**
 * The one propagator: SGP4/SDP4 from satellite.js (Vallado, Crawford, Hujsak & Kelso, "Revisiting
 * Spacetrack Report #3", AIAA 2006-6753), fed either by a two-line element set (tle.ts) or by
 * mean elements (elements.ts).
 *
 * Conventions:
 * - Output frame TEME (true equator, mean equinox of date, the frame SGP4 works in); frames.ts
 *   turns it into EME2000. Units here are SI: metres and metres per second (satellite.js uses km).
 * - Time argument: SGP4's "minutes since epoch" is taken as ELAPSED SI seconds between the element
 *   epoch and the requested TAI instant (time/scales.ts), divided by 60. Software that differences
 *   UTC Julian dates instead differs by one second for each leap second between the two instants.
 * - Gravity model and mode: satellite.js's, i.e. WGS-72 constants (μ = 398 600.8 km³/s²,
 *   R = 6378.135 km) and the "improved" operation mode, as in the verification of AIAA 2006-6753.
 */
import { constants, sgp4, type SatRec } from 'satellite.js';
import { issue, type Issue } from '../errors';
import type { Vec3 } from '../math/mat3';
import { S_PER_DAY } from '../units';

export interface Sgp4Orbit {
  /** A name for people (TLE title line, or the element set's name). */
  name: string;
  origin: 'tle' | 'elements';
  /** satellite.js propagation record (plain data; read-only after initialisation). */
  satrec: SatRec;
  /** Element epoch as TAI seconds since 2000-01-01T12:00:00 TAI (time/scales.ts). */
  epochTaiS: number;
  /** Element epoch in ISO 8601 UTC. */
  epochUtcIso: string;
}

/** SGP4's gravitational parameter (WGS-72), km³/s², and equatorial radius, km (satellite.js). */
export const SGP4_MU_KM3_S2 = constants.mu;
export const SGP4_EARTH_RADIUS_KM = constants.earthRadius;

/**
 * Spans farther than this from the element epoch draw a warning. 14 days is common practice, no
 * source: the accuracy of SGP4 element sets degrades by roughly a kilometre or more per day from
 * epoch, and element sets are normally refreshed well within two weeks.
 */
export const FAR_FROM_EPOCH_S = 14 * S_PER_DAY;

/** Text of satellite.js SatRecError codes. */
export const SGP4_ERROR_TEXT: Record<number, string> = {
  1: 'mean eccentricity out of range 0 ≤ e < 1',
  2: 'mean motion fell below zero',
  3: 'perturbed eccentricity out of range 0 ≤ e < 1',
  4: 'semi-latus rectum fell below zero',
  6: 'orbit decayed: the position is below the Earth’s surface',
};

export function sgp4ErrorText(code: number): string {
  return SGP4_ERROR_TEXT[code] ?? `SGP4 error code ${code}`;
}

/**
 * Position (m) and velocity (m/s) in TEME at TAI instant taiS. Returns 0 on success, otherwise
 * the SGP4 error code (outputs are then NaN). Allocates the small objects satellite.js returns:
 * meant for ephemeris precomputation, not for a per-sample loop (ephemeris.ts is).
 */
export function sgp4Teme(outPosM: Vec3, outVelMps: Vec3, orbit: Sgp4Orbit, taiS: number): number {
  const pv = sgp4(orbit.satrec, (taiS - orbit.epochTaiS) / 60);
  if (!pv || orbit.satrec.error !== 0) {
    outPosM.fill(NaN);
    outVelMps.fill(NaN);
    return orbit.satrec.error || 1;
  }
  outPosM[0] = pv.position.x * 1000;
  outPosM[1] = pv.position.y * 1000;
  outPosM[2] = pv.position.z * 1000;
  outVelMps[0] = pv.velocity.x * 1000;
  outVelMps[1] = pv.velocity.y * 1000;
  outVelMps[2] = pv.velocity.z * 1000;
  return 0;
}

/** Warnings when [taiStart, taiEnd] reaches farther than FAR_FROM_EPOCH_S from the element epoch. */
export function checkPropagationSpan(orbit: Sgp4Orbit, taiStart: number, taiEnd: number, path = 'orbit'): Issue[] {
  const far = Math.max(Math.abs(taiStart - orbit.epochTaiS), Math.abs(taiEnd - orbit.epochTaiS));
  if (far <= FAR_FROM_EPOCH_S) return [];
  return [
    issue(
      path,
      'far-from-epoch',
      `${path}: the requested times reach ${(far / S_PER_DAY).toFixed(1)} days from the element epoch ${orbit.epochUtcIso}; ` +
        `SGP4 element sets are normally used within 14 days of epoch (common practice): expect errors of kilometres or more`,
    ),
  ];
}

/**
 * Range checks shared by TLEs and mean elements: 0 ≤ e < 1, n > 0, perigee above the Earth
 * (SGP4's radius). Perigee below 150 km is a warning (common practice, no source: drag then
 * dominates and SGP4 is not meant for re-entry).
 */
export function checkMeanOrbit(
  meanMotionRevPerDay: number,
  eccentricity: number,
  paths: { eccentricity: string; meanMotion: string; perigee: string },
  errors: Issue[],
  warnings: Issue[],
): void {
  if (!(eccentricity >= 0 && eccentricity < 1))
    errors.push(
      issue(paths.eccentricity, 'eccentricity', `${paths.eccentricity}: eccentricity must satisfy 0 ≤ e < 1 (got ${eccentricity})`),
    );
  if (!(meanMotionRevPerDay > 0)) {
    errors.push(
      issue(
        paths.meanMotion,
        'mean-motion',
        `${paths.meanMotion}: mean motion must be greater than zero (got ${meanMotionRevPerDay} rev/day)`,
      ),
    );
    return;
  }
  if (!(eccentricity >= 0 && eccentricity < 1)) return;
  const aKm = semiMajorAxisKmFromMeanMotion(meanMotionRevPerDay);
  const perigeeKm = aKm * (1 - eccentricity) - SGP4_EARTH_RADIUS_KM;
  const path = paths.perigee;
  if (perigeeKm <= 0)
    errors.push(
      issue(
        path,
        'perigee',
        `${path}: perigee ${perigeeKm.toFixed(1)} km is below the Earth's surface (a = ${aKm.toFixed(1)} km, e = ${eccentricity})`,
      ),
    );
  else if (perigeeKm < 150)
    warnings.push(
      issue(path, 'low-perigee', `${path}: perigee height ${perigeeKm.toFixed(1)} km is below 150 km; SGP4 is not meant for re-entry`),
    );
}

/** Kepler's third law with SGP4's μ: semi-major axis (km) of a mean motion (rev/day). */
export function semiMajorAxisKmFromMeanMotion(revPerDay: number): number {
  const n = (revPerDay * 2 * Math.PI) / S_PER_DAY;
  return Math.cbrt(SGP4_MU_KM3_S2 / (n * n));
}

/** Kepler's third law with SGP4's μ: mean motion (rev/day) of a semi-major axis (km). */
export function meanMotionRevPerDayFromSemiMajorAxis(aKm: number): number {
  return (Math.sqrt(SGP4_MU_KM3_S2 / (aKm * aKm * aKm)) * S_PER_DAY) / (2 * Math.PI);
}
