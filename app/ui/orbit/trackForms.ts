/**
 * What the target card writes when the user picks a target's kind (a fixed attitude, or one of
 * the orbit's moving targets: scenario/orbitSchema.ts `track`) and its window. Pure, so tests can
 * run the results through the engine's validator.
 *
 * Switching keeps what can be kept: the body axes move between the site, station and Sun forms;
 * a track turned back into a fixed attitude is written as the quaternion the last plan tracked
 * from (ScenarioSummary.targets[i].q) when the caller has it, so the slew does not jump.
 */
import { TRACK_FORMS, type TrackForm } from '../../engine/scenario/orbitSchema';

type Obj = Record<string, unknown>;
const isObj = (v: unknown): v is Obj => v !== null && typeof v === 'object' && !Array.isArray(v);

export type TargetKind = 'fixed' | TrackForm;

export const TARGET_KINDS: readonly { value: TargetKind; label: string }[] = [
  { value: 'fixed', label: 'Fixed attitude' },
  { value: 'site', label: 'Ground site' },
  { value: 'station', label: 'Station pass (track it)' },
  { value: 'sun', label: 'Sun-pointing' },
  { value: 'nadir', label: 'Nadir hold' },
];

export type WindowKind = 'none' | 'pass' | 'pass-to-end' | 'time';

export const WINDOW_KINDS: readonly { value: WindowKind; label: string }[] = [
  { value: 'none', label: 'After previous' },
  { value: 'pass', label: 'Pass start, Hold s' },
  { value: 'pass-to-end', label: 'Pass start to end' },
  { value: 'time', label: 'At a UTC time' },
];

/** Where the secondary body axis is kept (SecondaryTowardSchema); "fixed" is the EME2000 vector form. */
export const SECONDARY_TOWARD: readonly { value: string; label: string }[] = [
  { value: 'orbit-normal', label: 'Orbit normal (r × v)' },
  { value: 'nadir', label: 'Nadir (−r)' },
  { value: 'velocity', label: 'Velocity (v)' },
  { value: 'sun', label: 'Sun' },
  { value: 'fixed', label: 'Fixed EME2000 direction' },
];

export const YAW_RULES: readonly { value: string; label: string }[] = [
  { value: 'lvlh', label: 'LVLH (secondary on −orbit normal)' },
  { value: 'sun-steering', label: 'Sun steering (secondary toward the Sun)' },
];

export function targetKindOf(target: unknown): TargetKind {
  if (!isObj(target) || !isObj(target.track)) return 'fixed';
  const k = Object.keys(target.track)[0];
  return (TRACK_FORMS as readonly string[]).includes(k ?? '') ? (k as TrackForm) : 'fixed';
}

export function windowKindOf(target: unknown): WindowKind {
  const w = isObj(target) ? target.window : undefined;
  if (!isObj(w)) return 'none';
  if (w.start === 'time') return 'time';
  return w.holdUntil === 'pass-end' ? 'pass-to-end' : 'pass';
}

export function secondaryKindOf(toward: unknown): string {
  if (typeof toward === 'string') return toward;
  if (isObj(toward)) return 'fixed';
  return 'orbit-normal';
}

/** The orbit's site ids in file order (strings only). */
export function siteIdsOf(scenario: unknown): string[] {
  const sites = isObj(scenario) && isObj(scenario.orbit) ? scenario.orbit.sites : undefined;
  if (!Array.isArray(sites)) return [];
  return sites.flatMap((s) => (isObj(s) && typeof s.id === 'string' ? [s.id] : []));
}

/** Axes a new aimed track starts from: imager +Z with +X kept toward the orbit normal (common practice, no source). */
const DEFAULT_AIMED = { bodyAxis: [0, 0, 1], bodySecondary: [1, 0, 0], secondaryToward: 'orbit-normal' };

function aimedOf(track: unknown): Obj {
  if (!isObj(track)) return { ...DEFAULT_AIMED };
  const body = Object.values(track)[0];
  if (!isObj(body) || !Array.isArray(body.bodyAxis) || !Array.isArray(body.bodySecondary)) return { ...DEFAULT_AIMED };
  const out: Obj = { bodyAxis: body.bodyAxis, bodySecondary: body.bodySecondary };
  if (body.secondaryToward !== undefined) out.secondaryToward = body.secondaryToward;
  return out;
}

/**
 * The target `target` rewritten as `kind`. `scenario` supplies the site ids (the first one is
 * picked; the engine names a missing one); `trackedQ` is the attitude the last plan gave this
 * target ([x, y, z, w]) for the way back to a fixed attitude. A window that only a site or
 * station can have is dropped when the new kind has no pass.
 */
export function retargetKind(target: unknown, kind: TargetKind, scenario: unknown, trackedQ?: ArrayLike<number> | null): Obj {
  const t: Obj = isObj(target) ? { ...target } : {};
  const from = targetKindOf(t);
  if (from === kind) return t;
  const oldTrack = t.track;
  delete t.track;
  delete t.attitude;
  if (kind === 'fixed') {
    delete t.window;
    t.attitude =
      trackedQ && trackedQ.length === 4 && Array.from(trackedQ).every(Number.isFinite)
        ? { quaternion: Array.from(trackedQ, (x) => Number(x.toPrecision(12))) }
        : { quaternion: [0, 0, 0, 1] };
    return t;
  }
  delete t.rollFree; // a roll-free target needs an attitude form with a pointed axis
  if (kind === 'nadir') t.track = { nadir: { yaw: 'lvlh' } };
  else if (kind === 'sun') {
    const a = aimedOf(oldTrack);
    // The Sun cannot hold the secondary on the Sun (orbitValidate.ts); start from the orbit normal then.
    if (a.secondaryToward === 'sun') a.secondaryToward = 'orbit-normal';
    t.track = { sun: a };
  } else {
    const oldId = isObj(oldTrack) ? (Object.values(oldTrack)[0] as Obj | undefined)?.id : undefined;
    const id = typeof oldId === 'string' ? oldId : (siteIdsOf(scenario)[0] ?? '');
    t.track = { [kind]: { id, ...aimedOf(oldTrack) } };
  }
  if (kind !== 'site' && kind !== 'station' && isObj(t.window) && t.window.start === 'pass-start') delete t.window;
  return t;
}

/** The window for `kind`; `epochUtc` (the scenario's) starts a new time window. */
export function windowFor(kind: WindowKind, current: unknown, epochUtc: unknown): Obj | undefined {
  if (kind === 'none') return undefined;
  if (kind === 'pass') return { start: 'pass-start' };
  if (kind === 'pass-to-end') return { start: 'pass-start', holdUntil: 'pass-end' };
  const at = isObj(current) && typeof current.atUtc === 'string' ? current.atUtc : typeof epochUtc === 'string' ? epochUtc : '';
  return { start: 'time', atUtc: at };
}

/** The secondaryToward value for a choice; a fixed direction starts on +Z of EME2000. */
export function secondaryFor(choice: string, current: unknown): unknown {
  if (choice !== 'fixed') return choice;
  return isObj(current) && Array.isArray(current.inertialDirection) ? current : { inertialDirection: [0, 0, 1] };
}
