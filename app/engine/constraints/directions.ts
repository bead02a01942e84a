/**
 * Constraint directions from the sky and the orbit: a constraint as the scenario declares it
 * (ConstraintSpec, SI) → the library's AttitudeConstraint with a direction source sampled over a
 * span of plan time (types.ts SampledDirectionSource; the check and the planner interpolate it).
 *
 * Directions (all EME2000, orbit/frames.ts):
 * - fixed: as given;
 * - Sun, Moon: geocentric from orbit/sky.ts at TAI = epoch + t when there is no ephemeris (the
 *   parallax from low Earth orbit is about 10″ for the Sun and up to about 1° for the Moon); from
 *   the spacecraft with one (orbit/ephemerisEval.ts sampleEphemeris). Points: the angle is to the
 *   centre. Sampled every SKY_STEP_S (geocentric) or ORBIT_SKY_STEP_S (from the spacecraft) and
 *   interpolated along the great circle;
 * - Earth centre: −r/|r| from the ephemeris; Earth limb: the same direction with the disc's
 *   angular radius asin(R/|r|) (sky.ts earthAngularRadiusRad, WGS-84 equatorial radius), so the
 *   margin is measured to the disc's nearest edge;
 * - ground station: (site − r)/|site − r| with the site from orbit/sites.ts, rotated with the
 *   Earth by the ephemeris (siteStateAt), sampled every STATION_STEP_S and blended linearly.
 * Earth and station directions need the spacecraft position: without an ephemeris they are
 * refused with an issue naming the field ("needs the scenario's orbit").
 */
import { fail, issue, ok, type Issue, type Result } from '../errors';
import type { Ephemeris } from '../orbit/ephemeris';
import { createEphemerisSample, orbitStateAt, sampleEphemeris, siteStateAt } from '../orbit/ephemerisEval';
import { makeSite, type Site } from '../orbit/sites';
import { earthAngularRadiusRad, moonDirectionEme2000, sunDirectionEme2000 } from '../orbit/sky';
import type { AttitudeConstraint, ConstraintKind, DirectionSource } from './types';

/** A constraint's direction, SI. */
export type DirectionSpec =
  | { kind: 'fixed'; direction: ArrayLike<number> }
  | { kind: 'sun' }
  | { kind: 'moon' }
  | { kind: 'earth-centre' }
  | { kind: 'earth-limb' }
  | { kind: 'ground-station'; latitudeRad: number; longitudeRad: number; altitudeM: number };

export type DirectionKind = DirectionSpec['kind'];

/** A constraint as a scenario declares it, SI (scenario/resolve.ts makes these). */
export interface ConstraintSpec {
  /** Where it was declared, for messages: `constraints[2]` or `keepOut[0]`. */
  path: string;
  name: string;
  kind: ConstraintKind;
  bodyAxis: ArrayLike<number>;
  halfAngleRad: number;
  marginRad: number;
  window: { startS: number; endS: number } | null;
  direction: DirectionSpec;
}

/** Where the directions come from: the epoch (TAI s since J2000 TAI, time/scales.ts) and an optional ephemeris. */
export interface SkyContext {
  epochTaiS: number;
  ephemeris: Ephemeris | null;
}

/** Geocentric Sun and Moon samples (s): their directions turn by < 0.1° in this time. */
export const SKY_STEP_S = 600;
/** Sun and Moon from the spacecraft (s): the Moon's parallax changes over an orbit. */
export const ORBIT_SKY_STEP_S = 30;
/** Earth centre and limb (s): about 0.6° of a low orbit. */
export const EARTH_STEP_S = 10;
/** Ground station (s): up to about 1°/s over a station in low orbit. */
export const STATION_STEP_S = 2;

export function needsOrbit(d: DirectionSpec): boolean {
  return d.kind === 'earth-centre' || d.kind === 'earth-limb' || d.kind === 'ground-station';
}

/** Why a direction cannot be made in this context (issues at `${path}.direction`), or none. */
export function directionIssues(spec: Pick<ConstraintSpec, 'path' | 'direction'>, ctx: SkyContext, t0S: number, t1S: number): Issue[] {
  const p = `${spec.path}.direction`;
  const d = spec.direction;
  if (d.kind === 'fixed') return [];
  if (needsOrbit(d) && !ctx.ephemeris)
    return [
      issue(
        p,
        'needs-orbit',
        `${p}: the ${d.kind === 'ground-station' ? 'ground station' : d.kind === 'earth-limb' ? "Earth's limb" : "Earth's centre"} direction needs the scenario's orbit (the spacecraft position), which this scenario does not have`,
      ),
    ];
  if (!Number.isFinite(ctx.epochTaiS))
    return [issue(p, 'epoch', `${p}: the ${d.kind} direction needs an epoch from 1972 on (the leap-second table starts there)`)];
  const e = ctx.ephemeris;
  if (e && (t0S < e.startS || t1S > e.endS))
    return [issue(p, 'ephemeris-span', `${p}: the orbit covers ${e.startS} s to ${e.endS} s of plan time, the run ${t0S} s to ${t1S} s`)];
  return [];
}

/** Sample times from t0 to t1 (both included, at least 1 s apart) at most `step` apart. */
function sampleTimes(t0: number, t1In: number, step: number): Float64Array {
  const t1 = Math.max(t1In, t0 + 1);
  const m = Math.max(1, Math.ceil((t1 - t0) / step - 1e-9));
  return Float64Array.from({ length: m + 1 }, (_, k) => (k === m ? t1 : t0 + ((t1 - t0) * k) / m));
}

function sampled(
  times: Float64Array,
  fill: (out: Float64Array, t: number) => number,
  interpolation: 'linear' | 'great-circle',
): DirectionSource {
  const dirs = new Float64Array(3 * times.length),
    radii = new Float64Array(times.length),
    u = new Float64Array(3);
  let varies = false;
  times.forEach((t, k) => {
    radii[k] = fill(u, t);
    dirs.set(u, 3 * k);
    if (radii[k] !== radii[0]) varies = true;
  });
  return { kind: 'sampled', timesS: times, directions: dirs, interpolation, angularRadiusRad: varies ? radii : radii[0]! };
}

const ephSample = createEphemerisSample();
const r = new Float64Array(3),
  site = new Float64Array(3);

function toUnit(out: Float64Array, x: number, y: number, z: number): void {
  const n = Math.hypot(x, y, z);
  out[0] = x / n;
  out[1] = y / n;
  out[2] = z / n;
}

/** The direction source of one spec over [t0S, t1S] (directionIssues must be empty). */
function sourceOf(d: DirectionSpec, ctx: SkyContext, t0S: number, t1S: number, station: Site | null): DirectionSource {
  const e = ctx.ephemeris;
  switch (d.kind) {
    case 'fixed':
      return { kind: 'fixed', direction: Float64Array.from(d.direction) };
    case 'sun':
    case 'moon': {
      const moon = d.kind === 'moon';
      if (!e) {
        const geo = moon ? moonDirectionEme2000 : sunDirectionEme2000;
        return sampled(sampleTimes(t0S, t1S, SKY_STEP_S), (out, t) => (geo(out, ctx.epochTaiS + t), 0), 'great-circle');
      }
      return sampled(
        sampleTimes(t0S, t1S, ORBIT_SKY_STEP_S),
        (out, t) => {
          sampleEphemeris(ephSample, e, t);
          out.set(moon ? ephSample.moonDir : ephSample.sunDir);
          return 0;
        },
        'great-circle',
      );
    }
    case 'earth-centre':
    case 'earth-limb': {
      const limb = d.kind === 'earth-limb';
      return sampled(
        sampleTimes(t0S, t1S, EARTH_STEP_S),
        (out, t) => {
          orbitStateAt(r, null, null, null, e!, t);
          toUnit(out, -r[0]!, -r[1]!, -r[2]!);
          return limb ? earthAngularRadiusRad(r) : 0;
        },
        'great-circle',
      );
    }
    case 'ground-station':
      return sampled(
        sampleTimes(t0S, t1S, STATION_STEP_S),
        (out, t) => {
          orbitStateAt(r, null, null, null, e!, t);
          siteStateAt(site, null, null, e!, station!, t);
          toUnit(out, site[0]! - r[0]!, site[1]! - r[1]!, site[2]! - r[2]!);
          return 0;
        },
        'linear',
      );
  }
}

/**
 * The constraints with their directions sampled over [t0S, t1S] of plan time. Specs that share a
 * direction (the Sun for two trackers) share one sampled source, so the check interpolates it once.
 * Fails, naming each constraint's direction field, when a direction cannot be made here.
 */
export function constraintsOver(specs: readonly ConstraintSpec[], ctx: SkyContext, t0S: number, t1S: number): Result<AttitudeConstraint[]> {
  const errors: Issue[] = [];
  for (const s of specs) errors.push(...directionIssues(s, ctx, t0S, t1S));
  if (errors.length) return fail(errors);
  const shared = new Map<string, DirectionSource>();
  const out: AttitudeConstraint[] = [];
  for (const s of specs) {
    const d = s.direction;
    const key = d.kind === 'fixed' ? null : JSON.stringify(d);
    let src = key ? shared.get(key) : undefined;
    if (!src) {
      let station: Site | null = null;
      if (d.kind === 'ground-station') {
        const made = makeSite(
          { name: s.name, latitudeRad: d.latitudeRad, longitudeRad: d.longitudeRad, heightM: d.altitudeM },
          `${s.path}.direction`,
        );
        if (!made.ok) {
          errors.push(...made.errors);
          continue;
        }
        station = made.value;
      }
      src = sourceOf(d, ctx, t0S, t1S, station);
      if (key) shared.set(key, src);
    }
    out.push({
      name: s.name,
      kind: s.kind,
      bodyAxis: Float64Array.from(s.bodyAxis),
      halfAngleRad: s.halfAngleRad,
      marginRad: s.marginRad,
      ...(s.window ? { window: { startS: s.window.startS, endS: s.window.endS } } : {}),
      source: src,
    });
  }
  return errors.length ? fail(errors) : ok(out);
}
