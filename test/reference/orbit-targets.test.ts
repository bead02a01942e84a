/**
 * Moving pointing targets:
 * - returned body rate ω against the numerical derivative of the returned attitude (central
 *   difference on SO(3): rotation vector of q(t−h)* ⊗ q(t+h) divided by 2h, h = 0.02 s, error
 *   O(h²|ω̈|)), and ω̇ against the central difference of ω — for every target kind;
 * - the primary body axis lies exactly on the target direction; the secondary in the (P, S) plane;
 * - nadir/LVLH: equals frames.ts LVLH, and its rate equals the LVLH-frame kinematics
 *   ω = (|h|/r²) ĥ + (r (a·ĥ)/|h|) r̂ (standard Hill-frame result, e.g. Schaub & Junkins, "Analytical
 *   Mechanics of Space Systems"; from memory);
 * - nadir angle η of a ground site seen at elevation ε from orbit radius R + h:
 *   sin η = R cos ε / (R + h) (Wertz & Larson, "Space Mission Analysis and Design", Earth-geometry
 *   relations; from memory). It is a spherical-Earth relation: the test uses the site's geocentric
 *   radius as R, the spacecraft's radius as R + h and the geocentric elevation (the library's own
 *   elevation is geodetic, up to 0.19° different), within 1e-6 rad along a simulated pass.
 */
import { describe, expect, it } from 'vitest';
import { orbitFromTle } from '../../app/engine/orbit/tle';
import { buildEphemeris } from '../../app/engine/orbit/ephemeris';
import { createEphemerisSample, orbitStateAt, sampleEphemeris, siteStateAt } from '../../app/engine/orbit/ephemerisEval';
import { makeSite, createLookAngles, lookAnglesEme2000 } from '../../app/engine/orbit/sites';
import { createTargetState, makeTarget, targetStateAt, type PointingTarget, type PointingTargetSpec } from '../../app/engine/orbit/targets';
import { visibilityWindows } from '../../app/engine/orbit/windows';
import { qInertialFromLvlh } from '../../app/engine/orbit/frames';
import { qConjMultiply, qRotate, qSameHemisphere, qToRotationVector } from '../../app/engine/math/rotation';
import { RAD_PER_DEG } from '../../app/engine/units';
import { DEMO_TLE_SSO } from './orbit-fixtures';

const o = orbitFromTle(DEMO_TLE_SSO);
if (!o.ok) throw new Error('fixture');
const orbit = o.value;
const built = buildEphemeris(orbit, orbit.epochTaiS, 0, 86400);
if (!built.ok) throw new Error('ephemeris');
const eph = built.value;
const siteR = makeSite({
  name: 'Invented station',
  latitudeRad: 46.5 * RAD_PER_DEG,
  longitudeRad: 6.6 * RAD_PER_DEG,
  heightM: 400,
  elevationMaskRad: 10 * RAD_PER_DEG,
});
if (!siteR.ok) throw new Error('site');
const site = siteR.value;
const win = visibilityWindows(eph, site, 0, 86400, {});
if (!win.ok) throw new Error('windows');
const pass = win.value.reduce((best, w) => (w.maxElevationRad > best.maxElevationRad ? w : best));

function target(spec: PointingTargetSpec): PointingTarget {
  const t = makeTarget(spec);
  if (!t.ok) throw new Error(JSON.stringify(t.errors));
  return t.value;
}

const X = [1, 0, 0],
  Y = [0, 1, 0],
  Z = [0, 0, 1];
const CASES: [string, PointingTarget, number, number][] = [
  ['site, +Z on the site, +Y to orbit normal', target({ kind: 'site', site, primaryBody: Z, secondaryBody: Y }), pass.startS, pass.endS],
  [
    'station, +X antenna, +Z to nadir',
    target({ kind: 'station', site, primaryBody: X, secondaryBody: Z, secondary: 'nadir' }),
    pass.startS,
    pass.endS,
  ],
  [
    'site, velocity reference',
    target({ kind: 'site', site, primaryBody: Z, secondaryBody: X, secondary: 'velocity' }),
    pass.startS,
    pass.endS,
  ],
  [
    'site, fixed inertial reference',
    target({ kind: 'site', site, primaryBody: Z, secondaryBody: X, secondary: { inertial: [0, 0, 1] } }),
    pass.startS,
    pass.endS,
  ],
  ['Sun, −Y panel normal, +Z to nadir', target({ kind: 'sun', primaryBody: [0, -1, 0], secondaryBody: Z, secondary: 'nadir' }), 0, 86400],
  ['Sun, +Z panel, orbit-normal reference', target({ kind: 'sun', primaryBody: Z, secondaryBody: X }), 0, 86400],
  ['nadir, LVLH', target({ kind: 'nadir' }), 0, 86400],
  ['nadir, Sun yaw steering', target({ kind: 'nadir', yaw: 'sun-steering' }), 0, 86400],
];

describe.each(CASES)('%s', (_name, tgt, t0, t1) => {
  const times = Array.from({ length: 60 }, (_, k) => t0 + ((k + 0.37) / 60) * (t1 - t0)).filter((t) => {
    const s = (t / eph.orbitStepS) % 1;
    return s > 0.01 && s < 0.99; // jerk (only in ω̇ via S̈) jumps at nodes
  });

  it('ω equals the numerical derivative of q; ω̇ that of ω', () => {
    const st = createTargetState(),
      a = createTargetState(),
      b = createTargetState();
    const dq = new Float64Array(4),
      rv = new Float64Array(3);
    const h = 0.02;
    let checked = 0;
    for (const t of times) {
      expect(targetStateAt(st, eph, tgt, t)).toBe(true);
      if (st.degenerate) continue;
      targetStateAt(a, eph, tgt, t - h);
      targetStateAt(b, eph, tgt, t + h);
      qSameHemisphere(b.q, a.q, b.q);
      qConjMultiply(dq, a.q, b.q);
      qToRotationVector(rv, dq);
      const wn = Math.hypot(st.omegaBody[0]!, st.omegaBody[1]!, st.omegaBody[2]!);
      const an = Math.hypot(st.omegaDotBody[0]!, st.omegaDotBody[1]!, st.omegaDotBody[2]!);
      for (let i = 0; i < 3; i++) {
        expect(Math.abs(rv[i]! / (2 * h) - st.omegaBody[i]!)).toBeLessThan(1e-9 + 1e-6 * wn);
        expect(Math.abs((b.omegaBody[i]! - a.omegaBody[i]!) / (2 * h) - st.omegaDotBody[i]!)).toBeLessThan(1e-10 + 1e-5 * an);
      }
      checked++;
    }
    expect(checked).toBeGreaterThan(20);
  });

  it('primary body axis exactly on the target direction; secondary in the (P, S) half-plane', () => {
    const st = createTargetState();
    const p = new Float64Array(3);
    for (const t of times.slice(0, 10)) {
      targetStateAt(st, eph, tgt, t);
      qRotate(p, st.q, tgt.body.subarray(0, 3));
      const s2 = qRotate(new Float64Array(3), st.q, tgt.body.subarray(6, 9)); // b3 → u3 ⟂ P and S
      expect(Math.abs(Math.hypot(p[0]!, p[1]!, p[2]!) - 1)).toBeLessThan(1e-12);
      expect(Math.abs(p[0]! * s2[0]! + p[1]! * s2[1]! + p[2]! * s2[2]!)).toBeLessThan(1e-12);
    }
  });
});

describe('target geometry against published relations', () => {
  const st = createTargetState();
  const r = new Float64Array(3),
    v = new Float64Array(3),
    acc = new Float64Array(3),
    rg = new Float64Array(3),
    p = new Float64Array(3);

  it('site target: nadir angle obeys sin η = R cos ε / (R + h) along the best pass (spherical Earth, 1e-6 rad)', () => {
    const tgt = target({ kind: 'site', site, primaryBody: Z, secondaryBody: Y });
    for (let t = pass.startS; t <= pass.endS; t += 5) {
      targetStateAt(st, eph, tgt, t);
      orbitStateAt(r, null, null, null, eph, t);
      siteStateAt(rg, null, null, eph, site, t);
      qRotate(p, st.q, Z); // the body axis on the site
      const rn = Math.hypot(r[0]!, r[1]!, r[2]!),
        R = Math.hypot(rg[0]!, rg[1]!, rg[2]!);
      const eta = Math.acos(-(p[0]! * r[0]! + p[1]! * r[1]! + p[2]! * r[2]!) / rn);
      const l = [r[0]! - rg[0]!, r[1]! - rg[1]!, r[2]! - rg[2]!];
      const ln = Math.hypot(l[0]!, l[1]!, l[2]!);
      const epsGeocentric = Math.asin((l[0]! * rg[0]! + l[1]! * rg[1]! + l[2]! * rg[2]!) / (ln * R));
      expect(Math.abs(Math.sin(eta) - (R * Math.cos(epsGeocentric)) / rn)).toBeLessThan(1e-6);
      // The state's own (geodetic) elevation agrees with sites.ts look angles.
      const la = lookAnglesEme2000(createLookAngles(), site, r, orbit.epochTaiS + t);
      expect(Math.abs(st.elevationRad - la.elevationRad)).toBeLessThan(2e-8);
    }
  });

  it('station target: visible exactly inside the visibility windows', () => {
    const tgt = target({ kind: 'station', site, primaryBody: X, secondaryBody: Z, secondary: 'nadir' });
    for (const w of win.value) {
      targetStateAt(st, eph, tgt, w.startS + 0.01);
      expect(st.visible).toBe(1);
      if (w.startS > 0.02) {
        targetStateAt(st, eph, tgt, w.startS - 0.01);
        expect(st.visible).toBe(0);
      }
    }
  });

  it('nadir/LVLH: attitude equals frames.ts LVLH; rate = (|h|/r²) ĥ + (r (a·ĥ)/|h|) r̂ in body axes', () => {
    const tgt = target({ kind: 'nadir' });
    const q = new Float64Array(4);
    for (let t = 13; t < 86400; t += 1711) {
      targetStateAt(st, eph, tgt, t);
      orbitStateAt(r, v, acc, null, eph, t);
      qInertialFromLvlh(q, r, v);
      qSameHemisphere(q, st.q, q);
      for (let i = 0; i < 4; i++) expect(Math.abs(q[i]! - st.q[i]!)).toBeLessThan(1e-12);
      const h = [r[1]! * v[2]! - r[2]! * v[1]!, r[2]! * v[0]! - r[0]! * v[2]!, r[0]! * v[1]! - r[1]! * v[0]!];
      const hn = Math.hypot(h[0]!, h[1]!, h[2]!),
        rn = Math.hypot(r[0]!, r[1]!, r[2]!);
      const aOut = (acc[0]! * h[0]! + acc[1]! * h[1]! + acc[2]! * h[2]!) / hn;
      // Body = LVLH: x = y × z, y = −ĥ, z = −r̂ ⇒ ω_B = (0, −|h|/r², −r (a·ĥ)/|h|).
      expect(Math.abs(st.omegaBody[0]!)).toBeLessThan(1e-12);
      expect(Math.abs(st.omegaBody[1]! + hn / (rn * rn))).toBeLessThan(1e-12);
      expect(Math.abs(st.omegaBody[2]! + (rn * aOut) / hn)).toBeLessThan(1e-12);
    }
  });

  it('Sun target puts its axis on the spacecraft → Sun direction of the control sample; yaw steering keeps the Sun in the x–z plane', () => {
    const sun = target({ kind: 'sun', primaryBody: [0, -1, 0], secondaryBody: Z, secondary: 'nadir' });
    const yaw = target({ kind: 'nadir', yaw: 'sun-steering' });
    const sample = createEphemerisSample();
    const x = new Float64Array(3),
      y = new Float64Array(3);
    for (let t = 7; t < 86400; t += 977) {
      sampleEphemeris(sample, eph, t);
      targetStateAt(st, eph, sun, t);
      qRotate(p, st.q, [0, -1, 0]);
      for (let i = 0; i < 3; i++) expect(Math.abs(p[i]! - sample.sunDir[i]!)).toBeLessThan(1e-12);
      targetStateAt(st, eph, yaw, t);
      qRotate(x, st.q, X);
      qRotate(y, st.q, Y);
      const sd = sample.sunDir;
      expect(Math.abs(y[0]! * sd[0]! + y[1]! * sd[1]! + y[2]! * sd[2]!)).toBeLessThan(1e-12);
      expect(x[0]! * sd[0]! + x[1]! * sd[1]! + x[2]! * sd[2]!).toBeGreaterThanOrEqual(-1e-12);
    }
  });
});

describe('target specs', () => {
  it('reports every problem; flags a degenerate secondary', () => {
    const bad = makeTarget({ kind: 'site', site, primaryBody: X, secondaryBody: [2, 0, 0], secondary: { inertial: [0, 0, 0] } });
    expect(!bad.ok && bad.errors.map((e) => e.rule)).toEqual(['axes', 'direction']);
    const sunSun = makeTarget({ kind: 'sun', primaryBody: X, secondaryBody: Y, secondary: 'sun' });
    expect(!sunSun.ok && sunSun.errors.map((e) => e.rule)).toEqual(['parallel']);
    // A fixed secondary along the line of sight at mid-pass is degenerate there.
    const t = pass.tMaxS;
    orbitStateAt(new Float64Array(3), null, null, null, eph, t);
    const rS = new Float64Array(3),
      rG = new Float64Array(3);
    orbitStateAt(rS, null, null, null, eph, t);
    siteStateAt(rG, null, null, eph, site, t);
    const los = [rG[0]! - rS[0]!, rG[1]! - rS[1]!, rG[2]! - rS[2]!];
    const deg = target({ kind: 'site', site, primaryBody: Z, secondaryBody: X, secondary: { inertial: los } });
    const st = createTargetState();
    targetStateAt(st, eph, deg, t);
    expect(st.degenerate).toBe(1);
    expect(st.separationSin).toBeLessThan(1e-6);
  });
});
