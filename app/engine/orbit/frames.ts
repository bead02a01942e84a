/**
 * Reference frames of the orbit library.
 *
 * THE INERTIAL FRAME of the whole project is EME2000: Earth mean equator and mean equinox of
 * J2000.0 (the dynamical J2000 frame). It is astronomy-engine's EQJ frame ("J2000 mean equator");
 * both neglect the ≈ 23 mas frame bias between EME2000 and the ICRF/GCRF (< 1 m at LEO radius).
 * All inertial vectors of the library are EME2000, in metres and metres per second.
 *
 * Other frames:
 * - TEME (SGP4's output): true equator of date, "uniform" mean equinox. TEME → EME2000 goes
 *   TEME → true of date (EQD) by the equation of the equinoxes Eq = GAST − GMST = Δψ cos ε̄ (the
 *   form without the small complementary terms that Vallado et al. 2006, AIAA 2006-6753, recommend for
 *   TEME), then EQD → EQJ with astronomy-engine `Rotation_EQD_EQJ` (IAU 2006 precession, IAU 2000B
 *   nutation). Δψ and ε̄ come from astronomy-engine `e_tilt`. r_EQD = Rz(+Eq) r_TEME (the mean
 *   equinox lies Eq east of the true one), with Rz(α) the ACTIVE rotation by α about z.
 * - Earth-fixed (ECEF): ITRF WITHOUT POLAR MOTION (the pseudo-Earth-fixed frame of date, error
 *   ≤ 0.5″ ≈ 15 m at the surface); r_TEME = Rz(θ) r_ECEF with θ = GMST (IAU 1982 expression,
 *   satellite.js `gstime`, argument UT1 taken as UTC: time/scales.ts). Velocities add ω⊕ × r.
 * - LVLH (local vertical, local horizontal) from r, v: z toward nadir (−r̂), y toward the NEGATIVE
 *   orbit normal (−ĥ, ĥ = r × v / |r × v|), x = y × z completing the right-handed triad (along the
 *   velocity for a circular orbit).
 * Accuracy notes (measured in test/reference/orbit-frames.test.ts): GMST 1982 is tied to the IAU 1976
 * precession while astronomy-engine precesses with IAU 2006, so Earth-fixed → EME2000 here differs
 * from astronomy-engine's own IAU 2006 Earth rotation by a z-rotation drifting ≈ 2.8 mas/yr from
 * about 2005 (≈ 70 mas, 2.4 m at LEO radius, in 2030): negligible against SGP4's kilometre-level
 * accuracy, and ground sites and spacecraft pass through the same chain, so lines of sight are
 * unaffected. gstime takes one double Julian date, which resolves ≈ 40 µs (≈ 2 cm at the equator).
 * Matrices are column-major Float64Array(9) (math/mat3.ts); a frame-change matrix M_AB maps B
 * coordinates to A coordinates: r_A = M_AB r_B.
 */
import { AstroTime, Rotation_EQD_EQJ, e_tilt, type RotationMatrix } from 'astronomy-engine';
import { gstime } from 'satellite.js';
import type { Mat3, Vec3 } from '../math/mat3';
import { qFromMat3, type Quat } from '../math/rotation';
import { julianDateUt1FromTai, ttDaysFromTai } from '../time/scales';
import { RAD_PER_ARCSEC } from '../units';

/**
 * Earth rotation rate (rad/s) for velocities between ECEF and TEME: 7.292115146706979e-5, the value
 * of Vallado et al. 2006 (AIAA 2006-6753, teme2ecef); within 1e-7 of dGMST/dt (IAU 1982).
 */
export const EARTH_ROTATION_RATE_RAD_S = 7.292115146706979e-5;

/**
 * The astronomy-engine time of a TAI instant, with TT from the library's leap-second table (its
 * own UT, used only by its sidereal-time and horizon functions, then follows its ΔT model; the
 * library takes Earth rotation from satellite.js gstime instead).
 */
export function astroTimeFromTai(taiS: number): AstroTime {
  return AstroTime.FromTerrestrialTime(ttDaysFromTai(taiS));
}

/** Greenwich mean sidereal time (rad, [0, 2π)), IAU 1982, through satellite.js gstime; UT1 = UTC. */
export function gmstRad(taiS: number): number {
  return gstime(julianDateUt1FromTai(taiS));
}

/** Equation of the equinoxes GAST − GMST = Δψ cos ε̄ (rad), from astronomy-engine e_tilt. */
export function equationOfEquinoxesRad(taiS: number): number {
  // e_tilt's `ee` is Δψ cos ε̄ in seconds of time (Δψ in arcseconds / 15).
  return 15 * e_tilt(astroTimeFromTai(taiS)).ee * RAD_PER_ARCSEC;
}

/** Copy an astronomy-engine RotationMatrix (rot[column][row]) into a column-major Mat3. */
export function mat3FromAstronomy(out: Mat3, m: RotationMatrix): Mat3 {
  for (let c = 0; c < 3; c++) for (let r = 0; r < 3; r++) out[3 * c + r] = m.rot[c]![r]!;
  return out;
}

const scratchM = new Float64Array(9);

/** M_EME2000←TEME at TAI instant taiS (allocates inside astronomy-engine: not for a per-sample loop). */
export function temeToEme2000Matrix(out: Mat3, taiS: number): Mat3 {
  const time = astroTimeFromTai(taiS);
  mat3FromAstronomy(scratchM, Rotation_EQD_EQJ(time));
  const eq = 15 * e_tilt(time).ee * RAD_PER_ARCSEC;
  const c = Math.cos(eq),
    s = Math.sin(eq);
  // out = P·Rz(eq): columns of Rz are (c, s, 0), (−s, c, 0), (0, 0, 1).
  for (let r = 0; r < 3; r++) {
    const p0 = scratchM[r]!,
      p1 = scratchM[3 + r]!,
      p2 = scratchM[6 + r]!;
    out[r] = p0 * c + p1 * s;
    out[3 + r] = -p0 * s + p1 * c;
    out[6 + r] = p2;
  }
  return out;
}

/**
 * ECEF → TEME at Greenwich sidereal angle θ (rad): r_T = Rz(θ) r_E, v_T = Rz(θ)(v_E + ω⊕ ẑ × r_E).
 * `vEcef` may be null for a point fixed on the Earth (v_E = 0); `outV` may be null.
 */
export function ecefToTeme(outR: Vec3, outV: Vec3 | null, rEcef: ArrayLike<number>, vEcef: ArrayLike<number> | null, gmst: number): void {
  const c = Math.cos(gmst),
    s = Math.sin(gmst);
  const x = rEcef[0]!,
    y = rEcef[1]!,
    z = rEcef[2]!;
  if (outV) {
    const w = EARTH_ROTATION_RATE_RAD_S;
    const vx = (vEcef ? vEcef[0]! : 0) - w * y,
      vy = (vEcef ? vEcef[1]! : 0) + w * x,
      vz = vEcef ? vEcef[2]! : 0;
    outV[0] = c * vx - s * vy;
    outV[1] = s * vx + c * vy;
    outV[2] = vz;
  }
  outR[0] = c * x - s * y;
  outR[1] = s * x + c * y;
  outR[2] = z;
}

/** TEME → ECEF, the inverse of ecefToTeme: r_E = Rz(−θ) r_T, v_E = Rz(−θ) v_T − ω⊕ ẑ × r_E. */
export function temeToEcef(outR: Vec3, outV: Vec3 | null, rTeme: ArrayLike<number>, vTeme: ArrayLike<number> | null, gmst: number): void {
  const c = Math.cos(gmst),
    s = Math.sin(gmst);
  const x = c * rTeme[0]! + s * rTeme[1]!,
    y = -s * rTeme[0]! + c * rTeme[1]!,
    z = rTeme[2]!;
  if (outV && vTeme) {
    const w = EARTH_ROTATION_RATE_RAD_S;
    const vx = vTeme[0]!,
      vy = vTeme[1]!,
      vz = vTeme[2]!;
    outV[0] = c * vx + s * vy + w * y;
    outV[1] = -s * vx + c * vy - w * x;
    outV[2] = vz;
  }
  outR[0] = x;
  outR[1] = y;
  outR[2] = z;
}

/** out = M v (column-major 3×3); out may alias v. */
export function mulMat3Vec(out: Vec3, m: ArrayLike<number>, v: ArrayLike<number>): Vec3 {
  const x = v[0]!,
    y = v[1]!,
    z = v[2]!;
  out[0] = m[0]! * x + m[3]! * y + m[6]! * z;
  out[1] = m[1]! * x + m[4]! * y + m[7]! * z;
  out[2] = m[2]! * x + m[5]! * y + m[8]! * z;
  return out;
}

/** out = Mᵀ v; out may alias v. */
export function mulMat3TVec(out: Vec3, m: ArrayLike<number>, v: ArrayLike<number>): Vec3 {
  const x = v[0]!,
    y = v[1]!,
    z = v[2]!;
  out[0] = m[0]! * x + m[1]! * y + m[2]! * z;
  out[1] = m[3]! * x + m[4]! * y + m[5]! * z;
  out[2] = m[6]! * x + m[7]! * y + m[8]! * z;
  return out;
}

const scratchFrame = new Float64Array(9);

/** ECEF position (and velocity, if both given) → EME2000 at TAI instant taiS. */
export function ecefToEme2000(
  outR: Vec3,
  outV: Vec3 | null,
  rEcef: ArrayLike<number>,
  vEcef: ArrayLike<number> | null,
  taiS: number,
): void {
  ecefToTeme(outR, outV, rEcef, vEcef, gmstRad(taiS));
  temeToEme2000Matrix(scratchFrame, taiS);
  mulMat3Vec(outR, scratchFrame, outR);
  if (outV) mulMat3Vec(outV, scratchFrame, outV);
}

/** EME2000 position (and velocity) → ECEF at TAI instant taiS. */
export function eme2000ToEcef(outR: Vec3, outV: Vec3 | null, rEme: ArrayLike<number>, vEme: ArrayLike<number> | null, taiS: number): void {
  temeToEme2000Matrix(scratchFrame, taiS);
  mulMat3TVec(outR, scratchFrame, rEme);
  if (outV && vEme) mulMat3TVec(outV, scratchFrame, vEme);
  temeToEcef(outR, outV && vEme ? outV : null, outR, outV && vEme ? outV : null, gmstRad(taiS));
}

/**
 * LVLH axes from position and velocity (any inertial frame), as the columns of M_inertial←LVLH:
 * z = −r̂ (nadir), y = −ĥ (negative orbit normal), x = y × z. Returns false (out untouched) when
 * r and v are parallel or zero.
 */
export function lvlhMatrix(out: Mat3, r: ArrayLike<number>, v: ArrayLike<number>): boolean {
  const rx = r[0]!,
    ry = r[1]!,
    rz = r[2]!;
  const hx = ry * v[2]! - rz * v[1]!,
    hy = rz * v[0]! - rx * v[2]!,
    hz = rx * v[1]! - ry * v[0]!;
  const rn = Math.hypot(rx, ry, rz),
    hn = Math.hypot(hx, hy, hz);
  if (!(rn > 0) || !(hn > 0)) return false;
  const zx = -rx / rn,
    zy = -ry / rn,
    zz = -rz / rn;
  const yx = -hx / hn,
    yy = -hy / hn,
    yz = -hz / hn;
  out[0] = yy * zz - yz * zy;
  out[1] = yz * zx - yx * zz;
  out[2] = yx * zy - yy * zx;
  out[3] = yx;
  out[4] = yy;
  out[5] = yz;
  out[6] = zx;
  out[7] = zy;
  out[8] = zz;
  return true;
}

/** qInertialFromLvlh: the attitude whose body axes are the LVLH axes. */
export function qInertialFromLvlh(out: Quat, r: ArrayLike<number>, v: ArrayLike<number>): boolean {
  if (!lvlhMatrix(scratchFrame, r, v)) return false;
  qFromMat3(out, scratchFrame);
  return true;
}
