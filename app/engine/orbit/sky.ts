/**
 * Sun, Moon and the Earth's shadow.
 *
 * Conventions:
 * - Positions are GEOCENTRIC in EME2000 (frames.ts), metres, from astronomy-engine evaluated at TT
 *   from the library's leap-second table (frames.ts astroTimeFromTai). The Sun is the APPARENT
 *   geocentric position (light-time and annual aberration corrected, GeoVector(Sun, t, true): the
 *   direction sunlight arrives from); the Moon is geometric (GeoMoon; light time ≈ 1.3 s).
 *   Directions from a spacecraft subtract its position (ephemeris.ts does this: the Sun's parallax
 *   from LEO is ≈ 10″, the Moon's up to ≈ 1°).
 * - Shadow: CONICAL model with a spherical Earth and Sun, both umbra and penumbra (Montenbruck &
 *   Gill, "Satellite Orbits", Springer 2000, §3.4.2, from memory on the section number). Seen from
 *   the spacecraft the Sun's disc has angular radius a = asin(R☉ / |s − r|), the Earth's
 *   b = asin(R⊕ / |r|), and their centres are c apart (angle between −r and s − r):
 *     c ≥ a + b: sunlit (ν = 1);  b − a ≥ c: umbra (ν = 0);  a − b ≥ c: annular (ν = 1 − b²/a²);
 *     otherwise penumbra, ν = 1 − A/(π a²) with the overlap of the two discs (treated as flat)
 *     A = a² acos(x/a) + b² acos((c − x)/b) − c y, x = (c² + a² − b²)/(2c), y = √(a² − x²).
 *   ν is the fraction of the solar disc visible. R⊕ = 6 378 137 m (WGS-84 equatorial: the
 *   oblate Earth's polar flattening, ≤ 21 km, and the atmosphere are NOT modelled; shadow entry and
 *   exit can therefore be off by several seconds in LEO). R☉ = 695 700 km (IAU 2015 Resolution B3
 *   nominal solar radius). The radii are parameters so that callers may choose others.
 */
import { Body, GeoMoon, GeoVector, KM_PER_AU } from 'astronomy-engine';
import type { Vec3 } from '../math/mat3';
import { astroTimeFromTai } from './frames';

export const SUN_RADIUS_M = 695_700e3;
export const SHADOW_EARTH_RADIUS_M = 6_378_137;
const M_PER_AU = KM_PER_AU * 1000;

/** Apparent geocentric Sun position in EME2000 (m) at TAI instant taiS; returns its distance (m). */
export function sunPositionEme2000(out: Vec3, taiS: number): number {
  const v = GeoVector(Body.Sun, astroTimeFromTai(taiS), true);
  out[0] = v.x * M_PER_AU;
  out[1] = v.y * M_PER_AU;
  out[2] = v.z * M_PER_AU;
  return Math.hypot(out[0], out[1], out[2]);
}

/** Geocentric Moon position in EME2000 (m); returns its distance (m). */
export function moonPositionEme2000(out: Vec3, taiS: number): number {
  const v = GeoMoon(astroTimeFromTai(taiS));
  out[0] = v.x * M_PER_AU;
  out[1] = v.y * M_PER_AU;
  out[2] = v.z * M_PER_AU;
  return Math.hypot(out[0], out[1], out[2]);
}

/** Unit vector of the geocentric Sun in EME2000; returns the distance (m). */
export function sunDirectionEme2000(outDir: Vec3, taiS: number): number {
  const d = sunPositionEme2000(outDir, taiS);
  outDir[0] = outDir[0]! / d;
  outDir[1] = outDir[1]! / d;
  outDir[2] = outDir[2]! / d;
  return d;
}

/** Unit vector of the geocentric Moon in EME2000; returns the distance (m). */
export function moonDirectionEme2000(outDir: Vec3, taiS: number): number {
  const d = moonPositionEme2000(outDir, taiS);
  outDir[0] = outDir[0]! / d;
  outDir[1] = outDir[1]! / d;
  outDir[2] = outDir[2]! / d;
  return d;
}

/** Angular radius (rad) of a spherical Earth of radius earthRadiusM seen from r (m). */
export function earthAngularRadiusRad(r: ArrayLike<number>, earthRadiusM = SHADOW_EARTH_RADIUS_M): number {
  const d = Math.hypot(r[0]!, r[1]!, r[2]!);
  return d > earthRadiusM ? Math.asin(earthRadiusM / d) : Math.PI / 2;
}

export const SUNLIT = 0;
export const PENUMBRA = 1;
export const UMBRA = 2;
export const ANNULAR = 3;

export interface ShadowInfo {
  /** SUNLIT, PENUMBRA, UMBRA or ANNULAR. */
  state: number;
  /** Visible fraction ν of the solar disc, 0 (umbra) … 1 (sunlit). */
  sunFraction: number;
  /** a, b and c of the header (rad). */
  sunAngularRadiusRad: number;
  earthAngularRadiusRad: number;
  separationRad: number;
}

export function createShadowInfo(): ShadowInfo {
  return { state: SUNLIT, sunFraction: 1, sunAngularRadiusRad: 0, earthAngularRadiusRad: 0, separationRad: 0 };
}

/**
 * Conical shadow of the Earth at spacecraft position r (m) with the Sun at geocentric s (m),
 * same frame; into out (returned). No allocation.
 */
export function conicalShadow(
  out: ShadowInfo,
  r: ArrayLike<number>,
  s: ArrayLike<number>,
  earthRadiusM = SHADOW_EARTH_RADIUS_M,
  sunRadiusM = SUN_RADIUS_M,
): ShadowInfo {
  const rx = r[0]!,
    ry = r[1]!,
    rz = r[2]!;
  const dx = s[0]! - rx,
    dy = s[1]! - ry,
    dz = s[2]! - rz;
  const rn = Math.hypot(rx, ry, rz),
    dn = Math.hypot(dx, dy, dz);
  const a = Math.asin(Math.min(1, sunRadiusM / dn));
  const b = rn > earthRadiusM ? Math.asin(earthRadiusM / rn) : Math.PI / 2;
  const cosc = -(rx * dx + ry * dy + rz * dz) / (rn * dn);
  const c = Math.acos(Math.max(-1, Math.min(1, cosc)));
  out.sunAngularRadiusRad = a;
  out.earthAngularRadiusRad = b;
  out.separationRad = c;
  if (c >= a + b) {
    out.state = SUNLIT;
    out.sunFraction = 1;
  } else if (c <= b - a) {
    out.state = UMBRA;
    out.sunFraction = 0;
  } else if (c <= a - b) {
    out.state = ANNULAR;
    out.sunFraction = 1 - (b * b) / (a * a);
  } else {
    const x = (c * c + a * a - b * b) / (2 * c);
    const y = Math.sqrt(Math.max(0, a * a - x * x));
    const area = a * a * Math.acos(Math.max(-1, Math.min(1, x / a))) + b * b * Math.acos(Math.max(-1, Math.min(1, (c - x) / b))) - c * y;
    out.state = PENUMBRA;
    out.sunFraction = 1 - area / (Math.PI * a * a);
  }
  return out;
}
