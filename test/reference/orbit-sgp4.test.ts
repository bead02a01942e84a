/**
 * SGP4 through the library against published and library references:
 * - Vallado, Crawford, Hujsak & Kelso, "Revisiting Spacetrack Report #3", AIAA 2006-6753,
 *   verification case 00005 (TEME, km and km/s): t = 0 and t = 360 min values as given in the
 *   task brief; the 360-min velocity from the paper's tcppver.out (read in public test code
 *   quoting it). Tolerances 1 m and 1 mm/s.
 * - Mean elements (elements.ts, json2satrec with OMM fields) against the same element set given as
 *   a TLE to satellite.js twoline2satrec directly (npm reference library).
 */
import { describe, expect, it } from 'vitest';
import { propagate, sgp4, twoline2satrec } from 'satellite.js';
import { orbitFromTle } from '../../app/engine/orbit/tle';
import { orbitFromElements } from '../../app/engine/orbit/elements';
import {
  checkPropagationSpan,
  meanMotionRevPerDayFromSemiMajorAxis,
  semiMajorAxisKmFromMeanMotion,
  sgp4Teme,
} from '../../app/engine/orbit/propagate';
import { parseUtcIso } from '../../app/engine/time';
import { DEMO_TLE_LEO, DEMO_TLE_SSO, VALLADO_00005, editColumns } from './orbit-fixtures';

const r = new Float64Array(3),
  v = new Float64Array(3);

describe('SGP4 verification case 00005 (AIAA 2006-6753)', () => {
  const o = orbitFromTle(VALLADO_00005);
  if (!o.ok) throw new Error(JSON.stringify(o.errors));
  const orbit = o.value;

  it('epoch 2000 day 179.78495062 UTC', () => {
    // 0.78495062 d = 18:50:19.733568 (arithmetic on the TLE field).
    expect(orbit.epochUtcIso).toBe('2000-06-27T18:50:19.733568Z');
    const ep = parseUtcIso('2000-06-27T18:50:19.733568Z');
    expect(ep.ok && ep.value.taiS).toBeCloseTo(orbit.epochTaiS, 6);
  });

  it('t = 0 min: r and v to 1 m and 1 mm/s', () => {
    expect(sgp4Teme(r, v, orbit, orbit.epochTaiS)).toBe(0);
    const rKm = [7022.46529266, -1400.08296755, 0.03995155]; // AIAA 2006-6753, 00005, t = 0
    const vKms = [1.893841015, 6.405893759, 4.53480725];
    for (let i = 0; i < 3; i++) {
      expect(Math.abs(r[i]! - rKm[i]! * 1000)).toBeLessThan(1);
      expect(Math.abs(v[i]! - vKms[i]! * 1000)).toBeLessThan(1e-3);
    }
  });

  it('t = 360 min: r and v to 1 m and 1 mm/s', () => {
    expect(sgp4Teme(r, v, orbit, orbit.epochTaiS + 360 * 60)).toBe(0);
    const rKm = [-7154.03120202, -3783.17682504, -3536.19412294]; // AIAA 2006-6753, 00005, t = 360 min
    const vKms = [4.741887409, -4.151817765, -2.093935425]; // tcppver.out, 360 min
    for (let i = 0; i < 3; i++) {
      expect(Math.abs(r[i]! - rKm[i]! * 1000)).toBeLessThan(1);
      expect(Math.abs(v[i]! - vKms[i]! * 1000)).toBeLessThan(1e-3);
    }
  });

  it('warns beyond 14 days from the element epoch (common practice)', () => {
    expect(checkPropagationSpan(orbit, orbit.epochTaiS, orbit.epochTaiS + 14 * 86400)).toEqual([]);
    const w = checkPropagationSpan(orbit, orbit.epochTaiS - 86400, orbit.epochTaiS + 15 * 86400);
    expect(w.map((i) => i.rule)).toEqual(['far-from-epoch']);
  });
});

describe('mean elements → SGP4', () => {
  const tleText = DEMO_TLE_SSO.split('\n');
  const ref = twoline2satrec(tleText[1]!, tleText[2]!); // satellite.js directly, the reference
  const base = {
    name: 'Lumen-6 (invented)',
    epochUtcIso: '2026-03-20T12:00:00Z',
    eccentricity: 0.0012,
    inclinationDeg: 97.4,
    raanDeg: 337.5,
    argPerigeeDeg: 90,
    meanAnomalyDeg: 270,
    bstarPerEarthRadii: 5e-5,
  };

  it('the same element set as mean motion reproduces the TLE propagation (1 mm over a day)', () => {
    const o = orbitFromElements({ ...base, meanMotionRevPerDay: 15.2 });
    expect(o.ok).toBe(true);
    if (!o.ok) return;
    for (const min of [0, 97, 700, 1440]) {
      expect(sgp4Teme(r, v, o.value, o.value.epochTaiS + min * 60)).toBe(0);
      const pv = sgp4(ref, min)!;
      expect(Math.abs(r[0]! - pv.position.x * 1000)).toBeLessThan(1e-3);
      expect(Math.abs(r[1]! - pv.position.y * 1000)).toBeLessThan(1e-3);
      expect(Math.abs(r[2]! - pv.position.z * 1000)).toBeLessThan(1e-3);
      expect(Math.abs(v[2]! - pv.velocity.z * 1000)).toBeLessThan(1e-6);
    }
  });

  it('a semi-major axis goes through Kepler’s third law with SGP4’s μ (round trip)', () => {
    const a = semiMajorAxisKmFromMeanMotion(15.2);
    // n = sqrt(μ/a³) with μ = 398600.8 km³/s² (WGS-72, as satellite.js constants) — closed form.
    expect((Math.sqrt(398600.8 / a ** 3) * 86400) / (2 * Math.PI)).toBeCloseTo(15.2, 12);
    expect(meanMotionRevPerDayFromSemiMajorAxis(a)).toBeCloseTo(15.2, 12);
    const o = orbitFromElements({ ...base, semiMajorAxisKm: a });
    const p = orbitFromElements({ ...base, meanMotionRevPerDay: 15.2 });
    expect(o.ok && p.ok).toBe(true);
    if (!o.ok || !p.ok) return;
    const r2 = new Float64Array(3);
    sgp4Teme(r, v, o.value, o.value.epochTaiS + 3000);
    sgp4Teme(r2, v, p.value, p.value.epochTaiS + 3000);
    expect(Math.hypot(r[0]! - r2[0]!, r[1]! - r2[1]!, r[2]! - r2[2]!)).toBeLessThan(1e-3);
  });

  it('reports every range problem at once', () => {
    const o = orbitFromElements({
      ...base,
      semiMajorAxisKm: 6000,
      eccentricity: 1.2,
      inclinationDeg: 181,
      meanAnomalyDeg: NaN,
      epochUtcIso: '2026-02-30T00:00:00Z',
    });
    expect(o.ok).toBe(false);
    if (o.ok) return;
    expect(o.errors.map((e) => `${e.path}:${e.rule}`).sort()).toEqual(
      [
        'elements.meanAnomalyDeg:finite',
        'elements.inclinationDeg:range',
        'elements.eccentricity:eccentricity',
        'elements.epochUtcIso:day',
      ].sort(),
    );
  });

  it('refuses a perigee below the surface and both or neither of a and n; warns on a low perigee', () => {
    const low = orbitFromElements({ ...base, semiMajorAxisKm: 6500, eccentricity: 0.05 });
    expect(!low.ok && low.errors.map((e) => e.rule)).toEqual(['perigee']);
    const both = orbitFromElements({ ...base, semiMajorAxisKm: 7000, meanMotionRevPerDay: 15 });
    expect(!both.ok && both.errors.map((e) => e.rule)).toEqual(['one-of']);
    const neither = orbitFromElements({ ...base });
    expect(!neither.ok && neither.errors.map((e) => e.rule)).toEqual(['one-of']);
    const grazing = orbitFromElements({ ...base, semiMajorAxisKm: 6378.135 + 140, eccentricity: 0 });
    expect(grazing.ok && grazing.warnings.map((w) => w.rule)).toEqual(['low-perigee']);
  });

  it('rounds a sub-millisecond epoch with a warning and refuses a leap-second epoch', () => {
    const fine = orbitFromElements({ ...base, meanMotionRevPerDay: 15.2, epochUtcIso: '2026-03-20T12:00:00.0004Z' });
    expect(fine.ok && fine.warnings.map((w) => w.rule)).toEqual(['epoch-rounded']);
    const leap = orbitFromElements({ ...base, meanMotionRevPerDay: 15.2, epochUtcIso: '2016-12-31T23:59:60.5Z' });
    expect(!leap.ok && leap.errors.map((e) => e.rule)).toEqual(['leap-second']);
  });
});

describe('SGP4 time argument across a leap second', () => {
  it('counts elapsed SI seconds: 20 s after 2016-12-31T23:59:50Z is satellite.js propagate() at 00:00:10 UTC', () => {
    // Invented element set with epoch 2016 day 366.5 (2016-12-31T12:00Z).
    const [l1, l2] = DEMO_TLE_LEO.split('\n') as [string, string];
    const o = orbitFromTle(`${editColumns(l1, 19, 32, '16366.50000000')}\n${l2}`);
    if (!o.ok) throw new Error(JSON.stringify(o.errors));
    const ep = parseUtcIso('2016-12-31T23:59:50Z');
    if (!ep.ok) throw new Error('epoch');
    expect(sgp4Teme(r, v, o.value, ep.value.taiS + 20)).toBe(0);
    // The plan label of t = 20 s is 2017-01-01T00:00:09 (23:59:60 was counted). satellite.js's
    // Date-based propagate counts UTC days without leap seconds, so the same physical instant is
    // its 00:00:10 (elapsed time since the element epoch 12 h earlier includes the leap second).
    // (propagate differences double Julian dates, ~40 µs resolution ≈ 0.3 m of motion: 1 m bound.)
    const pv = propagate(o.value.satrec, new Date(Date.UTC(2017, 0, 1, 0, 0, 10)))!;
    expect(Math.abs(r[0]! - pv.position.x * 1000)).toBeLessThan(1);
    expect(Math.abs(r[1]! - pv.position.y * 1000)).toBeLessThan(1);
    const pv9 = propagate(o.value.satrec, new Date(Date.UTC(2017, 0, 1, 0, 0, 9)))!;
    expect(Math.abs(r[0]! - pv9.position.x * 1000)).toBeGreaterThan(100); // one second of motion ≈ 7.6 km
  });
});
