/**
 * Cross-field rules of the orbit pieces (orbitSchema.ts), run by validateScenario on the raw input
 * part by part so one broken field does not hide problems elsewhere:
 *  - every target has exactly one of "attitude" and "track"; a track or a window needs the orbit
 *    block; a relative attitude cannot follow a track (the body is moving there);
 *  - the orbit gives exactly one of "tle" and "meanElements"; a TLE is checked column by column
 *    (orbit/tle.ts: each problem names the line and the columns, e.g. `orbit.tle line 2,
 *    columns 27–33`), SGP4 must initialise, and a horizon reaching more than 14 days from the
 *    element epoch draws a warning (orbit/propagate.ts);
 *  - site ids are unique and every track names a known one; body axes are non-zero and not
 *    parallel; a Sun target cannot keep its secondary axis on the Sun;
 *  - a "pass-start" window needs a site or station track; a "time" window lies within the horizon.
 */
import { issue, type Issue } from '../errors';
import { orbitFromElements } from '../orbit/elements';
import { checkPropagationSpan, type Sgp4Orbit } from '../orbit/propagate';
import { orbitFromTle } from '../orbit/tle';
import { parseUtcIso } from '../time/iso';
import { atFileEpochKey } from './epochKey';
import { DEFAULT_HORIZON_S, OrbitSchema, TargetWindowSchema, TrackSchema, type OrbitSpec, type TrackSpec } from './orbitSchema';

type Obj = Record<string, unknown>;

function isObj(v: unknown): v is Obj {
  return v !== null && typeof v === 'object' && !Array.isArray(v);
}

/** |a × b| / (|a||b|) below this counts as parallel (the attitude forms use the same). */
const PARALLEL_TOL = 1e-9;

function norm(v: readonly number[]): number {
  return Math.hypot(v[0]!, v[1]!, v[2]!);
}

function sinBetween(a: readonly number[], b: readonly number[]): number {
  const cx = a[1]! * b[2]! - a[2]! * b[1]!,
    cy = a[2]! * b[0]! - a[0]! * b[2]!,
    cz = a[0]! * b[1]! - a[1]! * b[0]!;
  return Math.hypot(cx, cy, cz) / (norm(a) * norm(b));
}

/** SGP4 set up from the orbit block, with its problems; null when it cannot be. */
export function orbitOfSpec(o: OrbitSpec, errors: Issue[], warnings: Issue[]): Sgp4Orbit | null {
  if ((o.tle === undefined) === (o.meanElements === undefined)) {
    errors.push(issue('orbit', 'one-of', 'orbit must give exactly one of "tle" (a two-line element set) and "meanElements"'));
    return null;
  }
  const r = o.tle ? orbitFromTle(o.tle.join('\n'), 'orbit.tle') : orbitFromElements(toElements(o.meanElements!), 'orbit.meanElements');
  warnings.push(...r.warnings.map(atFileEpochKey));
  if (!r.ok) {
    errors.push(...r.errors.map(atFileEpochKey));
    return null;
  }
  return r.value;
}

function toElements(m: NonNullable<OrbitSpec['meanElements']>) {
  const { epochUtc, ...rest } = m;
  return { ...rest, epochUtcIso: epochUtc };
}

function checkAxes(
  primary: readonly number[] | undefined,
  secondary: readonly number[] | undefined,
  base: string,
  names: [string, string],
  errors: Issue[],
): void {
  let good = true;
  for (const [v, k] of [
    [primary, names[0]],
    [secondary, names[1]],
  ] as const) {
    if (v && !(norm(v) > 0)) {
      errors.push(issue(`${base}.${k}`, 'non-zero', `${base}.${k} is the zero vector; a body axis needs a non-zero length`));
      good = false;
    }
  }
  if (good && primary && secondary && sinBetween(primary, secondary) < PARALLEL_TOL)
    errors.push(
      issue(
        `${base}.${names[1]}`,
        'not-parallel',
        `${base}.${names[1]} is parallel to ${base}.${names[0]}, so it cannot fix the rotation about that axis; choose an axis at an angle to it`,
      ),
    );
}

/** Axes, secondary reference and site id of a track that parsed. */
function checkTrack(t: TrackSpec, base: string, siteIds: Set<string> | null, errors: Issue[]): void {
  if ('nadir' in t) {
    const yaw = t.nadir.yaw;
    checkAxes(
      t.nadir.bodyAxis ?? [0, 0, 1],
      t.nadir.bodySecondary ?? (yaw === 'lvlh' ? [0, 1, 0] : [1, 0, 0]),
      `${base}.nadir`,
      ['bodyAxis', 'bodySecondary'],
      errors,
    );
    return;
  }
  const key = 'sun' in t ? 'sun' : 'site' in t ? 'site' : 'station';
  const a = 'sun' in t ? t.sun : 'site' in t ? t.site : t.station;
  const id = 'site' in t ? t.site.id : 'station' in t ? t.station.id : null;
  const p = `${base}.${key}`;
  checkAxes(a.bodyAxis, a.bodySecondary, p, ['bodyAxis', 'bodySecondary'], errors);
  const s = a.secondaryToward;
  if (typeof s === 'object' && !(norm(s.inertialDirection) > 0))
    errors.push(issue(`${p}.secondaryToward.inertialDirection`, 'non-zero', `${p}.secondaryToward.inertialDirection is the zero vector`));
  if (key === 'sun' && s === 'sun')
    errors.push(issue(`${p}.secondaryToward`, 'parallel', `${p}.secondaryToward cannot be "sun": the primary axis is already on the Sun`));
  if (id !== null && siteIds) {
    if (!siteIds.has(id))
      errors.push(
        issue(
          `${p}.id`,
          'known-site',
          `${p}.id "${id}" is not in orbit.sites (known: ${[...siteIds].map((x) => `"${x}"`).join(', ') || 'none'})`,
        ),
      );
  }
}

/** The orbit's epoch, horizon and site ids as far as they parse (for the target checks). */
interface OrbitFacts {
  present: boolean;
  epochTaiS: number | null;
  horizonS: number;
  siteIds: Set<string> | null;
}

function checkOrbitBlock(raw: Obj, errors: Issue[], warnings: Issue[]): OrbitFacts {
  const ep = typeof raw.epochUtc === 'string' ? parseUtcIso(raw.epochUtc) : null;
  const epochTaiS = ep && ep.ok ? ep.value.taiS : null;
  const facts: OrbitFacts = { present: raw.orbit !== undefined, epochTaiS, horizonS: DEFAULT_HORIZON_S, siteIds: null };
  if (!isObj(raw.orbit)) return facts;
  const o = raw.orbit;
  if (typeof o.horizonS === 'number' && o.horizonS > 0) facts.horizonS = o.horizonS;
  if (Array.isArray(o.sites)) {
    const seen = new Map<string, number>();
    o.sites.forEach((s, i) => {
      const id = isObj(s) ? s.id : undefined;
      if (typeof id !== 'string') return;
      const k = seen.get(id);
      if (k === undefined) seen.set(id, i);
      else
        errors.push(
          issue(
            `orbit.sites[${i}].id`,
            'unique',
            `orbit.sites[${i}].id "${id}" is already used by orbit.sites[${k}]; site ids must be unique`,
          ),
        );
    });
    facts.siteIds = new Set(seen.keys());
  } else facts.siteIds = new Set();
  const parsed = OrbitSchema.safeParse(o);
  // Column-level TLE problems are worth reporting even when another orbit field is wrong.
  const spec: OrbitSpec | null = parsed.success
    ? parsed.data
    : Array.isArray(o.tle) && o.tle.every((l) => typeof l === 'string') && o.meanElements === undefined
      ? { tle: o.tle as string[] }
      : null;
  if (!spec) return facts;
  const sgp4 = orbitOfSpec(spec, errors, warnings);
  if (sgp4 && epochTaiS !== null) warnings.push(...checkPropagationSpan(sgp4, epochTaiS, epochTaiS + facts.horizonS, 'orbit'));
  return facts;
}

function checkWindow(t: Obj, i: number, isPassTrack: boolean, facts: OrbitFacts, errors: Issue[], warnings: Issue[]): void {
  const base = `targets[${i}].window`;
  if (!facts.present) {
    errors.push(issue(base, 'needs-orbit', `${base} needs the scenario's orbit block: windows come from the orbit and its epoch`));
    return;
  }
  const w = TargetWindowSchema.safeParse(t.window);
  if (!w.success) return;
  if (w.data.start === 'pass-start') {
    if (!isPassTrack)
      errors.push(
        issue(
          `${base}.start`,
          'needs-site',
          `${base}.start "pass-start" needs a site or station target (track.site or track.station): only they have passes`,
        ),
      );
    if (w.data.holdUntil === 'pass-end' && typeof t.holdS === 'number' && t.holdS > 0)
      warnings.push(
        issue(`targets[${i}].holdS`, 'ignored', `targets[${i}].holdS is not used: the window holds the target to the end of its pass`),
      );
    return;
  }
  const at = parseUtcIso(w.data.atUtc, `${base}.atUtc`);
  if (!at.ok) {
    errors.push(...at.errors);
    return;
  }
  if (facts.epochTaiS === null) return;
  const s = at.value.taiS - facts.epochTaiS;
  if (s < 0 || s > facts.horizonS)
    errors.push(
      issue(
        `${base}.atUtc`,
        'within-horizon',
        `${base}.atUtc is ${s.toFixed(3)} s from the scenario epoch; it must be within the orbit horizon [0, ${facts.horizonS}] s (orbit.horizonS)`,
      ),
    );
}

/** Every orbit, track and window rule (header); problems are appended to errors and warnings. */
export function checkOrbitScenario(raw: Obj, errors: Issue[], warnings: Issue[], maxTargets: number): void {
  const facts = checkOrbitBlock(raw, errors, warnings);
  const targets = raw.targets;
  if (!Array.isArray(targets)) return;
  let previousIsTrack = false;
  targets.slice(0, maxTargets).forEach((t, i) => {
    if (!isObj(t)) {
      previousIsTrack = false;
      return;
    }
    const hasAtt = t.attitude !== undefined,
      hasTrack = t.track !== undefined;
    const p = `targets[${i}]`;
    if (hasAtt && hasTrack)
      errors.push(issue(p, 'one-form', `${p} must have only one of "attitude" (a fixed attitude) and "track" (a moving target)`));
    else if (!hasAtt && !hasTrack)
      errors.push(issue(p, 'required', `${p} needs "attitude" (a fixed attitude) or "track" (a moving target from the orbit)`));
    if (hasAtt && isObj(t.attitude) && t.attitude.relative !== undefined && previousIsTrack)
      errors.push(
        issue(
          `${p}.attitude.relative`,
          'after-track',
          `${p}.attitude.relative cannot follow a moving (track) target: there is no fixed previous attitude to turn from`,
        ),
      );
    let passTrack = false;
    if (hasTrack) {
      if (!facts.present)
        errors.push(
          issue(
            `${p}.track`,
            'needs-orbit',
            `${p}.track needs the scenario's orbit block (orbit.tle or orbit.meanElements) to know where the spacecraft is`,
          ),
        );
      const tr = TrackSchema.safeParse(t.track);
      if (tr.success) {
        checkTrack(tr.data, `${p}.track`, facts.present ? facts.siteIds : null, errors);
        passTrack = 'site' in tr.data || 'station' in tr.data;
      }
    }
    if (t.window !== undefined) checkWindow(t, i, passTrack, facts, errors, warnings);
    previousIsTrack = hasTrack && !hasAtt;
  });
}
