/**
 * Moving pointing targets built on the ephemeris: attitude qInertialFromBody, body rate ω and
 * angular acceleration ω̇ (body axes) at plan time t, analytically (triad.ts), into caller buffers.
 *
 * Kinds (each a two-vector target: a body axis exactly on a primary direction P, a second body axis
 * as close as possible to a secondary direction S, all EME2000):
 * - 'site':    P = r_site − r (line of sight to a ground site; sites.ts).
 * - 'station': the same, and the state also says whether the station sees the spacecraft above its
 *              elevation mask (`visible`), with the elevation.
 * - 'sun':     P = s − r (spacecraft → Sun), e.g. a panel normal on the Sun.
 * - 'nadir':   yaw 'lvlh' puts the body axes on LVLH (frames.ts: z nadir, y −orbit normal, x completing):
 *              P = −r on body +z, S = −(r × v) on body +y. Yaw 'sun-steering' keeps body +z on nadir
 *              and turns about it so body +x lies in the nadir–Sun plane on the Sun's side (P = −r on
 *              +z, S = s − r on +x; yaw steering for arrays that rotate about body y). It degenerates
 *              when the Sun is near nadir or zenith.
 * Secondary references S for 'site', 'station' and 'sun' (default 'orbit-normal'):
 *   'orbit-normal' S = r × v · 'nadir' S = −r · 'velocity' S = v · 'sun' S = s − r · or a fixed
 *   EME2000 direction { inertial: [x, y, z] }.
 * Derivatives of P and S use the ephemeris's r, v, a, jerk (ephemerisEval.ts), the site's Earth-
 * rotation velocity and acceleration, and the Sun's interpolated velocity (its acceleration,
 * ~6e-3 m/s² geocentric, is neglected: ~1e-14 rad/s² on the Sun direction).
 * `degenerate` is set when |P̂ × Ŝ| < sin 1° (common practice, no source): the secondary axis is then
 * ill-defined and the rates grow without bound. q keeps w ≥ 0 (no hemisphere continuity).
 */
import { fail, issue, ok, type Issue, type Result } from '../errors';
import type { Ephemeris } from './ephemeris';
import { earthFixedDirectionAt, orbitStateAt, siteStateAt, sunStateAt } from './ephemerisEval';
import type { Site } from './sites';
import { bodyTriad, twoVectorAttitude, type AttitudeState } from './triad';
import { RAD_PER_DEG } from '../units';

export type SecondaryReference = 'orbit-normal' | 'nadir' | 'velocity' | 'sun' | { inertial: ArrayLike<number> };

export type PointingTargetSpec =
  | {
      kind: 'site' | 'station';
      site: Site;
      primaryBody: ArrayLike<number>;
      secondaryBody: ArrayLike<number>;
      secondary?: SecondaryReference;
    }
  | { kind: 'sun'; primaryBody: ArrayLike<number>; secondaryBody: ArrayLike<number>; secondary?: SecondaryReference }
  | { kind: 'nadir'; yaw?: 'lvlh' | 'sun-steering' };

/** A validated target: plain data (structured-clonable). */
export interface PointingTarget {
  kind: 'site' | 'station' | 'sun' | 'nadir';
  /** Primary direction source and secondary reference after defaults. */
  primary: 'site' | 'sun' | 'nadir';
  secondary: 'orbit-normal' | 'nadir' | 'velocity' | 'sun' | 'inertial' | 'negative-orbit-normal';
  /** Fixed EME2000 secondary direction when secondary = 'inertial'. */
  inertial: Float64Array;
  /** Body triad [b1 b2 b3], column-major. */
  body: Float64Array;
  site: Site | null;
}

export interface TargetState extends AttitudeState {
  /** Elevation of the spacecraft seen from the site (rad; NaN for 'sun' and 'nadir'). */
  elevationRad: number;
  /** 'station': 1 when the elevation is at or above the station's mask; 'site': 1 above 0; else NaN. */
  visible: number;
  /** 1 when |P̂ × Ŝ| < sin 1°. */
  degenerate: number;
}

export function createTargetState(): TargetState {
  return {
    q: Float64Array.of(0, 0, 0, 1),
    omegaBody: new Float64Array(3),
    omegaDotBody: new Float64Array(3),
    separationSin: 1,
    elevationRad: NaN,
    visible: NaN,
    degenerate: 0,
  };
}

const DEGENERATE_SIN = Math.sin(RAD_PER_DEG);

/** Validate a target spec (body axes finite, non-zero, not parallel; inertial reference non-zero). */
export function makeTarget(spec: PointingTargetSpec, path = 'target'): Result<PointingTarget> {
  const errors: Issue[] = [];
  const body = new Float64Array(9);
  const inertial = new Float64Array(3);
  if (spec.kind === 'nadir') {
    const yaw = spec.yaw ?? 'lvlh';
    if (yaw !== 'lvlh' && yaw !== 'sun-steering')
      return fail([issue(`${path}.yaw`, 'enum', `${path}.yaw must be 'lvlh' or 'sun-steering'`)]);
    bodyTriad(body, [0, 0, 1], yaw === 'lvlh' ? [0, 1, 0] : [1, 0, 0]);
    return ok({ kind: 'nadir', primary: 'nadir', secondary: yaw === 'lvlh' ? 'negative-orbit-normal' : 'sun', inertial, body, site: null });
  }
  if (!bodyTriad(body, spec.primaryBody, spec.secondaryBody))
    errors.push(issue(`${path}.secondaryBody`, 'axes', `${path}: primaryBody and secondaryBody must be finite, non-zero and not parallel`));
  const ref = spec.secondary ?? 'orbit-normal';
  let secondary: PointingTarget['secondary'];
  if (typeof ref === 'object') {
    secondary = 'inertial';
    const n = Math.hypot(ref.inertial[0] ?? NaN, ref.inertial[1] ?? NaN, ref.inertial[2] ?? NaN);
    if (!(n > 0) || !Number.isFinite(n))
      errors.push(issue(`${path}.secondary`, 'direction', `${path}.secondary.inertial must be a finite non-zero 3-vector`));
    else for (let i = 0; i < 3; i++) inertial[i] = ref.inertial[i]! / n;
  } else if (['orbit-normal', 'nadir', 'velocity', 'sun'].includes(ref)) secondary = ref;
  else {
    errors.push(issue(`${path}.secondary`, 'enum', `${path}.secondary must be 'orbit-normal', 'nadir', 'velocity', 'sun' or { inertial }`));
    secondary = 'orbit-normal';
  }
  if (spec.kind === 'sun' && secondary === 'sun')
    errors.push(issue(`${path}.secondary`, 'parallel', `${path}: a Sun target cannot keep its secondary axis on the Sun`));
  if (errors.length) return fail(errors);
  if (spec.kind === 'sun') return ok({ kind: 'sun', primary: 'sun', secondary, inertial, body, site: null });
  return ok({ kind: spec.kind, primary: 'site', secondary, inertial, body, site: spec.site });
}

const r = new Float64Array(3),
  v = new Float64Array(3),
  a = new Float64Array(3),
  j = new Float64Array(3),
  sun = new Float64Array(3),
  sunV = new Float64Array(3),
  rg = new Float64Array(3),
  vg = new Float64Array(3),
  ag = new Float64Array(3);
const P = new Float64Array(3),
  dP = new Float64Array(3),
  ddP = new Float64Array(3),
  S = new Float64Array(3),
  dS = new Float64Array(3),
  ddS = new Float64Array(3);

function crossInto(out: Float64Array, x: ArrayLike<number>, y: ArrayLike<number>, k: number, add: boolean): void {
  const cx = x[1]! * y[2]! - x[2]! * y[1]!,
    cy = x[2]! * y[0]! - x[0]! * y[2]!,
    cz = x[0]! * y[1]! - x[1]! * y[0]!;
  out[0] = (add ? out[0]! : 0) + k * cx;
  out[1] = (add ? out[1]! : 0) + k * cy;
  out[2] = (add ? out[2]! : 0) + k * cz;
}

/** S, Ṡ, S̈ of the secondary reference (r, v, a, j and the Sun already evaluated). */
function secondaryInto(target: PointingTarget): void {
  switch (target.secondary) {
    case 'orbit-normal':
    case 'negative-orbit-normal': {
      const k = target.secondary === 'orbit-normal' ? 1 : -1;
      crossInto(S, r, v, k, false);
      crossInto(dS, r, a, k, false);
      crossInto(ddS, v, a, k, false);
      crossInto(ddS, r, j, k, true);
      return;
    }
    case 'nadir':
      for (let i = 0; i < 3; i++) {
        S[i] = -r[i]!;
        dS[i] = -v[i]!;
        ddS[i] = -a[i]!;
      }
      return;
    case 'velocity':
      for (let i = 0; i < 3; i++) {
        S[i] = v[i]!;
        dS[i] = a[i]!;
        ddS[i] = j[i]!;
      }
      return;
    case 'sun':
      for (let i = 0; i < 3; i++) {
        S[i] = sun[i]! - r[i]!;
        dS[i] = sunV[i]! - v[i]!;
        ddS[i] = -a[i]!;
      }
      return;
    case 'inertial':
      S.set(target.inertial);
      dS.fill(0);
      ddS.fill(0);
  }
}

/** Attitude, body rate and angular acceleration of a target at plan time t, into out. */
export function targetStateAt(out: TargetState, eph: Ephemeris, target: PointingTarget, t: number): boolean {
  if (!orbitStateAt(r, v, a, j, eph, t)) return false;
  if (target.primary === 'sun' || target.secondary === 'sun') sunStateAt(sun, sunV, eph, t);
  out.elevationRad = NaN;
  out.visible = NaN;
  if (target.primary === 'site') {
    const site = target.site!;
    siteStateAt(rg, vg, ag, eph, site, t);
    for (let i = 0; i < 3; i++) {
      P[i] = rg[i]! - r[i]!;
      dP[i] = vg[i]! - v[i]!;
      ddP[i] = ag[i]! - a[i]!;
    }
    // Elevation above the site's geodetic horizon: sin ε = (−P)·û/|P| (−P points site → spacecraft).
    out.elevationRad = elevationOf(eph, site, t);
    out.visible = out.elevationRad >= (target.kind === 'station' ? site.elevationMaskRad : 0) ? 1 : 0;
  } else if (target.primary === 'sun') {
    for (let i = 0; i < 3; i++) {
      P[i] = sun[i]! - r[i]!;
      dP[i] = sunV[i]! - v[i]!;
      ddP[i] = -a[i]!;
    }
  } else {
    for (let i = 0; i < 3; i++) {
      P[i] = -r[i]!;
      dP[i] = -v[i]!;
      ddP[i] = -a[i]!;
    }
  }
  secondaryInto(target);
  if (!twoVectorAttitude(out, target.body, P, dP, ddP, S, dS, ddS)) {
    out.degenerate = 1;
    out.separationSin = 0;
    return false;
  }
  out.degenerate = out.separationSin < DEGENERATE_SIN ? 1 : 0;
  return true;
}

const up = new Float64Array(3);

function elevationOf(eph: Ephemeris, site: Site, t: number): number {
  earthFixedDirectionAt(up, null, eph, site.upEcef, t);
  const n = Math.hypot(P[0]!, P[1]!, P[2]!);
  return Math.asin(Math.max(-1, Math.min(1, -(P[0]! * up[0]! + P[1]! * up[1]! + P[2]! * up[2]!) / n)));
}
