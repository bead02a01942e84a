/**
 * Precomputed ephemeris over a span: spacecraft state at fine nodes, Sun, Moon and the
 * TEME → EME2000 rotation at coarse nodes. Evaluation (ephemerisEval.ts) is cubic Hermite
 * interpolation, cheap enough for every control sample.
 *
 * Layout (plain numbers and Float64Arrays only, so the object can be posted to a Web Worker or
 * structured-cloned as is):
 * - orbit nodes k = 0 … orbitNodeCount−1 at plan time t_k = startS + k·orbitStepS, ORBIT_STRIDE
 *   doubles each: r (m), v (m/s), a (m/s²) in EME2000, then θ = GMST (rad, unwrapped: continuous
 *   across 2π). r is SGP4's position (propagate.ts) turned into EME2000 (frames.ts). v and a are
 *   the time derivatives OF THAT POSITION, by the fourth-order central stencils over ±δ, ±2δ with
 *   δ = STENCIL_DT_S = 2 s (v = [8(r₊₁ − r₋₁) − (r₊₂ − r₋₂)]/12δ, a = [16(r₊₁ + r₋₁) − (r₊₂ + r₋₂)
 *   − 30 r₀]/12δ²; truncation < 1e-8 m/s and 1e-11 m/s² in LEO, round-off of SGP4's ~1e-5 m
 *   position noise ≈ 5e-6 m/s and 1e-5 m/s²). SGP4's own velocity output is NOT used: its
 *   short-period velocity terms are approximate, so it differs from d r/dt by up to 1.2 m/s on the
 *   e = 0.19 verification orbit (0.02 m/s on a near-circular LEO). Pointing rates need r and v that
 *   are kinematically consistent.
 * - body nodes j = 0 … bodyNodeCount−1 at t_j = bodyStartS + j·bodyStepS (one node before startS
 *   and two after endS), BODY_STRIDE doubles each: Sun position (m), Moon position (m), both
 *   geocentric EME2000 (sky.ts), then M_EME2000←TEME (9, column-major).
 * Interpolation: position from (r, v) and velocity from (v, a) are two cubic Hermite
 * interpolants (so v is C¹ and a = dv/dt continuous); Sun and Moon use cubic Hermite with
 * central-difference node slopes (Catmull–Rom); θ and M are linear between nodes (θ is linear in
 * time up to 1e-13 rad over a node interval; M turns by ~1e-9 rad per body interval).
 * Plan time t counts elapsed SI seconds from the plan epoch: taiS = epochTaiS + t (time/scales.ts).
 * The spacecraft state is continuous through a leap second (SGP4 runs on elapsed time). θ follows
 * UT1 taken as UTC, which is held during the inserted second: the node interval containing it holds
 * one second less of Earth rotation, so inside that interval alone a site's interpolated position
 * and its analytic velocity (ω⊕ × r) disagree by ~1/30 of the rotation speed (30 s nodes).
 * Both stay within the stated UT1 error (< 1 s of Earth rotation).
 */
import { fail, issue, ok, type Issue, type Result } from '../errors';
import { checkPropagationSpan, sgp4ErrorText, sgp4Teme, type Sgp4Orbit } from './propagate';
import { EARTH_ROTATION_RATE_RAD_S, gmstRad, mulMat3Vec, temeToEme2000Matrix } from './frames';
import { moonPositionEme2000, sunPositionEme2000 } from './sky';
import { utcLabelFromTai } from '../time/iso';

export const ORBIT_STRIDE = 10;
export const BODY_STRIDE = 15;
/** Spacing of the stencil that differentiates SGP4's position at a node (s). */
export const STENCIL_DT_S = 2;

export interface Ephemeris {
  /** Plan epoch, TAI seconds since 2000-01-01T12:00:00 TAI. */
  epochTaiS: number;
  /** Span in plan seconds. */
  startS: number;
  endS: number;
  orbitStepS: number;
  orbitNodeCount: number;
  orbit: Float64Array;
  bodyStartS: number;
  bodyStepS: number;
  bodyNodeCount: number;
  bodies: Float64Array;
}

export interface EphemerisOptions {
  /** Orbit node spacing (s); default 30 (interpolation error: see test/reference/orbit-ephemeris.test.ts). */
  orbitStepS?: number;
  /** Sun, Moon and frame node spacing (s); default 600. */
  bodyStepS?: number;
}

/** Largest number of nodes one ephemeris may hold (guards against a span/step typo). */
export const MAX_EPHEMERIS_NODES = 2_000_000;

function checkOptions(startS: number, endS: number, orbitStepS: number, bodyStepS: number, path: string): Issue[] {
  const errors: Issue[] = [];
  if (!Number.isFinite(startS) || !Number.isFinite(endS) || !(endS > startS))
    errors.push(issue(`${path}.span`, 'span', `${path}: the span must be finite with end > start (got ${startS} … ${endS} s)`));
  if (!(orbitStepS > 0) || !Number.isFinite(orbitStepS))
    errors.push(issue(`${path}.orbitStepS`, 'positive', `${path}.orbitStepS must be > 0 (got ${orbitStepS})`));
  if (!(bodyStepS > 0) || !Number.isFinite(bodyStepS))
    errors.push(issue(`${path}.bodyStepS`, 'positive', `${path}.bodyStepS must be > 0 (got ${bodyStepS})`));
  if (!errors.length && (endS - startS) / orbitStepS > MAX_EPHEMERIS_NODES)
    errors.push(
      issue(
        `${path}.orbitStepS`,
        'node-count',
        `${path}: more than ${MAX_EPHEMERIS_NODES} orbit nodes; raise orbitStepS or shorten the span`,
      ),
    );
  return errors;
}

/** Fill the body nodes (Sun, Moon, TEME → EME2000). */
function fillBodies(eph: Ephemeris): void {
  const m = new Float64Array(9),
    p = new Float64Array(3);
  for (let j = 0; j < eph.bodyNodeCount; j++) {
    const taiS = eph.epochTaiS + eph.bodyStartS + j * eph.bodyStepS;
    const o = j * BODY_STRIDE;
    sunPositionEme2000(p, taiS);
    eph.bodies.set(p, o);
    moonPositionEme2000(p, taiS);
    eph.bodies.set(p, o + 3);
    temeToEme2000Matrix(m, taiS);
    eph.bodies.set(m, o + 6);
  }
}

/** M_EME2000←TEME at plan time t, linear between body nodes, into out. */
export function frameMatrixAt(out: Float64Array, eph: Ephemeris, t: number): Float64Array {
  const u = (t - eph.bodyStartS) / eph.bodyStepS;
  const j = Math.min(Math.max(Math.floor(u), 0), eph.bodyNodeCount - 2);
  const s = u - j;
  const b = eph.bodies,
    o0 = j * BODY_STRIDE + 6,
    o1 = o0 + BODY_STRIDE;
  for (let i = 0; i < 9; i++) out[i] = b[o0 + i]! + s * (b[o1 + i]! - b[o0 + i]!);
  return out;
}

/**
 * Precompute the ephemeris of `orbit` over plan times [startS, endS] from the plan epoch
 * (TAI seconds). SGP4 errors at a node (e.g. decay) fail the build with the node's UTC time;
 * spans far from the element epoch are warnings (propagate.ts).
 */
export function buildEphemeris(
  orbit: Sgp4Orbit,
  epochTaiS: number,
  startS: number,
  endS: number,
  options: EphemerisOptions = {},
  path = 'ephemeris',
): Result<Ephemeris> {
  const orbitStepS = options.orbitStepS ?? 30;
  const bodyStepS = options.bodyStepS ?? 600;
  const errors = checkOptions(startS, endS, orbitStepS, bodyStepS, path);
  if (errors.length) return fail(errors);
  const warnings = checkPropagationSpan(orbit, epochTaiS + startS, epochTaiS + endS, path);
  const orbitNodeCount = Math.ceil((endS - startS) / orbitStepS - 1e-9) + 1;
  const bodyNodeCount = Math.ceil((endS - startS) / bodyStepS) + 4;
  const eph: Ephemeris = {
    epochTaiS,
    startS,
    endS,
    orbitStepS,
    orbitNodeCount,
    orbit: new Float64Array(orbitNodeCount * ORBIT_STRIDE),
    bodyStartS: startS - bodyStepS,
    bodyStepS,
    bodyNodeCount,
    bodies: new Float64Array(bodyNodeCount * BODY_STRIDE),
  };
  fillBodies(eph);
  const p = [0, 1, 2, 3, 4].map(() => new Float64Array(3));
  const r = new Float64Array(3),
    v = new Float64Array(3),
    a = new Float64Array(3),
    scratch = new Float64Array(3),
    m = new Float64Array(9);
  const d = STENCIL_DT_S;
  let thetaPrev = NaN;
  for (let k = 0; k < orbitNodeCount; k++) {
    const t = startS + k * orbitStepS;
    const taiS = epochTaiS + t;
    for (let i = 0; i < 5; i++) {
      const code = sgp4Teme(p[i]!, scratch, orbit, taiS + (i - 2) * d);
      if (code !== 0)
        return fail(
          [issue(path, 'sgp4', `${path}: SGP4 failed near t = ${t} s (${utcLabelFromTai(taiS, 3)}Z): ${sgp4ErrorText(code)}`)],
          warnings,
        );
    }
    const [pm2, pm1, p0, pp1, pp2] = p as [Float64Array, Float64Array, Float64Array, Float64Array, Float64Array];
    for (let i = 0; i < 3; i++) {
      r[i] = p0[i]!;
      v[i] = (8 * (pp1[i]! - pm1[i]!) - (pp2[i]! - pm2[i]!)) / (12 * d);
      a[i] = (16 * (pp1[i]! + pm1[i]!) - (pp2[i]! + pm2[i]!) - 30 * p0[i]!) / (12 * d * d);
    }
    frameMatrixAt(m, eph, t);
    const o = k * ORBIT_STRIDE;
    const node = eph.orbit;
    node.set(mulMat3Vec(r, m, r), o);
    node.set(mulMat3Vec(v, m, v), o + 3);
    node.set(mulMat3Vec(a, m, a), o + 6);
    let theta = gmstRad(taiS);
    if (k > 0) theta += 2 * Math.PI * Math.round((thetaPrev + EARTH_ROTATION_RATE_RAD_S * orbitStepS - theta) / (2 * Math.PI));
    node[o + 9] = theta;
    thetaPrev = theta;
  }
  return ok(eph, warnings);
}
