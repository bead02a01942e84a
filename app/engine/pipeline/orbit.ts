/**
 * The pipeline's orbit stage (scenarios with an `orbit` block): SGP4 set up from the element set,
 * one ephemeris over the horizon (built once per scenario), the ground sites, the moving targets,
 * every site's passes above its elevation mask and the eclipses (conical shadow, orbit/sky.ts);
 * then the orbit-aware plan (plan/trackingSequence.ts), the summaries views and exports read, and
 * after a flight each window's achieved pointing error.
 *
 * Ephemeris span: plan time [0, horizonS + tail + EPHEMERIS_MARGIN_S], so a flight that runs its
 * tail past the last hold still has its target; the horizon is at most 7 days (orbitSchema.ts), so
 * the ephemeris holds at most ~20 200 orbit nodes at 30 s (≈ 1.6 MB).
 */
import { fail, issue, ok, type Issue, type Result } from '../errors';
import type { Mat3 } from '../math/mat3';
import { qRotate } from '../math/rotation';
import { orbitFromElements } from '../orbit/elements';
import { buildEphemeris, type Ephemeris } from '../orbit/ephemeris';
import { createEphemerisSample, sampleEphemeris } from '../orbit/ephemerisEval';
import { eme2000ToEcef } from '../orbit/frames';
import type { Sgp4Orbit } from '../orbit/propagate';
import { ecefToGeodetic, makeSite, type Site } from '../orbit/sites';
import { makeTarget, type PointingTarget } from '../orbit/targets';
import { orbitFromTle } from '../orbit/tle';
import { bodyTriad } from '../orbit/triad';
import { eclipseWindows, visibilityWindows, type EclipseWindow, type VisibilityWindow } from '../orbit/windows';
import { planTrackingSequence } from '../plan/trackingSequence';
import type { TrackingPlan, TrackingTargetInput } from '../plan/trackingTypes';
import type { PlanLimits, SequencePlan } from '../plan/types';
import type { ResolvedScenario, ResolvedTarget } from '../scenario/resolve';
import type { ResolvedSite } from '../scenario/orbitResolve';
import { atFileEpochKey } from '../scenario/epochKey';
import type { RunTrace } from '../sim/types';
import { utcLabelFromTai } from '../time/iso';

/** Ephemeris reach past the horizon and the flight's tail, s. */
export const EPHEMERIS_MARGIN_S = 120;
/** Spacing of the orbit samples views get (ground track, Sun and Moon directions), s. */
export const TRACK_STEP_S = 60;

/** What the orbit stage builds once per scenario. */
export interface OrbitStage {
  orbit: Sgp4Orbit;
  ephemeris: Ephemeris;
  sites: Site[];
  /** The moving target of each scenario target (null for a fixed attitude). */
  targets: (PointingTarget | null)[];
  /** Passes of each site above its elevation mask over [0, horizonS]. */
  passes: VisibilityWindow[][];
  eclipses: EclipseWindow[];
  horizonS: number;
}

/** True when the scenario's targets need the orbit-aware planner (a track or a window). */
export function needsTrackingPlan(s: ResolvedScenario): boolean {
  return !!s.orbit && s.targets.some((t) => !!t.track || !!t.window);
}

/** Build the orbit stage; errors name the scenario field. */
export function buildOrbitStage(s: ResolvedScenario): Result<OrbitStage> {
  const o = s.orbit;
  if (!o) return fail([issue('orbit', 'required', 'the scenario has no orbit block')]);
  const warnings: Issue[] = [];
  const src = o.source;
  const orb = src.kind === 'tle' ? orbitFromTle(src.lines.join('\n'), 'orbit.tle') : orbitFromElements(src.elements, 'orbit.meanElements');
  if (!orb.ok) return fail(orb.errors.map(atFileEpochKey), orb.warnings.map(atFileEpochKey));
  const tail =
    s.simulation.durationS !== null && s.simulation.durationS !== undefined ? s.simulation.durationS : o.horizonS + s.simulation.tailS;
  const endS = Math.max(o.horizonS, tail) + EPHEMERIS_MARGIN_S;
  const eph = buildEphemeris(orb.value, o.epochTaiS, 0, endS, {}, 'orbit');
  warnings.push(...orb.warnings.map(atFileEpochKey), ...eph.warnings);
  if (!eph.ok) return fail(eph.errors, warnings);
  const errors: Issue[] = [];
  const sites: Site[] = [];
  o.sites.forEach((x, i) => {
    const r = makeSite(
      { name: x.label, latitudeRad: x.latitudeRad, longitudeRad: x.longitudeRad, heightM: x.heightM, elevationMaskRad: x.elevationMaskRad },
      `orbit.sites[${i}]`,
    );
    if (r.ok) sites.push(r.value);
    else errors.push(...r.errors);
  });
  if (errors.length) return fail(errors, warnings);
  const targets = s.targets.map((t, i) => (t.track ? movingTarget(t, sites, `targets[${i}].track`, errors) : null));
  const passes: VisibilityWindow[][] = [];
  for (let i = 0; i < sites.length; i++) {
    const w = visibilityWindows(eph.value, sites[i]!, 0, o.horizonS, {}, `orbit.sites[${i}]`);
    if (!w.ok) errors.push(...w.errors);
    passes.push(w.ok ? w.value : []);
  }
  const ecl = eclipseWindows(eph.value, 0, o.horizonS, {}, 'orbit');
  if (!ecl.ok) errors.push(...ecl.errors);
  if (errors.length) return fail(errors, warnings);
  return ok(
    { orbit: orb.value, ephemeris: eph.value, sites, targets, passes, eclipses: ecl.ok ? ecl.value : [], horizonS: o.horizonS },
    warnings,
  );
}

function movingTarget(t: ResolvedTarget, sites: readonly Site[], path: string, errors: Issue[]): PointingTarget | null {
  const tr = t.track!;
  const r =
    tr.kind === 'nadir'
      ? makeTarget({ kind: 'nadir', yaw: tr.yaw }, path)
      : tr.kind === 'sun'
        ? makeTarget({ kind: 'sun', primaryBody: tr.primaryBody, secondaryBody: tr.secondaryBody, secondary: tr.secondary }, path)
        : makeTarget(
            {
              kind: tr.kind,
              site: sites[tr.siteIndex]!,
              primaryBody: tr.primaryBody,
              secondaryBody: tr.secondaryBody,
              secondary: tr.secondary,
            },
            path,
          );
  if (!r.ok) {
    errors.push(...r.errors);
    return null;
  }
  // The file may name other body axes for nadir than the default +Z and +Y/+X.
  if (tr.kind === 'nadir') bodyTriad(r.value.body, tr.primaryBody, tr.secondaryBody);
  return r.value;
}

/** The orbit-aware plan of a scenario on its orbit stage. */
export function planOnOrbit(
  s: ResolvedScenario,
  st: OrbitStage,
  inertia: Mat3,
  wheelMomentumBody: Float64Array,
  limits: PlanLimits,
): Result<SequencePlan> {
  const inputs: TrackingTargetInput[] = s.targets.map((t, i) => {
    const mt = st.targets[i];
    const track = t.track;
    const siteIndex = track && (track.kind === 'site' || track.kind === 'station') ? track.siteIndex : -1;
    const w = t.window;
    return {
      label: t.label,
      holdS: t.holdS,
      source: mt ? { kind: 'moving', target: mt } : { kind: 'fixed', q: t.qInertialFromBody },
      window: !w
        ? null
        : w.start === 'time'
          ? { kind: 'time', atS: w.atS }
          : { kind: 'pass', passes: siteIndex >= 0 ? st.passes[siteIndex]! : [], untilPassEnd: w.untilPassEnd },
    };
  });
  return planTrackingSequence(
    {
      qStart: s.initial.qInertialFromBody,
      inertia,
      wheelMomentumBody,
      ephemeris: st.ephemeris,
      horizonS: st.horizonS,
      targets: inputs,
    },
    limits,
  );
}

// ---------------------------------------------------------------------------------------------
// What views and exports read (plain data, Float64Arrays: transferable to the app's worker)

/** A window a target was planned into, with the site it points at. */
export interface PlannedWindow {
  /** Index of the scenario target. */
  target: number;
  label: string;
  /** 'site', 'station', 'sun', 'nadir' or 'fixed'. */
  kind: string;
  /** Site id and label (site and station targets), else null. */
  siteId: string | null;
  siteLabel: string | null;
  slewStartS: number;
  /** Tracking (or the hold of a fixed attitude) starts. */
  trackStartS: number;
  /** End of the requested hold (the pass end for a hold to the pass end). */
  holdEndS: number;
  /** 'pass' or 'time' when the target had a window, else null. */
  window: 'pass' | 'time' | null;
  /** Pass end and peak elevation (pass windows). */
  passEndS: number | null;
  maxElevationRad: number | null;
  notes: string[];
}

/** A site as resolved from the scenario, with its passes over the horizon. */
export interface SitePasses extends ResolvedSite {
  passes: VisibilityWindow[];
}

/** The orbit over the horizon for views (3D, ground track) and exports. */
export interface OrbitOutput {
  inertialFrame: 'EME2000';
  elementSetName: string;
  elementEpochUtc: string;
  /** The scenario epoch, TAI seconds since 2000-01-01T12:00:00 TAI. */
  epochTaiS: number;
  horizonS: number;
  /** Samples at t = i·TRACK_STEP_S over [0, horizonS]: position EME2000 (3 per sample, m), geodetic latitude, longitude (rad) and height (m), unit directions spacecraft → Sun and → Moon (EME2000, 3 per sample), eclipse (1 when any of the Sun is hidden). */
  track: {
    stepS: number;
    t: Float64Array;
    rEme2000M: Float64Array;
    latitudeRad: Float64Array;
    longitudeRad: Float64Array;
    heightM: Float64Array;
    sunDir: Float64Array;
    moonDir: Float64Array;
    eclipse: Float64Array;
  };
  sites: SitePasses[];
  eclipses: EclipseWindow[];
  windows: PlannedWindow[];
}

/** The orbit as the exports carry it (ScenarioSummary.orbit): everything but the per-sample track. */
export type OrbitExportInfo = Omit<OrbitOutput, 'track' | 'eclipses'> & {
  /** Umbra entry and exit are null when the eclipse has no umbra (JSON carries no NaN). */
  eclipses: (Omit<EclipseWindow, 'umbraStartS' | 'umbraEndS'> & { umbraStartS: number | null; umbraEndS: number | null })[];
};

export function orbitExportInfo(o: OrbitOutput): OrbitExportInfo {
  const { track: _track, eclipses, ...rest } = o;
  return {
    ...rest,
    eclipses: eclipses.map((e) => ({
      ...e,
      umbraStartS: Number.isFinite(e.umbraStartS) ? e.umbraStartS : null,
      umbraEndS: Number.isFinite(e.umbraEndS) ? e.umbraEndS : null,
    })),
  };
}

export function orbitOutput(s: ResolvedScenario, st: OrbitStage, plan: TrackingPlan | null): OrbitOutput {
  const o = s.orbit!;
  const n = Math.floor(st.horizonS / TRACK_STEP_S) + 1;
  const tr = {
    stepS: TRACK_STEP_S,
    t: new Float64Array(n),
    rEme2000M: new Float64Array(3 * n),
    latitudeRad: new Float64Array(n),
    longitudeRad: new Float64Array(n),
    heightM: new Float64Array(n),
    sunDir: new Float64Array(3 * n),
    moonDir: new Float64Array(3 * n),
    eclipse: new Float64Array(n),
  };
  const smp = createEphemerisSample();
  const ecef = new Float64Array(3),
    geo = new Float64Array(3);
  for (let i = 0; i < n; i++) {
    const t = i * TRACK_STEP_S;
    tr.t[i] = t;
    sampleEphemeris(smp, st.ephemeris, t);
    tr.rEme2000M.set(smp.r, 3 * i);
    tr.sunDir.set(smp.sunDir, 3 * i);
    tr.moonDir.set(smp.moonDir, 3 * i);
    tr.eclipse[i] = smp.eclipse;
    eme2000ToEcef(ecef, null, smp.r, null, o.epochTaiS + t);
    ecefToGeodetic(geo, ecef);
    tr.latitudeRad[i] = geo[0]!;
    tr.longitudeRad[i] = geo[1]!;
    tr.heightM[i] = geo[2]!;
  }
  return {
    inertialFrame: 'EME2000',
    elementSetName: st.orbit.name,
    elementEpochUtc: st.orbit.epochUtcIso,
    epochTaiS: o.epochTaiS,
    horizonS: st.horizonS,
    track: tr,
    sites: o.sites.map((x, i) => ({
      id: x.id,
      label: x.label,
      latitudeRad: x.latitudeRad,
      longitudeRad: x.longitudeRad,
      heightM: x.heightM,
      elevationMaskRad: x.elevationMaskRad,
      passes: st.passes[i] ?? [],
    })),
    eclipses: st.eclipses,
    windows: plan ? plannedWindows(s, plan) : [],
  };
}

export function plannedWindows(s: ResolvedScenario, plan: TrackingPlan): PlannedWindow[] {
  const sites = s.orbit?.sites ?? [];
  return plan.entries.map((e) => {
    const tr = s.targets[e.target]?.track ?? null;
    const site = tr && (tr.kind === 'site' || tr.kind === 'station') ? sites[tr.siteIndex] : undefined;
    return {
      target: e.target,
      label: e.label,
      kind: tr ? tr.kind : 'fixed',
      siteId: site ? site.id : null,
      siteLabel: site ? site.label : null,
      slewStartS: e.slewStartS,
      trackStartS: e.trackStartS,
      holdEndS: e.requestedHoldEndS,
      window: e.window ? e.window.kind : null,
      passEndS: e.window ? e.window.endS : null,
      maxElevationRad: e.window ? e.window.maxElevationRad : null,
      notes: e.notes,
    };
  });
}

/** UTC label (leap seconds counted) of plan time t from the orbit epoch. */
export function orbitUtcLabel(epochTaiS: number, t: number, digits = 3): string {
  return utcLabelFromTai(epochTaiS + t, digits);
}

/** The pointing error achieved while tracking, per planned entry (after a flight). */
export interface WindowError {
  target: number;
  label: string;
  startS: number;
  endS: number;
  /** Samples of the trace inside [startS, endS] (the values below are null without any). */
  samples: number;
  /** Angle between the true and the reference direction of the target's primary body axis (rad): peak and RMS. */
  peakPointingErrorRad: number | null;
  rmsPointingErrorRad: number | null;
  /** Whole-attitude error to the reference (rad): peak. */
  peakAttitudeErrorRad: number | null;
}

const a1 = new Float64Array(3),
  a2 = new Float64Array(3),
  b1 = new Float64Array(3);

/** Each entry's pointing error over its tracking interval [trackStart, requested hold end]. */
export function windowErrors(trace: RunTrace, plan: TrackingPlan): WindowError[] {
  return plan.entries.map((e) => {
    const src = e.source;
    if (src.kind === 'moving') {
      b1[0] = src.target.body[0]!;
      b1[1] = src.target.body[1]!;
      b1[2] = src.target.body[2]!;
    }
    let n = 0,
      peak = 0,
      sum2 = 0,
      peakAtt = 0;
    for (let k = 0; k < trace.n; k++) {
      const t = trace.t[k]!;
      if (t < e.trackStartS || t > e.requestedHoldEndS) continue;
      const att = trace.errorAngle[k]!;
      let err = att;
      if (src.kind === 'moving') {
        qRotate(a1, trace.q.subarray(4 * k, 4 * k + 4), b1);
        qRotate(a2, trace.qRef.subarray(4 * k, 4 * k + 4), b1);
        const c = a1[0]! * a2[0]! + a1[1]! * a2[1]! + a1[2]! * a2[2]!;
        const sx = a1[1]! * a2[2]! - a1[2]! * a2[1]!,
          sy = a1[2]! * a2[0]! - a1[0]! * a2[2]!,
          sz = a1[0]! * a2[1]! - a1[1]! * a2[0]!;
        err = Math.atan2(Math.hypot(sx, sy, sz), c);
      }
      n++;
      sum2 += err * err;
      if (err > peak) peak = err;
      if (att > peakAtt) peakAtt = att;
    }
    return {
      target: e.target,
      label: e.label,
      startS: e.trackStartS,
      endS: e.requestedHoldEndS,
      samples: n,
      peakPointingErrorRad: n ? peak : null,
      rmsPointingErrorRad: n ? Math.sqrt(sum2 / n) : null,
      peakAttitudeErrorRad: n ? peakAtt : null,
    };
  });
}
