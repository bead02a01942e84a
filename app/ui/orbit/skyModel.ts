/**
 * The sky view's geometry (pure; SkyView.tsx draws it): directions on the celestial sphere in the
 * engine's inertial frame (EME2000) as right ascension and declination, a small circle of angular
 * radius ρ about a direction (a keep-out cone's edge on the sky), polylines split where they cross
 * the RA = 0°/360° meridian so an equirectangular chart draws no line across it, the shown run's
 * boresight path, the Sun and Moon over the run, fixed cones and the target directions.
 *
 * RA/Dec from a unit vector: α = atan2(y, x) reduced to [0, 2π), δ = asin(z) — the usual
 * spherical-coordinate definition of the equatorial frame (e.g. Montenbruck & Gill, "Satellite
 * Orbits", 2000, §2.1, from memory on the section). Small circle: p(θ) = cos ρ a + sin ρ (cos θ u
 * + sin θ w) with (u, w) an orthonormal pair ⟂ a, so every p is at angle ρ from a.
 */
import { qRotate } from '../../engine/math/rotation';
import type { OrbitOutput } from '../../engine/pipeline/orbit';
import type { PipelineOutput } from '../../engine/pipeline/types';
import { moonDirectionEme2000, sunDirectionEme2000 } from '../../engine/orbit/sky';
import { parseUtcIso } from '../../engine/time/iso';
import { DEG_PER_RAD, HALF_PI, RAD_PER_DEG } from '../../engine/units';

const TWO_PI = 2 * Math.PI;

/** Right ascension in [0, 2π) and declination in [−π/2, π/2] of a direction (any non-zero length), rad. */
export function raDecOf(v: ArrayLike<number>): { raRad: number; decRad: number } {
  const x = v[0]!,
    y = v[1]!,
    z = v[2]!;
  const r = Math.hypot(x, y, z);
  let ra = Math.atan2(y, x);
  if (ra < 0) ra += TWO_PI;
  if (ra >= TWO_PI) ra = 0; // atan2(−0, x) + 2π rounds to 2π
  const s = Math.max(-1, Math.min(1, z / r));
  return { raRad: ra, decRad: Math.asin(s) };
}

/** Angle between two directions, rad (atan2 form: accurate near 0 and π). */
export function angleBetween(a: ArrayLike<number>, b: ArrayLike<number>): number {
  const cx = a[1]! * b[2]! - a[2]! * b[1]!,
    cy = a[2]! * b[0]! - a[0]! * b[2]!,
    cz = a[0]! * b[1]! - a[1]! * b[0]!;
  return Math.atan2(Math.hypot(cx, cy, cz), a[0]! * b[0]! + a[1]! * b[1]! + a[2]! * b[2]!);
}

/**
 * n points (3n numbers, unit vectors) on the small circle of angular radius `radiusRad` about
 * `axis` (any non-zero length), at equal steps of the angle about it. The outline is closed by
 * joining the last point to the first.
 */
export function smallCircle(axis: ArrayLike<number>, radiusRad: number, n: number): Float64Array {
  const r = Math.hypot(axis[0]!, axis[1]!, axis[2]!);
  const ax = axis[0]! / r,
    ay = axis[1]! / r,
    az = axis[2]! / r;
  // u: the unit vector ⟂ a from the coordinate axis least aligned with a; w = a × u.
  let ux: number, uy: number, uz: number;
  if (Math.abs(ax) <= Math.abs(ay) && Math.abs(ax) <= Math.abs(az)) [ux, uy, uz] = [0, az, -ay];
  else if (Math.abs(ay) <= Math.abs(az)) [ux, uy, uz] = [-az, 0, ax];
  else [ux, uy, uz] = [ay, -ax, 0];
  const un = Math.hypot(ux, uy, uz);
  ux /= un;
  uy /= un;
  uz /= un;
  const wx = ay * uz - az * uy,
    wy = az * ux - ax * uz,
    wz = ax * uy - ay * ux;
  const c = Math.cos(radiusRad),
    s = Math.sin(radiusRad);
  const out = new Float64Array(3 * n);
  for (let k = 0; k < n; k++) {
    const th = (TWO_PI * k) / n;
    const ct = Math.cos(th),
      st = Math.sin(th);
    out[3 * k] = c * ax + s * (ct * ux + st * wx);
    out[3 * k + 1] = c * ay + s * (ct * uy + st * wy);
    out[3 * k + 2] = c * az + s * (ct * uz + st * wz);
  }
  return out;
}

/** A polyline on the chart, degrees: RA in [0, 360], Dec in [−90, 90]. */
export interface SkyPiece {
  raDeg: number[];
  decDeg: number[];
}

/**
 * Does the step from (ax, ay, ·) to (bx, by, ·) change RA by more than 90° (taken the short way)?
 * Away from the poles that needs a step of at least 90° · cos δ on the sky; the trails and outlines
 * drawn here step far less (≤ 1500 points per run, 180 per circle), so it happens only when the step
 * passes within a few degrees of a celestial pole, where the equirectangular chart stretches it
 * into a line across the chart's top or bottom (the sweep in RA at nearly constant declination).
 * Such a step is split, leaving the chart at the pole edge (common practice, no source: the
 * threshold is a judgement call well above any ordinary step and below the ~180° of a pole pass).
 */
function passesPole(ax: number, ay: number, bx: number, by: number): boolean {
  // cos ΔRA = (a_xy · b_xy) / (|a_xy| |b_xy|) < 0  ⇔  |ΔRA| > 90°; a point on the pole axis has no RA (drawn at RA 0°).
  const dot = ax * bx + ay * by;
  const na = Math.hypot(ax, ay),
    nb = Math.hypot(bx, by);
  if (na === 0 || nb === 0) return na !== nb; // onto or off the pole itself
  return dot < 0;
}

/**
 * Directions (3 per point) as chart polylines, split where a step passes over a celestial pole
 * (passesPole: the RA jumps by more than 90° in one step), and cut where a step crosses the RA = 0° meridian
 * (the half-plane y = 0, x > 0). The cut point is where the chord between the two points meets
 * that plane, projected back to the sphere: it lies on the great circle through them, and the
 * piece ending there ends at RA 360°, the next starts at RA 0°. `closed` joins the last point to
 * the first (circles).
 */
export function skyPieces(points: ArrayLike<number>, closed: boolean): SkyPiece[] {
  const n = Math.floor(points.length / 3);
  if (n === 0) return [];
  const pieces: SkyPiece[] = [];
  let cur: SkyPiece = { raDeg: [], decDeg: [] };
  const push = (raRad: number, decRad: number) => {
    cur.raDeg.push(raRad * DEG_PER_RAD);
    cur.decDeg.push(decRad * DEG_PER_RAD);
  };
  const at = (k: number) => {
    const y = points[3 * k + 1]!;
    const r = raDecOf([points[3 * k]!, y, points[3 * k + 2]!]);
    // y < 0 is the RA-near-360° side of the cut; 2π − tiny rounds to 2π, which raDecOf writes as 0.
    if (y < 0 && r.raRad < Math.PI) r.raRad = TWO_PI;
    return r;
  };
  const p0 = at(0);
  push(p0.raRad, p0.decRad);
  const steps = closed ? n : n - 1;
  for (let k = 0; k < steps; k++) {
    const a = k,
      b = (k + 1) % n;
    const ax = points[3 * a]!,
      ay = points[3 * a + 1]!,
      az = points[3 * a + 2]!;
    const bx = points[3 * b]!,
      by = points[3 * b + 1]!,
      bz = points[3 * b + 2]!;
    if (passesPole(ax, ay, bx, by)) {
      // Over a pole: leave the chart at the top (or bottom) edge at a's RA, come back at b's.
      const pole = az + bz >= 0 ? HALF_PI : -HALF_PI;
      push(at(a).raRad, pole);
      pieces.push(cur);
      cur = { raDeg: [], decDeg: [] };
      const q = at(b);
      push(q.raRad, pole);
      push(q.raRad, q.decRad);
      continue;
    }
    const aSide = ay >= 0,
      bSide = by >= 0;
    if (aSide !== bSide && ay !== by) {
      const s = ay / (ay - by);
      const cx = ax + s * (bx - ax),
        cz = az + s * (bz - az);
      if (cx > 0) {
        const dec = Math.atan2(cz, cx);
        // Leaving y < 0 (RA near 360°) for y ≥ 0 (RA near 0°), or the other way.
        push(aSide ? 0 : TWO_PI, dec);
        pieces.push(cur);
        cur = { raDeg: [], decDeg: [] };
        push(aSide ? TWO_PI : 0, dec);
      }
    }
    const q = at(b);
    push(q.raRad, q.decRad);
  }
  pieces.push(cur);
  // A closed outline cut once or more: its first and last pieces are one line through the start.
  if (closed && pieces.length > 1) {
    const first = pieces.shift()!;
    const last = pieces[pieces.length - 1]!;
    last.raDeg.push(...first.raDeg.slice(1));
    last.decDeg.push(...first.decDeg.slice(1));
  }
  return pieces.filter((p) => p.raDeg.length > 0);
}

/**
 * The inertial direction of body axis `bodyAxis` (any non-zero length) at every `stride`-th
 * attitude of `q` (4 per sample, qInertialFromBody), and always the last one: 3 per point.
 */
export function bodyAxisPath(q: ArrayLike<number>, n: number, bodyAxis: ArrayLike<number>, maxPoints: number): Float64Array {
  const r = Math.hypot(bodyAxis[0]!, bodyAxis[1]!, bodyAxis[2]!);
  const b = [bodyAxis[0]! / r, bodyAxis[1]! / r, bodyAxis[2]! / r];
  if (n <= 0) return new Float64Array(0);
  const stride = Math.max(1, Math.ceil(n / Math.max(2, maxPoints)));
  const idx: number[] = [];
  for (let i = 0; i < n; i += stride) idx.push(i);
  if (idx[idx.length - 1] !== n - 1) idx.push(n - 1);
  const out = new Float64Array(3 * idx.length);
  const v = new Float64Array(3);
  const qi = new Float64Array(4);
  idx.forEach((i, k) => {
    qi.set([q[4 * i]!, q[4 * i + 1]!, q[4 * i + 2]!, q[4 * i + 3]!]);
    qRotate(v, qi, b);
    out.set(v, 3 * k);
  });
  return out;
}

/** The body axes the chart can follow. */
export const SKY_AXES: readonly { value: string; label: string; axis: [number, number, number] }[] = [
  { value: '+X', label: '+X', axis: [1, 0, 0] },
  { value: '+Y', label: '+Y', axis: [0, 1, 0] },
  { value: '+Z', label: '+Z', axis: [0, 0, 1] },
  { value: '-X', label: '−X', axis: [-1, 0, 0] },
  { value: '-Y', label: '−Y', axis: [0, -1, 0] },
  { value: '-Z', label: '−Z', axis: [0, 0, -1] },
];

export interface SkyMark {
  label: string;
  raDeg: number;
  decDeg: number;
}

export interface SkyCone {
  label: string;
  kind: 'keep-out' | 'keep-in';
  pieces: SkyPiece[];
}

export interface SkyScene {
  /** The chosen body axis over the shown run. */
  trail: SkyPiece[];
  trailStart: SkyMark | null;
  trailEnd: SkyMark | null;
  /** Spacecraft → Sun / Moon over the run (orbit scenarios), or geocentric without an orbit. */
  sunPath: SkyPiece[];
  moonPath: SkyPiece[];
  sun: SkyMark | null;
  moon: SkyMark | null;
  /** Cones fixed in inertial axes whose body axis is the chosen one (others are not meaningful here). */
  cones: SkyCone[];
  /** Where the chosen body axis points at each target's attitude (for a moving target: when tracking starts). */
  targets: SkyMark[];
  /** Seconds the paths cover. */
  spanS: number;
}

function mark(label: string, v: ArrayLike<number>): SkyMark {
  const { raRad, decRad } = raDecOf(v);
  return { label, raDeg: raRad * DEG_PER_RAD, decDeg: decRad * DEG_PER_RAD };
}

const sameAxis = (a: ArrayLike<number>, b: ArrayLike<number>) => angleBetween(a, b) < 1e-9;

/** Directions from an orbit track's per-sample unit vectors (3 per sample) over [0, tEndS]. */
function trackDirections(orbit: OrbitOutput, dirs: Float64Array, tEndS: number): Float64Array {
  const n = Math.min(orbit.track.t.length, Math.floor(tEndS / orbit.track.stepS) + 2);
  return dirs.subarray(0, 3 * Math.max(1, n));
}

/**
 * The last few geocentric paths by (body, epoch, span): an edit that leaves the epoch and the
 * run's length alone (a gain, an inertia) redraws the sky without evaluating the Moon's series
 * 97 times again. The arrays are only read (subarray views), never handed to a worker.
 */
const bodyPathCache: { key: string; dirs: Float64Array }[] = [];
const BODY_PATH_CACHE_SIZE = 4;

function bodyDirections(which: 'sun' | 'moon', epochTaiS: number, spanS: number): Float64Array {
  const key = `${which}|${epochTaiS}|${spanS}`;
  const hit = bodyPathCache.find((e) => e.key === key);
  if (hit) return hit.dirs;
  const dirs = computeBodyDirections(which, epochTaiS, spanS);
  bodyPathCache.unshift({ key, dirs });
  bodyPathCache.length = Math.min(bodyPathCache.length, BODY_PATH_CACHE_SIZE);
  return dirs;
}

/** Geocentric Sun or Moon directions over [0, spanS] (scenarios without an orbit), at most 97 samples. */
function computeBodyDirections(which: 'sun' | 'moon', epochTaiS: number, spanS: number): Float64Array {
  const m = spanS > 0 ? 96 : 0;
  const out = new Float64Array(3 * (m + 1));
  const v = new Float64Array(3);
  for (let k = 0; k <= m; k++) {
    const t = m === 0 ? 0 : (spanS * k) / m;
    if (which === 'sun') sunDirectionEme2000(v, epochTaiS + t);
    else moonDirectionEme2000(v, epochTaiS + t);
    out.set(v, 3 * k);
  }
  return out;
}

type Obj = Record<string, unknown>;
const isObj = (v: unknown): v is Obj => v !== null && typeof v === 'object' && !Array.isArray(v);

/** The fixed inertial direction of a checked constraint, read from the validated file by its path. */
function fixedDirectionOf(file: unknown, path: string): number[] | null {
  const m = /^(constraints|keepOut)\[(\d+)\]$/.exec(path);
  if (!m || !isObj(file)) return null;
  const list = file[m[1]!];
  const c = Array.isArray(list) ? (list[Number(m[2])] as unknown) : undefined;
  if (!isObj(c)) return null;
  const d =
    m[1] === 'keepOut' ? c.inertialDirection : isObj(c.direction) && c.direction.kind === 'fixed' ? c.direction.inertialDirection : null;
  return Array.isArray(d) && d.length === 3 && d.every((x) => typeof x === 'number') ? (d as number[]) : null;
}

/**
 * Everything the sky view draws for the run `runKey` of `out` and the body axis `bodyAxis`.
 * Without a run (none flown yet) the trail is empty and the Sun and Moon cover the plan.
 */
export function skyScene(out: PipelineOutput, runKey: string | null, bodyAxis: ArrayLike<number>, maxPoints = 1500): SkyScene {
  const run = out.runs.find((r) => r.key === runKey) ?? null;
  const tr = run?.trace ?? null;
  const spanS = tr && tr.n > 0 ? tr.t[tr.n - 1]! : out.plan.totalTimeS;
  const trailPts = tr ? bodyAxisPath(tr.q, tr.n, bodyAxis, maxPoints) : new Float64Array(0);
  const nt = trailPts.length / 3;
  let sunPts: Float64Array, moonPts: Float64Array;
  if (out.orbit) {
    sunPts = trackDirections(out.orbit, out.orbit.track.sunDir, spanS);
    moonPts = trackDirections(out.orbit, out.orbit.track.moonDir, spanS);
  } else {
    const ep = parseUtcIso(out.scenario.epochUtc);
    const tai = ep.ok ? ep.value.taiS : 0;
    sunPts = bodyDirections('sun', tai, spanS);
    moonPts = bodyDirections('moon', tai, spanS);
  }
  const sunNow = sunPts.length >= 3 ? sunPts.subarray(0, 3) : null;
  const moonNow = moonPts.length >= 3 ? moonPts.subarray(0, 3) : null;
  const cones: SkyCone[] = [];
  for (const c of out.constraints ?? []) {
    if (c.directionKind !== 'fixed' || !sameAxis(c.bodyAxis, bodyAxis)) continue;
    const d = fixedDirectionOf(out.scenario.file, c.path);
    if (!d) continue;
    cones.push({ label: c.name, kind: c.kind, pieces: skyPieces(smallCircle(d, c.halfAngleRad, 180), true) });
  }
  if ((out.constraints ?? []).length === 0)
    for (const k of out.keepOut)
      if (sameAxis(k.bodyAxis, bodyAxis))
        cones.push({ label: k.label, kind: 'keep-out', pieces: skyPieces(smallCircle(k.inertialDirection, k.halfAngleRad, 180), true) });
  const v = new Float64Array(3);
  const targets = out.scenario.targets.map((t, i) => mark(`${i + 1}`, qRotate(v, t.q, bodyAxis)));
  return {
    trail: skyPieces(trailPts, false),
    trailStart: nt > 0 ? mark('start', trailPts.subarray(0, 3)) : null,
    trailEnd: nt > 0 ? mark('end', trailPts.subarray(3 * (nt - 1))) : null,
    sunPath: skyPieces(sunPts, false),
    moonPath: skyPieces(moonPts, false),
    sun: sunNow ? mark('Sun', sunNow) : null,
    moon: moonNow ? mark('Moon', moonNow) : null,
    cones,
    targets,
    spanS,
  };
}

/** Degrees → radians for callers that build directions from RA/Dec (tests, the chart's grid). */
export function directionOfRaDec(raDeg: number, decDeg: number): [number, number, number] {
  const a = raDeg * RAD_PER_DEG,
    d = decDeg * RAD_PER_DEG;
  return [Math.cos(d) * Math.cos(a), Math.cos(d) * Math.sin(a), Math.sin(d)];
}
