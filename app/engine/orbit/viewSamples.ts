/**
 * Orbit geometry for views: sampled ONCE per run set (the pipeline does it after the flights) and
 * interpolated per frame by `orbitViewAt` (no allocation, a few dozen flops), so the renderer never
 * calls SGP4 or astronomy-engine.
 *
 * What a sample holds (plan time t_k = k·stepS over [0, endS], frame EME2000, SI):
 * - the spacecraft position r (m) and velocity v (m/s) from the pipeline's ephemeris
 *   (ephemeris.ts: SGP4 at 30 s nodes, cubic Hermite between them);
 * - the GEOCENTRIC Sun and Moon positions (m) straight from sky.ts (astronomy-engine), so that at a
 *   sample time the directions equal the library's exactly;
 * - the Earth's orientation: Greenwich mean sidereal angle θ (rad, unwrapped) and the quaternion of
 *   M_EME2000←TEME (frames.ts), so ECEF → EME2000 is q_frame ⊗ q_z(θ) (r_TEME = R_z(θ) r_ECEF,
 *   Vallado et al. 2006, AIAA 2006-6753, the same chain as ephemerisEval.ts siteStateAt).
 * Between samples: r by cubic Hermite on (r, v) (the same interpolant as ephemeris.ts; the error
 * at the view spacing is measured in test/unit/orbit-view-samples.test.ts), Sun and Moon positions
 * linearly (their geocentric chord sag over 10 s is a few centimetres), θ linearly (it is linear in
 * time to 1e-13 rad over a sample), q_frame normalised-linearly (it turns ~1e-9 rad per sample).
 * Directions from the spacecraft and the eclipse (conical shadow, sky.ts) are formed at the
 * interpolated instant, so the shadow state agrees with the engine's model at any t.
 */
import type { Vec3 } from '../math/mat3';
import { qFromMat3 } from '../math/quaternion';
import type { Ephemeris } from './ephemeris';
import { orbitStateAt } from './ephemerisEval';
import { EARTH_ROTATION_RATE_RAD_S, gmstRad, temeToEme2000Matrix } from './frames';
import { geodeticToEcef } from './sites';
import { conicalShadow, createShadowInfo, moonPositionEme2000, SUNLIT, sunPositionEme2000, type ShadowInfo } from './sky';

/** Finest spacing of the view samples (s); longer spans widen it so a run set holds ≤ MAX_VIEW_SAMPLES. */
export const VIEW_STEP_S = 10;
export const MAX_VIEW_SAMPLES = 5000;

export interface OrbitViewSamples {
  frame: 'EME2000';
  /** Plan epoch, TAI seconds since 2000-01-01T12:00:00 TAI. */
  epochTaiS: number;
  stepS: number;
  /** Sample count; sample k is at plan time k·stepS, the last at endS or just past it. */
  n: number;
  endS: number;
  /** 3 per sample, EME2000. */
  rM: Float64Array;
  vMps: Float64Array;
  /** Geocentric Sun and Moon positions, 3 per sample, EME2000, m. */
  sunM: Float64Array;
  moonM: Float64Array;
  /** Greenwich mean sidereal angle θ (rad, unwrapped) per sample. */
  thetaRad: Float64Array;
  /** qEme2000FromTeme, 4 per sample [x, y, z, w]. */
  qFrame: Float64Array;
  /** Mean orbital period at the first sample from the vis-viva energy (s): for drawing one revolution. */
  periodS: number;
}

/** Earth's gravitational parameter (m³/s²), WGS-84 / EGM96 value 3.986004418e14 (IERS 2010 Table 1.1). */
const GM_EARTH = 3.986004418e14;

/**
 * Sample the ephemeris over [0, endS] (endS defaults to the ephemeris end) for views.
 * Returns null when the span is empty or the ephemeris has no sample there.
 */
export function orbitViewSamples(eph: Ephemeris, endS = eph.endS): OrbitViewSamples | null {
  const end = Math.min(endS, eph.endS);
  if (!(end > 0) || !(eph.startS <= 0)) return null;
  const stepS = Math.max(VIEW_STEP_S, end / (MAX_VIEW_SAMPLES - 1));
  const n = Math.ceil(end / stepS - 1e-9) + 1;
  const s: OrbitViewSamples = {
    frame: 'EME2000',
    epochTaiS: eph.epochTaiS,
    stepS,
    n,
    endS: end,
    rM: new Float64Array(3 * n),
    vMps: new Float64Array(3 * n),
    sunM: new Float64Array(3 * n),
    moonM: new Float64Array(3 * n),
    thetaRad: new Float64Array(n),
    qFrame: new Float64Array(4 * n),
    periodS: NaN,
  };
  const r = new Float64Array(3),
    v = new Float64Array(3),
    p = new Float64Array(3),
    m = new Float64Array(9),
    q = new Float64Array(4);
  let thetaPrev = NaN;
  for (let k = 0; k < n; k++) {
    // The last sample sits on the span's end (it may be closer than stepS to the one before).
    const t = Math.min(k * stepS, end);
    const tai = eph.epochTaiS + t;
    orbitStateAt(r, v, null, null, eph, t);
    s.rM.set(r, 3 * k);
    s.vMps.set(v, 3 * k);
    sunPositionEme2000(p, tai);
    s.sunM.set(p, 3 * k);
    moonPositionEme2000(p, tai);
    s.moonM.set(p, 3 * k);
    let theta = gmstRad(tai);
    if (k > 0) {
      const dt = t - Math.min((k - 1) * stepS, end);
      theta += 2 * Math.PI * Math.round((thetaPrev + EARTH_ROTATION_RATE_RAD_S * dt - theta) / (2 * Math.PI));
    }
    s.thetaRad[k] = theta;
    thetaPrev = theta;
    qFromMat3(q, temeToEme2000Matrix(m, tai));
    // Keep consecutive quaternions in one hemisphere so the blend between them is short.
    if (k > 0) {
      const o = 4 * (k - 1);
      if (q[0]! * s.qFrame[o]! + q[1]! * s.qFrame[o + 1]! + q[2]! * s.qFrame[o + 2]! + q[3]! * s.qFrame[o + 3]! < 0)
        for (let i = 0; i < 4; i++) q[i] = -q[i]!;
    }
    s.qFrame.set(q, 4 * k);
  }
  // Vis-viva: a = 1 / (2/|r| − |v|²/μ), T = 2π √(a³/μ) (any orbital-mechanics text, e.g. Vallado,
  // Fundamentals of Astrodynamics, 4th ed., §1.3).
  const rn = Math.hypot(s.rM[0]!, s.rM[1]!, s.rM[2]!),
    vn = Math.hypot(s.vMps[0]!, s.vMps[1]!, s.vMps[2]!);
  const a = 1 / (2 / rn - (vn * vn) / GM_EARTH);
  s.periodS = a > 0 ? 2 * Math.PI * Math.sqrt((a * a * a) / GM_EARTH) : NaN;
  return s;
}

/** The geometry at one instant (orbitViewAt fills it; make it once with createOrbitViewPoint). */
export interface OrbitViewPoint {
  /** Plan time (s) it was evaluated at. */
  t: number;
  /** False outside the samples' span (every vector then NaN). */
  valid: boolean;
  /** Spacecraft position, m, EME2000. */
  rM: Float64Array;
  /** Unit directions spacecraft → Sun and spacecraft → Moon, EME2000. */
  sunDir: Float64Array;
  moonDir: Float64Array;
  /** Unit direction spacecraft → Earth centre (−r/|r|) and the Earth disc's angular radius (rad, WGS-84 equatorial radius). */
  earthDir: Float64Array;
  earthAngularRadiusRad: number;
  /** qInertialFromEcef [x, y, z, w]: rotates Earth-fixed vectors into EME2000. */
  qInertialFromEcef: Float64Array;
  /** Conical-shadow state (sky.ts SUNLIT, PENUMBRA, UMBRA, ANNULAR) and visible solar-disc fraction. */
  shadow: number;
  sunFraction: number;
}

export function createOrbitViewPoint(): OrbitViewPoint {
  return {
    t: NaN,
    valid: false,
    rM: new Float64Array(3),
    sunDir: new Float64Array(3),
    moonDir: new Float64Array(3),
    earthDir: new Float64Array(3),
    earthAngularRadiusRad: NaN,
    qInertialFromEcef: new Float64Array(4),
    shadow: SUNLIT,
    sunFraction: 1,
  };
}

const sunS = new Float64Array(3),
  moonS = new Float64Array(3),
  qf = new Float64Array(4),
  shadowInfo: ShadowInfo = createShadowInfo();

/** Interpolate the samples at plan time t into out (returned). Outside [0, endS] out.valid is false. */
export function orbitViewAt(out: OrbitViewPoint, s: OrbitViewSamples, t: number): OrbitViewPoint {
  out.t = t;
  if (!(t >= 0 && t <= s.endS) || s.n < 2) {
    out.valid = false;
    out.rM.fill(NaN);
    out.sunDir.fill(NaN);
    out.moonDir.fill(NaN);
    out.earthDir.fill(NaN);
    out.qInertialFromEcef.fill(NaN);
    out.earthAngularRadiusRad = out.sunFraction = out.shadow = NaN;
    return out;
  }
  out.valid = true;
  const k = Math.min(Math.floor(t / s.stepS), s.n - 2);
  const t0 = k * s.stepS,
    t1 = Math.min((k + 1) * s.stepS, s.endS);
  const h = t1 - t0;
  const u = h > 0 ? (t - t0) / h : 0;
  // Cubic Hermite on position with the velocity as slope (ephemeris.ts uses the same interpolant).
  const u2 = u * u,
    u3 = u2 * u;
  const h00 = 2 * u3 - 3 * u2 + 1,
    h10 = (u3 - 2 * u2 + u) * h,
    h01 = -2 * u3 + 3 * u2,
    h11 = (u3 - u2) * h;
  const o0 = 3 * k,
    o1 = o0 + 3;
  for (let i = 0; i < 3; i++) {
    out.rM[i] = h00 * s.rM[o0 + i]! + h10 * s.vMps[o0 + i]! + h01 * s.rM[o1 + i]! + h11 * s.vMps[o1 + i]!;
    sunS[i] = s.sunM[o0 + i]! + u * (s.sunM[o1 + i]! - s.sunM[o0 + i]!);
    moonS[i] = s.moonM[o0 + i]! + u * (s.moonM[o1 + i]! - s.moonM[o0 + i]!);
  }
  const r = out.rM;
  unitFrom(out.sunDir, sunS, r);
  unitFrom(out.moonDir, moonS, r);
  const rn = Math.hypot(r[0]!, r[1]!, r[2]!);
  out.earthDir[0] = -r[0]! / rn;
  out.earthDir[1] = -r[1]! / rn;
  out.earthDir[2] = -r[2]! / rn;
  conicalShadow(shadowInfo, r, sunS);
  out.earthAngularRadiusRad = shadowInfo.earthAngularRadiusRad;
  out.shadow = shadowInfo.state;
  out.sunFraction = shadowInfo.sunFraction;
  // Earth orientation: q_frame (normalised blend) ⊗ q_z(θ).
  const q0 = 4 * k,
    q1 = q0 + 4;
  for (let i = 0; i < 4; i++) qf[i] = s.qFrame[q0 + i]! + u * (s.qFrame[q1 + i]! - s.qFrame[q0 + i]!);
  const qn = Math.hypot(qf[0]!, qf[1]!, qf[2]!, qf[3]!);
  const theta = s.thetaRad[k]! + u * (s.thetaRad[k + 1]! - s.thetaRad[k]!);
  const sz = Math.sin(theta / 2),
    cz = Math.cos(theta / 2);
  const ax = qf[0]! / qn,
    ay = qf[1]! / qn,
    az = qf[2]! / qn,
    aw = qf[3]! / qn;
  // Hamilton product a ⊗ (0, 0, sz, cz).
  out.qInertialFromEcef[0] = ax * cz + ay * sz;
  out.qInertialFromEcef[1] = ay * cz - ax * sz;
  out.qInertialFromEcef[2] = az * cz + aw * sz;
  out.qInertialFromEcef[3] = aw * cz - az * sz;
  return out;
}

function unitFrom(out: Float64Array, target: ArrayLike<number>, from: ArrayLike<number>): void {
  const x = target[0]! - from[0]!,
    y = target[1]! - from[1]!,
    z = target[2]! - from[2]!;
  const d = Math.hypot(x, y, z);
  out[0] = x / d;
  out[1] = y / d;
  out[2] = z / d;
}

/**
 * The position (m, EME2000) of an Earth-fixed point at the instant of `p`: qInertialFromEcef
 * applied to its ECEF position. `ecef` from `siteEcefM` (or orbit/sites.ts geodeticToEcef).
 */
export function earthFixedPointAt(out: Vec3, p: OrbitViewPoint, ecef: ArrayLike<number>): Vec3 {
  const q = p.qInertialFromEcef;
  const qx = q[0]!,
    qy = q[1]!,
    qz = q[2]!,
    qw = q[3]!;
  const vx = ecef[0]!,
    vy = ecef[1]!,
    vz = ecef[2]!;
  // v' = v + 2w (q_v × v) + 2 q_v × (q_v × v)
  const tx = 2 * (qy * vz - qz * vy),
    ty = 2 * (qz * vx - qx * vz),
    tz = 2 * (qx * vy - qy * vx);
  out[0] = vx + qw * tx + (qy * tz - qz * ty);
  out[1] = vy + qw * ty + (qz * tx - qx * tz);
  out[2] = vz + qw * tz + (qx * ty - qy * tx);
  return out;
}

/** Earth-fixed position (m) of a geodetic point (WGS-84), into out. */
export function siteEcefM(out: Vec3, latitudeRad: number, longitudeRad: number, heightM: number): Vec3 {
  return geodeticToEcef(out, latitudeRad, longitudeRad, heightM);
}
