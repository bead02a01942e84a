/**
 * Evaluating an ephemeris (ephemeris.ts) at plan time t: no allocation, caller buffers only.
 *
 * - `sampleEphemeris`: everything a control sample needs — r, v (EME2000), the unit directions
 *   from the SPACECRAFT to the Sun and to the Moon with their distances, and the eclipse state
 *   (conical shadow, sky.ts). Goal ≤ 2 µs per call (test/bench/orbit.ts).
 * - `orbitStateAt`: r, v, a and jerk for pointing-target derivatives.
 * - `sunStateAt` / `moonStateAt`: geocentric positions and velocities.
 * - `siteStateAt`: a ground site's position, velocity and acceleration in EME2000;
 *   `earthFixedDirectionAt`: an Earth-fixed direction (e.g. a site's local up) and its rate.
 * Times outside [startS, endS] give NaN (no extrapolation).
 */
import type { Vec3 } from '../math/mat3';
import type { Site } from './sites';
import { ORBIT_STRIDE, BODY_STRIDE, frameMatrixAt, type Ephemeris } from './ephemeris';
import { EARTH_ROTATION_RATE_RAD_S } from './frames';
import { SUN_RADIUS_M, SHADOW_EARTH_RADIUS_M, SUNLIT, UMBRA, PENUMBRA, ANNULAR } from './sky';

export interface EphemerisSample {
  /** Spacecraft position (m) and velocity (m/s), EME2000. */
  r: Float64Array;
  v: Float64Array;
  /** Unit vectors spacecraft → Sun and spacecraft → Moon, EME2000. */
  sunDir: Float64Array;
  moonDir: Float64Array;
  sunDistanceM: number;
  moonDistanceM: number;
  /** Shadow state (sky.ts SUNLIT, PENUMBRA, UMBRA, ANNULAR) and visible solar-disc fraction. */
  shadow: number;
  sunFraction: number;
  /** 1 when any part of the Sun is hidden by the Earth (penumbra, umbra or annular), else 0. */
  eclipse: number;
}

export function createEphemerisSample(): EphemerisSample {
  return {
    r: new Float64Array(3),
    v: new Float64Array(3),
    sunDir: new Float64Array(3),
    moonDir: new Float64Array(3),
    sunDistanceM: 0,
    moonDistanceM: 0,
    shadow: SUNLIT,
    sunFraction: 1,
    eclipse: 0,
  };
}

/**
 * Cubic Hermite of one 3-vector pair stored at `o0`/`o1` (values at +vo, slopes at +so) into
 * outP (value) and outD (derivative; may be null) at normalised s ∈ [0, 1] over step h.
 */
function hermite(
  outP: Float64Array,
  outD: Float64Array | null,
  outDD: Float64Array | null,
  d: Float64Array,
  o0: number,
  o1: number,
  vo: number,
  so: number,
  s: number,
  h: number,
): void {
  const s2 = s * s,
    s3 = s2 * s;
  const h00 = 2 * s3 - 3 * s2 + 1,
    h10 = (s3 - 2 * s2 + s) * h,
    h01 = -2 * s3 + 3 * s2,
    h11 = (s3 - s2) * h;
  for (let i = 0; i < 3; i++) {
    const p0 = d[o0 + vo + i]!,
      m0 = d[o0 + so + i]!,
      p1 = d[o1 + vo + i]!,
      m1 = d[o1 + so + i]!;
    outP[i] = h00 * p0 + h10 * m0 + h01 * p1 + h11 * m1;
    if (outD) outD[i] = ((6 * s2 - 6 * s) * (p0 - p1)) / h + (3 * s2 - 4 * s + 1) * m0 + (3 * s2 - 2 * s) * m1;
    if (outDD) outDD[i] = ((12 * s - 6) * (p0 - p1)) / (h * h) + ((6 * s - 4) * m0 + (6 * s - 2) * m1) / h;
  }
}

/** Orbit-node interval index and normalised offset; -1 outside the span. */
function orbitCell(eph: Ephemeris, t: number): number {
  if (!(t >= eph.startS && t <= eph.endS)) return -1;
  return Math.min(Math.floor((t - eph.startS) / eph.orbitStepS), eph.orbitNodeCount - 2);
}

const nanFill = (...vs: (Float64Array | null)[]) => vs.forEach((v) => v?.fill(NaN));

/** Spacecraft r (m), v (m/s), a (m/s²) and jerk (m/s³) in EME2000 at plan time t (any out may be null). */
export function orbitStateAt(
  outR: Float64Array | null,
  outV: Float64Array | null,
  outA: Float64Array | null,
  outJ: Float64Array | null,
  eph: Ephemeris,
  t: number,
): boolean {
  const k = orbitCell(eph, t);
  if (k < 0) {
    nanFill(outR, outV, outA, outJ);
    return false;
  }
  const h = eph.orbitStepS,
    s = (t - eph.startS) / h - k;
  const o0 = k * ORBIT_STRIDE,
    o1 = o0 + ORBIT_STRIDE;
  if (outR) hermite(outR, null, null, eph.orbit, o0, o1, 0, 3, s, h);
  if (outV || outA || outJ) hermite(outV ?? scratchV, outA ?? scratchA, outJ, eph.orbit, o0, o1, 3, 6, s, h);
  return true;
}

const scratchV = new Float64Array(3),
  scratchA = new Float64Array(3);

/** Catmull–Rom interpolation of a body (Sun: offset 0, Moon: offset 3) at plan time t. */
function bodyAt(outP: Float64Array, outV: Float64Array | null, eph: Ephemeris, t: number, off: number): void {
  const u = (t - eph.bodyStartS) / eph.bodyStepS;
  const j = Math.floor(u);
  const s = u - j,
    H = eph.bodyStepS,
    b = eph.bodies;
  const om = (j - 1) * BODY_STRIDE + off,
    o0 = om + BODY_STRIDE,
    o1 = o0 + BODY_STRIDE,
    o2 = o1 + BODY_STRIDE;
  const s2 = s * s,
    s3 = s2 * s;
  const h00 = 2 * s3 - 3 * s2 + 1,
    h10 = s3 - 2 * s2 + s,
    h01 = -2 * s3 + 3 * s2,
    h11 = s3 - s2;
  for (let i = 0; i < 3; i++) {
    const p0 = b[o0 + i]!,
      p1 = b[o1 + i]!;
    const m0 = 0.5 * (p1 - b[om + i]!),
      m1 = 0.5 * (b[o2 + i]! - p0); // slopes × H
    outP[i] = h00 * p0 + h10 * m0 + h01 * p1 + h11 * m1;
    if (outV) outV[i] = ((6 * s2 - 6 * s) * (p0 - p1) + (3 * s2 - 4 * s + 1) * m0 + (3 * s2 - 2 * s) * m1) / H;
  }
}

/** Geocentric Sun position (m) and velocity (m/s, may be null), EME2000. */
export function sunStateAt(outP: Float64Array, outV: Float64Array | null, eph: Ephemeris, t: number): boolean {
  if (!(t >= eph.startS && t <= eph.endS)) {
    nanFill(outP, outV);
    return false;
  }
  bodyAt(outP, outV, eph, t, 0);
  return true;
}

/** Geocentric Moon position (m) and velocity (m/s, may be null), EME2000. */
export function moonStateAt(outP: Float64Array, outV: Float64Array | null, eph: Ephemeris, t: number): boolean {
  if (!(t >= eph.startS && t <= eph.endS)) {
    nanFill(outP, outV);
    return false;
  }
  bodyAt(outP, outV, eph, t, 3);
  return true;
}

const sun = new Float64Array(3),
  moon = new Float64Array(3);

/** Everything a control sample needs at plan time t, into out (see EphemerisSample). */
export function sampleEphemeris(out: EphemerisSample, eph: Ephemeris, t: number): boolean {
  if (!orbitStateAt(out.r, out.v, null, null, eph, t)) {
    nanFill(out.sunDir, out.moonDir);
    out.sunDistanceM = out.moonDistanceM = out.sunFraction = out.shadow = out.eclipse = NaN;
    return false;
  }
  bodyAt(sun, null, eph, t, 0);
  bodyAt(moon, null, eph, t, 3);
  const r = out.r;
  const rx = r[0]!,
    ry = r[1]!,
    rz = r[2]!;
  const sx = sun[0]! - rx,
    sy = sun[1]! - ry,
    sz = sun[2]! - rz;
  const sd = Math.sqrt(sx * sx + sy * sy + sz * sz);
  out.sunDir[0] = sx / sd;
  out.sunDir[1] = sy / sd;
  out.sunDir[2] = sz / sd;
  out.sunDistanceM = sd;
  const mx = moon[0]! - rx,
    my = moon[1]! - ry,
    mz = moon[2]! - rz;
  const md = Math.sqrt(mx * mx + my * my + mz * mz);
  out.moonDir[0] = mx / md;
  out.moonDir[1] = my / md;
  out.moonDir[2] = mz / md;
  out.moonDistanceM = md;
  // Conical shadow (sky.ts conicalShadow, inlined to share the distances computed above).
  const rn = Math.sqrt(rx * rx + ry * ry + rz * rz);
  const a = Math.asin(SUN_RADIUS_M / sd);
  const bE = rn > SHADOW_EARTH_RADIUS_M ? Math.asin(SHADOW_EARTH_RADIUS_M / rn) : Math.PI / 2;
  const c = Math.acos(Math.max(-1, Math.min(1, -(rx * sx + ry * sy + rz * sz) / (rn * sd))));
  if (c >= a + bE) {
    out.shadow = SUNLIT;
    out.sunFraction = 1;
  } else if (c <= bE - a) {
    out.shadow = UMBRA;
    out.sunFraction = 0;
  } else if (c <= a - bE) {
    out.shadow = ANNULAR;
    out.sunFraction = 1 - (bE * bE) / (a * a);
  } else {
    const x = (c * c + a * a - bE * bE) / (2 * c);
    const y = Math.sqrt(Math.max(0, a * a - x * x));
    const area = a * a * Math.acos(Math.max(-1, Math.min(1, x / a))) + bE * bE * Math.acos(Math.max(-1, Math.min(1, (c - x) / bE))) - c * y;
    out.shadow = PENUMBRA;
    out.sunFraction = 1 - area / (Math.PI * a * a);
  }
  out.eclipse = out.shadow === SUNLIT ? 0 : 1;
  return true;
}

const frame = new Float64Array(9),
  rt = new Float64Array(3);

/**
 * A ground site's position (m), velocity (m/s) and acceleration (m/s²) in EME2000 at plan time t
 * (outV/outA may be null): Earth rotation about the TEME z axis at EARTH_ROTATION_RATE_RAD_S with
 * θ interpolated between orbit nodes, then M_EME2000←TEME (its own turn rate, ~1e-12 rad/s, neglected).
 */
export function siteStateAt(outR: Vec3, outV: Vec3 | null, outA: Vec3 | null, eph: Ephemeris, site: Site, t: number): boolean {
  const k = orbitCell(eph, t);
  if (k < 0) {
    nanFill(outR, outV, outA);
    return false;
  }
  const o = k * ORBIT_STRIDE + 9;
  const s = (t - eph.startS) / eph.orbitStepS - k;
  const theta = eph.orbit[o]! + s * (eph.orbit[o + ORBIT_STRIDE]! - eph.orbit[o]!);
  const c = Math.cos(theta),
    sn = Math.sin(theta);
  const e = site.ecefM;
  rt[0] = c * e[0]! - sn * e[1]!;
  rt[1] = sn * e[0]! + c * e[1]!;
  rt[2] = e[2]!;
  frameMatrixAt(frame, eph, t);
  const w = EARTH_ROTATION_RATE_RAD_S;
  const f = frame;
  const x = rt[0]!,
    y = rt[1]!,
    z = rt[2]!;
  outR[0] = f[0]! * x + f[3]! * y + f[6]! * z;
  outR[1] = f[1]! * x + f[4]! * y + f[7]! * z;
  outR[2] = f[2]! * x + f[5]! * y + f[8]! * z;
  if (outV) {
    // ω ẑ × r_T = (−ω y, ω x, 0)
    outV[0] = w * (-f[0]! * y + f[3]! * x);
    outV[1] = w * (-f[1]! * y + f[4]! * x);
    outV[2] = w * (-f[2]! * y + f[5]! * x);
  }
  if (outA) {
    // ω ẑ × (ω ẑ × r_T) = (−ω² x, −ω² y, 0)
    const w2 = w * w;
    outA[0] = -w2 * (f[0]! * x + f[3]! * y);
    outA[1] = -w2 * (f[1]! * x + f[4]! * y);
    outA[2] = -w2 * (f[2]! * x + f[5]! * y);
  }
  return true;
}

/**
 * An Earth-fixed direction (e.g. a site's geodetic up) in EME2000 at plan time t, and its rate
 * (ω⊕ ẑ × u in TEME, then M; may be null), with the same θ and M as siteStateAt.
 */
export function earthFixedDirectionAt(out: Vec3, outRate: Vec3 | null, eph: Ephemeris, dirEcef: ArrayLike<number>, t: number): boolean {
  const k = orbitCell(eph, t);
  if (k < 0) {
    nanFill(out, outRate);
    return false;
  }
  const o = k * ORBIT_STRIDE + 9;
  const s = (t - eph.startS) / eph.orbitStepS - k;
  const theta = eph.orbit[o]! + s * (eph.orbit[o + ORBIT_STRIDE]! - eph.orbit[o]!);
  const c = Math.cos(theta),
    sn = Math.sin(theta);
  const x = c * dirEcef[0]! - sn * dirEcef[1]!,
    y = sn * dirEcef[0]! + c * dirEcef[1]!,
    z = dirEcef[2]!;
  const f = frameMatrixAt(frame, eph, t);
  out[0] = f[0]! * x + f[3]! * y + f[6]! * z;
  out[1] = f[1]! * x + f[4]! * y + f[7]! * z;
  out[2] = f[2]! * x + f[5]! * y + f[8]! * z;
  if (outRate) {
    const w = EARTH_ROTATION_RATE_RAD_S;
    outRate[0] = w * (-f[0]! * y + f[3]! * x);
    outRate[1] = w * (-f[1]! * y + f[4]! * x);
    outRate[2] = w * (-f[2]! * y + f[5]! * x);
  }
  return true;
}
