/**
 * Ground sites and stations: WGS-84 geodetic ↔ Earth-fixed, site position in EME2000, and the
 * topocentric azimuth / elevation / range of a spacecraft.
 *
 * Conventions:
 * - WGS-84 ellipsoid, NIMA TR8350.2 (3rd ed., 2000), Table 3.1: a = 6 378 137 m,
 *   1/f = 298.257 223 563. Geodetic latitude φ (normal to the ellipsoid), longitude λ east-positive,
 *   height h above the ellipsoid; radians and metres. Earth-fixed = ITRF without polar motion
 *   (frames.ts).
 * - Geodetic → Earth-fixed is the closed form (N = a / √(1 − e² sin²φ)). Earth-fixed → geodetic is
 *   the classical fixed-point iteration on latitude, φ ← atan2(z + e² N sin φ, p), run to
 *   convergence (|Δφ| < 1e-14 rad, ~6 iterations; contraction factor ≈ e²), with
 *   h = p cos φ + z sin φ − a √(1 − e² sin²φ), valid at every latitude.
 * - Topocentric frame: east, north, up (up = the geodetic normal). Azimuth from north, clockwise
 *   (toward east), in [0, 2π); elevation above the plane normal to the geodetic up; range in metres.
 */
import { fail, issue, ok, type Issue, type Result } from '../errors';
import type { Vec3 } from '../math/mat3';
import { ecefToEme2000, eme2000ToEcef } from './frames';

export const WGS84_A_M = 6378137.0;
export const WGS84_INV_F = 298.257223563;
export const WGS84_F = 1 / WGS84_INV_F;
export const WGS84_E2 = WGS84_F * (2 - WGS84_F);

/** Earth-fixed position (m) of a geodetic point, into out. */
export function geodeticToEcef(out: Vec3, latRad: number, lonRad: number, heightM: number): Vec3 {
  const sl = Math.sin(latRad),
    cl = Math.cos(latRad);
  const n = WGS84_A_M / Math.sqrt(1 - WGS84_E2 * sl * sl);
  out[0] = (n + heightM) * cl * Math.cos(lonRad);
  out[1] = (n + heightM) * cl * Math.sin(lonRad);
  out[2] = (n * (1 - WGS84_E2) + heightM) * sl;
  return out;
}

/** Geodetic [lat rad, lon rad in (−π, π], height m] of an Earth-fixed position, into out. */
export function ecefToGeodetic(out: Vec3, ecef: ArrayLike<number>): Vec3 {
  const x = ecef[0]!,
    y = ecef[1]!,
    z = ecef[2]!;
  const p = Math.hypot(x, y);
  let lat = Math.atan2(z, p * (1 - WGS84_E2));
  for (let k = 0; k < 30; k++) {
    const s = Math.sin(lat);
    const n = WGS84_A_M / Math.sqrt(1 - WGS84_E2 * s * s);
    const next = Math.atan2(z + WGS84_E2 * n * s, p);
    const done = Math.abs(next - lat) < 1e-14;
    lat = next;
    if (done) break;
  }
  const s = Math.sin(lat),
    c = Math.cos(lat);
  out[0] = lat;
  out[1] = Math.atan2(y, x);
  out[2] = p * c + z * s - WGS84_A_M * Math.sqrt(1 - WGS84_E2 * s * s);
  return out;
}

export interface SiteInput {
  name: string;
  latitudeRad: number;
  longitudeRad: number;
  heightM: number;
  /** Elevation mask (rad); 0 when omitted. */
  elevationMaskRad?: number;
}

/** A validated site with its Earth-fixed position and local axes (plain data, structured-clonable). */
export interface Site {
  name: string;
  latitudeRad: number;
  longitudeRad: number;
  heightM: number;
  elevationMaskRad: number;
  /** Earth-fixed position (m). */
  ecefM: Float64Array;
  /** Local east, north and up unit vectors in Earth-fixed axes. */
  eastEcef: Float64Array;
  northEcef: Float64Array;
  upEcef: Float64Array;
}

/**
 * Validate a site: latitude in [−π/2, π/2], longitude finite (reduced to (−π, π]), |height| ≤ 100 km
 * (a ground site near the ellipsoid; common practice, no source), mask in [−π/2, π/2).
 */
export function makeSite(input: SiteInput, path = 'site'): Result<Site> {
  const errors: Issue[] = [];
  const fin = (k: keyof SiteInput, v: unknown) => {
    const okv = typeof v === 'number' && Number.isFinite(v);
    if (!okv) errors.push(issue(`${path}.${k}`, 'finite', `${path}.${k} must be a finite number (got ${String(v)})`));
    return okv;
  };
  const mask = input.elevationMaskRad ?? 0;
  if (fin('latitudeRad', input.latitudeRad) && Math.abs(input.latitudeRad) > Math.PI / 2)
    errors.push(issue(`${path}.latitudeRad`, 'range', `${path}.latitudeRad must be within ±π/2 (got ${input.latitudeRad})`));
  fin('longitudeRad', input.longitudeRad);
  if (fin('heightM', input.heightM) && Math.abs(input.heightM) > 100e3)
    errors.push(issue(`${path}.heightM`, 'range', `${path}.heightM must be within ±100 km of the ellipsoid (got ${input.heightM} m)`));
  if (fin('elevationMaskRad', mask) && (mask < -Math.PI / 2 || mask >= Math.PI / 2))
    errors.push(issue(`${path}.elevationMaskRad`, 'range', `${path}.elevationMaskRad must be in [−π/2, π/2) (got ${mask})`));
  if (errors.length) return fail(errors);
  const lon = Math.atan2(Math.sin(input.longitudeRad), Math.cos(input.longitudeRad));
  const lat = input.latitudeRad;
  const sl = Math.sin(lat),
    cl = Math.cos(lat),
    so = Math.sin(lon),
    co = Math.cos(lon);
  return ok({
    name: input.name,
    latitudeRad: lat,
    longitudeRad: lon,
    heightM: input.heightM,
    elevationMaskRad: mask,
    ecefM: geodeticToEcef(new Float64Array(3), lat, lon, input.heightM),
    eastEcef: Float64Array.of(-so, co, 0),
    northEcef: Float64Array.of(-sl * co, -sl * so, cl),
    upEcef: Float64Array.of(cl * co, cl * so, sl),
  });
}

/** Site position (m) and velocity (m/s, Earth rotation) in EME2000 at TAI instant taiS. */
export function siteEme2000(outR: Vec3, outV: Vec3 | null, site: Site, taiS: number): void {
  ecefToEme2000(outR, outV, site.ecefM, null, taiS);
}

export interface LookAngles {
  azimuthRad: number;
  elevationRad: number;
  rangeM: number;
}

export function createLookAngles(): LookAngles {
  return { azimuthRad: 0, elevationRad: 0, rangeM: 0 };
}

/** Azimuth, elevation and range of an Earth-fixed point (m) seen from a site, into out. */
export function lookAnglesEcef(out: LookAngles, site: Site, targetEcefM: ArrayLike<number>): LookAngles {
  const dx = targetEcefM[0]! - site.ecefM[0]!,
    dy = targetEcefM[1]! - site.ecefM[1]!,
    dz = targetEcefM[2]! - site.ecefM[2]!;
  const e = site.eastEcef,
    n = site.northEcef,
    u = site.upEcef;
  const east = dx * e[0]! + dy * e[1]! + dz * e[2]!;
  const north = dx * n[0]! + dy * n[1]! + dz * n[2]!;
  const up = dx * u[0]! + dy * u[1]! + dz * u[2]!;
  const range = Math.hypot(east, north, up);
  let az = Math.atan2(east, north);
  if (az < 0) az += 2 * Math.PI;
  out.azimuthRad = az;
  out.elevationRad = range > 0 ? Math.asin(up / range) : Math.PI / 2;
  out.rangeM = range;
  return out;
}

const scratchEcef = new Float64Array(3);

/** Look angles of a spacecraft at EME2000 position rEmeM (m) at TAI instant taiS. */
export function lookAnglesEme2000(out: LookAngles, site: Site, rEmeM: ArrayLike<number>, taiS: number): LookAngles {
  eme2000ToEcef(scratchEcef, null, rEmeM, null, taiS);
  return lookAnglesEcef(out, site, scratchEcef);
}
