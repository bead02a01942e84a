/**
 * Orbit-library speed figures (printed, never asserted), min and median of repeated runs:
 *  - one day (86 400 s) of ephemeris precompute (SGP4 at 30 s nodes with its derivative stencil,
 *    Sun, Moon and the TEME → EME2000 rotation at 600 s nodes);
 *  - visibility windows for 5 invented sites and eclipse windows over that day;
 *  - per-sample evaluation: sampleEphemeris (r, v, Sun and Moon directions, eclipse; goal ≤ 2 µs)
 *    and targetStateAt for a ground-site target (attitude, ω, ω̇; no goal set);
 *  - the day figure: ephemeris + Sun + windows (5 sites, eclipses) + a 20-target sequence
 *    planned by the orbit-aware planner (Sun, nadir and site passes; goal ≤ 1 s);
 *  - the planned reference evaluated per control sample (trackingReference.at: slew or tracking
 *    state with ω and ω̇; the "ephemeris evaluation per control sample", goal ≤ 2 µs).
 * The orbit is the invented Lumen-6 element set of test/reference/orbit-fixtures.ts.
 *
 * Run: `node --import tsx test/bench/orbit.ts` or `npm run bench orbit`.
 */
import { pathToFileURL } from 'node:url';
import { orbitFromTle } from '../../app/engine/orbit/tle';
import { buildEphemeris, type Ephemeris } from '../../app/engine/orbit/ephemeris';
import { createEphemerisSample, sampleEphemeris } from '../../app/engine/orbit/ephemerisEval';
import { makeSite, type Site } from '../../app/engine/orbit/sites';
import { eclipseWindows, visibilityWindows } from '../../app/engine/orbit/windows';
import { createTargetState, makeTarget, targetStateAt } from '../../app/engine/orbit/targets';
import { RAD_PER_DEG } from '../../app/engine/units';
import { DEMO_TLE_SSO } from '../reference/orbit-fixtures';
import { planTrackingSequence } from '../../app/engine/plan/trackingSequence';
import type { TrackingTargetInput } from '../../app/engine/plan/trackingTypes';
import type { SequencePlan } from '../../app/engine/plan/types';
import { trackingReference } from '../../app/engine/sim/trackingReference';

function median(v: number[]): number {
  const s = [...v].sort((a, b) => a - b);
  const m = s.length >> 1;
  return s.length % 2 ? s[m]! : 0.5 * (s[m - 1]! + s[m]!);
}

function timed(runs: number, fn: () => void): { min: number; median: number } {
  const t: number[] = [];
  for (let k = 0; k < runs; k++) {
    const t0 = performance.now();
    fn();
    t.push(performance.now() - t0);
  }
  return { min: Math.min(...t), median: median(t) };
}

function line(label: string, r: { min: number; median: number }, unit: string, goal: string): void {
  console.log(
    `   ${label.padEnd(58)} min ${r.min.toFixed(unit === 'µs' ? 3 : 1).padStart(8)} ${unit}   median ${r.median.toFixed(unit === 'µs' ? 3 : 1).padStart(8)} ${unit}   goal: ${goal}`,
  );
}

const SITES: Site[] = [
  [64.8, -147.7, 5],
  [46.5, 6.6, 10],
  [1.3, 103.8, 0],
  [-33.9, 18.4, 5],
  [78.2, 15.6, 5],
].map(([lat, lon, mask], i) => {
  const s = makeSite({
    name: `Invented site ${i + 1}`,
    latitudeRad: lat! * RAD_PER_DEG,
    longitudeRad: lon! * RAD_PER_DEG,
    heightM: 100,
    elevationMaskRad: mask! * RAD_PER_DEG,
  });
  if (!s.ok) throw new Error('site');
  return s.value;
});

export async function benchOrbit(): Promise<void> {
  const o = orbitFromTle(DEMO_TLE_SSO);
  if (!o.ok) throw new Error('fixture');
  const orbit = o.value;
  let eph: Ephemeris | null = null;
  const build = () => {
    const e = buildEphemeris(orbit, orbit.epochTaiS, 0, 86400);
    if (!e.ok) throw new Error('ephemeris');
    eph = e.value;
  };
  build(); // warm-up
  const tBuild = timed(7, build);
  const E = eph!;
  let passes = 0,
    eclipses = 0;
  const windows = () => {
    passes = 0;
    for (const s of SITES) {
      const w = visibilityWindows(E, s, 0, 86400);
      if (!w.ok) throw new Error('windows');
      passes += w.value.length;
    }
  };
  const shadows = () => {
    const w = eclipseWindows(E, 0, 86400);
    if (!w.ok) throw new Error('eclipses');
    eclipses = w.value.length;
  };
  windows();
  const tWin = timed(7, windows);
  const tEcl = timed(7, shadows);
  const tDay = timed(5, () => {
    build();
    windows();
  });
  console.log(
    ` one day of Lumen-6 (invented), ${E.orbitNodeCount} orbit nodes, ${E.bodyNodeCount} Sun/Moon nodes; ${passes} passes over 5 sites, ${eclipses} eclipses`,
  );
  line('ephemeris precompute (SGP4 + frames + Sun/Moon), 1 day', tBuild, 'ms', 'none set');
  line('visibility windows, 5 sites, 1 day (10 s scan, 1 ms edges)', tWin, 'ms', 'none set');
  line('eclipse windows, 1 day', tEcl, 'ms', 'none set');
  line('day total: precompute + windows for 5 sites', tDay, 'ms', 'none set');

  const N = 1_000_000;
  const sample = createEphemerisSample();
  const ts = new Float64Array(4096).map((_, k) => ((k * 86400) / 4096 + 0.37) % 86400);
  let sink = 0;
  const perSample = (fn: (t: number) => void) =>
    timed(7, () => {
      for (let k = 0; k < N; k++) fn(ts[k & 4095]!);
    });
  const sampleFn = (t: number) => {
    sampleEphemeris(sample, E, t);
    sink += sample.eclipse;
  };
  for (let k = 0; k < 200_000; k++) sampleFn(ts[k & 4095]!); // warm-up
  const tSample = perSample(sampleFn);
  line(
    'sampleEphemeris per call (r, v, Sun, Moon, eclipse)',
    { min: (tSample.min * 1000) / N, median: (tSample.median * 1000) / N },
    'µs',
    '≤ 2 µs',
  );
  const tgt = makeTarget({ kind: 'site', site: SITES[1]!, primaryBody: [0, 0, 1], secondaryBody: [0, 1, 0] });
  if (!tgt.ok) throw new Error('target');
  const st = createTargetState();
  const targetFn = (t: number) => {
    targetStateAt(st, E, tgt.value, t);
    sink += st.omegaBody[0]!;
  };
  for (let k = 0; k < 200_000; k++) targetFn(ts[k & 4095]!);
  const tTarget = perSample(targetFn);
  line(
    'targetStateAt per call (site target: q, ω, ω̇)',
    { min: (tTarget.min * 1000) / N, median: (tTarget.median * 1000) / N },
    'µs',
    'none set',
  );
  // The day with a 20-target sequence planned (Sun, site pass, nadir, …), box wheel limits.
  const J = Float64Array.of(0.08, 0, 0, 0, 0.09, 0, 0, 0, 0.03);
  const limits = {
    torqueCapacity: () => 0.004,
    momentumCapacity: () => 0.03,
    torqueMargin: 0.8,
    momentumMargin: 0.8,
    slewRateLimitRadPerS: 3 * RAD_PER_DEG,
  };
  const sun = makeTarget({ kind: 'sun', primaryBody: [0, 0, -1], secondaryBody: [1, 0, 0] });
  const nadir = makeTarget({ kind: 'nadir', yaw: 'lvlh' });
  if (!sun.ok || !nadir.ok) throw new Error('targets');
  let planned = 0;
  let plan: SequencePlan | null = null;
  const dayPlan = () => {
    build();
    const siteTargets = SITES.map((site) => {
      const t = makeTarget({ kind: 'site', site, primaryBody: [0, 0, 1], secondaryBody: [0, 1, 0] });
      if (!t.ok) throw new Error('site target');
      return t.value;
    });
    const passes = SITES.map((site) => {
      const w = visibilityWindows(eph!, site, 0, 86400);
      if (!w.ok) throw new Error('windows');
      return w.value;
    });
    shadows();
    const targets: TrackingTargetInput[] = [];
    for (let i = 0; i < 20; i++) {
      const k = (i >> 2) % SITES.length;
      if (i % 4 === 1)
        targets.push({
          label: `site ${k + 1}`,
          holdS: 60,
          source: { kind: 'moving', target: siteTargets[k]! },
          window: { kind: 'pass', passes: passes[k]!, untilPassEnd: false },
        });
      else
        targets.push({
          label: i % 4 === 3 ? 'nadir' : 'sun',
          holdS: 300,
          source: { kind: 'moving', target: (i % 4 === 3 ? nadir : sun).value },
          window: null,
        });
    }
    const r = planTrackingSequence(
      { qStart: [0, 0, 0, 1], inertia: J, wheelMomentumBody: [0, 0, 0], ephemeris: eph!, horizonS: 86000, targets },
      limits,
    );
    if (!r.ok) throw new Error('plan');
    plan = r.value;
    planned = r.value.tracking!.entries.length;
  };
  dayPlan();
  const tPlan = timed(3, dayPlan);
  console.log(`   day plan: ${planned} of 20 targets planned, feasible ${plan!.feasible}, total ${plan!.totalS.toFixed(0)} s`);
  line('day: ephemeris + Sun + windows (5 sites, eclipses) + 20-target plan', tPlan, 'ms', '≤ 1000 ms');
  const ref = trackingReference(plan!.tracking!, 'follow-plan');
  const q = new Float64Array(4),
    w = new Float64Array(3),
    wd = new Float64Array(3);
  const span = plan!.totalS;
  const tref = new Float64Array(4096).map((_, k) => (k * span) / 4096 + 0.37);
  const refFn = (t: number) => {
    sink += ref.at(t, q, w, wd);
  };
  for (let k = 0; k < 200_000; k++) refFn(tref[k & 4095]!);
  const tRef = timed(7, () => {
    for (let k = 0; k < N; k++) refFn(tref[k & 4095]!);
  });
  line(
    'planned reference per control sample (q, ω, ω̇ of slew/tracking)',
    { min: (tRef.min * 1000) / N, median: (tRef.median * 1000) / N },
    'µs',
    '≤ 2 µs',
  );
  if (Number.isNaN(sink)) console.log('   (sink)');
}

if (process.argv[1] && import.meta.url === pathToFileURL(process.argv[1]).href) await benchOrbit();
