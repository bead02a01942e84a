/**
 * The orbit pieces of a validated scenario (orbitSchema.ts) in the engine's SI view, and back:
 *  - `resolveOrbit`: the element set as given (TLE lines or mean elements: SGP4 is initialised by
 *    the pipeline's orbit stage, pipeline/orbit.ts), the plan epoch as TAI seconds
 *    (time/scales.ts), the sites in radians and metres, and the horizon in seconds;
 *  - `resolveTrack`, `resolveWindow`: a target's moving-target form (site index, unit body axes,
 *    secondary reference) and its window (a UTC start becomes plan seconds, leap seconds counted);
 *  - `orbitToFile`, `trackToFile`, `windowToFile`: the inverse, for toFile.ts.
 * Like resolve.ts, these assert: their input passed validateScenario (orbitValidate.ts).
 */
import { EngineInputError, issue } from '../errors';
import type { MeanElementsInput } from '../orbit/elements';
import { parseUtcIso } from '../time/iso';
import { DEG_PER_RAD, RAD_PER_DEG } from '../units';
import { DEFAULT_HORIZON_S } from './formatConstants';
import type { GroundSiteSpec, OrbitSpec, SecondaryTowardSpec, TargetWindowSpec, TrackForm, TrackSpec } from './orbitSchema';

export interface ResolvedSite {
  id: string;
  label: string;
  latitudeRad: number;
  longitudeRad: number;
  heightM: number;
  elevationMaskRad: number;
}

/** Where the orbit comes from: TLE lines as given, or mean elements in the units SGP4 takes (deg, rev/day or km). */
export type ResolvedOrbitSource = { kind: 'tle'; lines: string[] } | { kind: 'elements'; elements: MeanElementsInput };

export interface ResolvedOrbit {
  source: ResolvedOrbitSource;
  /** The scenario epoch (t = 0) as TAI seconds since 2000-01-01T12:00:00 TAI (time/scales.ts). */
  epochTaiS: number;
  sites: ResolvedSite[];
  /** The ephemeris, windows and plan stay within [0, horizonS] of plan time, s. */
  horizonS: number;
}

/** The secondary reference of a site, station or Sun target (orbit/targets.ts SecondaryReference). */
export type ResolvedSecondary = 'orbit-normal' | 'nadir' | 'velocity' | 'sun' | { inertial: Float64Array };

export type ResolvedTrack =
  | {
      kind: 'site' | 'station';
      /** Index into ResolvedOrbit.sites. */
      siteIndex: number;
      /** Unit body axes. */
      primaryBody: Float64Array;
      secondaryBody: Float64Array;
      secondary: ResolvedSecondary;
    }
  | { kind: 'sun'; primaryBody: Float64Array; secondaryBody: Float64Array; secondary: ResolvedSecondary }
  | { kind: 'nadir'; yaw: 'lvlh' | 'sun-steering'; primaryBody: Float64Array; secondaryBody: Float64Array };

export type ResolvedWindow =
  | { start: 'pass-start'; untilPassEnd: boolean }
  /** Tracking starts at plan time atS (s from the epoch, leap seconds counted); atUtc as the file gave it. */
  | { start: 'time'; atS: number; atUtc: string };

function unit(v: readonly number[], path: string): Float64Array {
  const n = Math.hypot(v[0]!, v[1]!, v[2]!);
  if (!(n > 0) || !Number.isFinite(n)) throw new EngineInputError([issue(path, 'non-zero', `resolve: ${path} is not a direction`)]);
  return Float64Array.of(v[0]! / n, v[1]! / n, v[2]! / n);
}

/** TAI seconds of an ISO 8601 UTC string that validation accepted. */
export function taiOfUtc(iso: string, path: string): number {
  const r = parseUtcIso(iso, path);
  if (!r.ok) throw new EngineInputError(r.errors);
  return r.value.taiS;
}

function resolveSite(s: GroundSiteSpec): ResolvedSite {
  return {
    id: s.id,
    label: s.label,
    latitudeRad: s.latitudeDeg * RAD_PER_DEG,
    longitudeRad: s.longitudeDeg * RAD_PER_DEG,
    heightM: s.heightM,
    elevationMaskRad: (s.elevationMaskDeg ?? 0) * RAD_PER_DEG,
  };
}

/** Mean elements of the file in the form orbit/elements.ts takes. */
function elementsInput(m: NonNullable<OrbitSpec['meanElements']>): MeanElementsInput {
  return {
    ...(m.name !== undefined ? { name: m.name } : {}),
    epochUtcIso: m.epochUtc,
    ...(m.semiMajorAxisKm !== undefined ? { semiMajorAxisKm: m.semiMajorAxisKm } : {}),
    ...(m.meanMotionRevPerDay !== undefined ? { meanMotionRevPerDay: m.meanMotionRevPerDay } : {}),
    eccentricity: m.eccentricity,
    inclinationDeg: m.inclinationDeg,
    raanDeg: m.raanDeg,
    argPerigeeDeg: m.argPerigeeDeg,
    meanAnomalyDeg: m.meanAnomalyDeg,
    ...(m.bstarPerEarthRadii !== undefined ? { bstarPerEarthRadii: m.bstarPerEarthRadii } : {}),
  };
}

export function resolveOrbit(o: OrbitSpec, epochUtc: string): ResolvedOrbit {
  return {
    source: o.tle ? { kind: 'tle', lines: [...o.tle] } : { kind: 'elements', elements: elementsInput(o.meanElements!) },
    epochTaiS: taiOfUtc(epochUtc, 'epochUtc'),
    sites: (o.sites ?? []).map(resolveSite),
    horizonS: o.horizonS ?? DEFAULT_HORIZON_S,
  };
}

export function trackForm(t: TrackSpec): TrackForm {
  if ('site' in t) return 'site';
  if ('station' in t) return 'station';
  if ('sun' in t) return 'sun';
  return 'nadir';
}

function resolveSecondary(s: SecondaryTowardSpec | undefined, path: string): ResolvedSecondary {
  if (s === undefined) return 'orbit-normal';
  return typeof s === 'string' ? s : { inertial: unit(s.inertialDirection, `${path}.inertialDirection`) };
}

/** A validated track → SI; `sites` are the scenario's resolved sites (ids are checked by validation). */
export function resolveTrack(t: TrackSpec, sites: readonly ResolvedSite[], path: string): ResolvedTrack {
  if ('nadir' in t) {
    const n = t.nadir;
    return {
      kind: 'nadir',
      yaw: n.yaw,
      primaryBody: unit(n.bodyAxis ?? [0, 0, 1], `${path}.nadir.bodyAxis`),
      secondaryBody: unit(n.bodySecondary ?? (n.yaw === 'lvlh' ? [0, 1, 0] : [1, 0, 0]), `${path}.nadir.bodySecondary`),
    };
  }
  if ('sun' in t) {
    const s = t.sun;
    return {
      kind: 'sun',
      primaryBody: unit(s.bodyAxis, `${path}.sun.bodyAxis`),
      secondaryBody: unit(s.bodySecondary, `${path}.sun.bodySecondary`),
      secondary: resolveSecondary(s.secondaryToward, `${path}.sun.secondaryToward`),
    };
  }
  const kind = 'site' in t ? 'site' : 'station';
  const a = 'site' in t ? t.site : t.station;
  const siteIndex = sites.findIndex((x) => x.id === a.id);
  if (siteIndex < 0) throw new EngineInputError([issue(`${path}.${kind}.id`, 'known-site', `resolve: unknown site ${a.id}`)]);
  return {
    kind,
    siteIndex,
    primaryBody: unit(a.bodyAxis, `${path}.${kind}.bodyAxis`),
    secondaryBody: unit(a.bodySecondary, `${path}.${kind}.bodySecondary`),
    secondary: resolveSecondary(a.secondaryToward, `${path}.${kind}.secondaryToward`),
  };
}

export function resolveWindow(w: TargetWindowSpec, epochTaiS: number, path: string): ResolvedWindow {
  if (w.start === 'pass-start') return { start: 'pass-start', untilPassEnd: w.holdUntil === 'pass-end' };
  return { start: 'time', atS: taiOfUtc(w.atUtc, `${path}.atUtc`) - epochTaiS, atUtc: w.atUtc };
}

// ---------------------------------------------------------------------------------------------
// The inverse (toFile.ts)

export function orbitToFile(o: ResolvedOrbit, defaultHorizon = DEFAULT_HORIZON_S): OrbitSpec {
  const src = o.source;
  const out: OrbitSpec =
    src.kind === 'tle'
      ? { tle: [...src.lines] }
      : {
          meanElements: {
            ...(src.elements.name !== undefined ? { name: src.elements.name } : {}),
            epochUtc: src.elements.epochUtcIso,
            ...(src.elements.semiMajorAxisKm !== undefined ? { semiMajorAxisKm: src.elements.semiMajorAxisKm } : {}),
            ...(src.elements.meanMotionRevPerDay !== undefined ? { meanMotionRevPerDay: src.elements.meanMotionRevPerDay } : {}),
            eccentricity: src.elements.eccentricity,
            inclinationDeg: src.elements.inclinationDeg,
            raanDeg: src.elements.raanDeg,
            argPerigeeDeg: src.elements.argPerigeeDeg,
            meanAnomalyDeg: src.elements.meanAnomalyDeg,
            ...(src.elements.bstarPerEarthRadii !== undefined ? { bstarPerEarthRadii: src.elements.bstarPerEarthRadii } : {}),
          },
        };
  if (o.sites.length)
    out.sites = o.sites.map((s) => ({
      id: s.id,
      label: s.label,
      latitudeDeg: s.latitudeRad * DEG_PER_RAD,
      longitudeDeg: s.longitudeRad * DEG_PER_RAD,
      heightM: s.heightM,
      ...(s.elevationMaskRad !== 0 ? { elevationMaskDeg: s.elevationMaskRad * DEG_PER_RAD } : {}),
    }));
  if (o.horizonS !== defaultHorizon) out.horizonS = o.horizonS;
  return out;
}

const v3 = (v: ArrayLike<number>): number[] => [v[0]!, v[1]!, v[2]!];

function secondaryToFile(s: ResolvedSecondary): SecondaryTowardSpec {
  return typeof s === 'string' ? s : { inertialDirection: v3(s.inertial) };
}

export function trackToFile(t: ResolvedTrack, sites: readonly ResolvedSite[]): TrackSpec {
  if (t.kind === 'nadir') return { nadir: { yaw: t.yaw, bodyAxis: v3(t.primaryBody), bodySecondary: v3(t.secondaryBody) } };
  const aimed = { bodyAxis: v3(t.primaryBody), bodySecondary: v3(t.secondaryBody), secondaryToward: secondaryToFile(t.secondary) };
  if (t.kind === 'sun') return { sun: aimed };
  const id = sites[t.siteIndex]!.id;
  return t.kind === 'site' ? { site: { id, ...aimed } } : { station: { id, ...aimed } };
}

export function windowToFile(w: ResolvedWindow): TargetWindowSpec {
  if (w.start === 'time') return { start: 'time', atUtc: w.atUtc };
  return w.untilPassEnd ? { start: 'pass-start', holdUntil: 'pass-end' } : { start: 'pass-start' };
}
