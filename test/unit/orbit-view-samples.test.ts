/**
 * The orbit view's sampled geometry (app/engine/orbit/viewSamples.ts) against outside references:
 * - satellite.js `sgp4` called directly on the example's TLE (npm reference library): |r| at every
 *   sample and the interpolation error between samples (rotated to EME2000 with the engine's
 *   frame matrix, which test/reference/orbit-frames.test.ts checks; a rotation keeps lengths, so
 *   the radius check does not depend on it);
 * - astronomy-engine `GeoVector(Sun, t, true)` and `GeoMoon` called directly (npm reference library),
 *   at TT = UTC + 37 s + 32.184 s (TAI − UTC = 37 s since 2017-01-01, IERS Bulletin C; TT − TAI =
 *   32.184 s, IAU 1991), minus the sampled position;
 * - satellite.js `gstime` + `ecfToEci` for the Earth's rotation of a ground site.
 * The scenario is the bundled invented example (assets/lumen6-orbit-day.scenario.json).
 */
import { readFileSync } from 'node:fs';
import { AstroTime, Body, GeoMoon, GeoVector, KM_PER_AU } from 'astronomy-engine';
import { ecfToEci, gstime, sgp4, twoline2satrec } from 'satellite.js';
import { describe, expect, it } from 'vitest';
import { temeToEme2000Matrix } from '../../app/engine/orbit/frames';
import { geodeticToEcef } from '../../app/engine/orbit/sites';
import { UMBRA, SUNLIT } from '../../app/engine/orbit/sky';
import { createOrbitViewPoint, earthFixedPointAt, orbitViewAt, orbitViewSamples, VIEW_STEP_S } from '../../app/engine/orbit/viewSamples';
import { preparePipeline } from '../../app/engine/pipeline/run';
import { RAD_PER_DEG } from '../../app/engine/units';

const json = JSON.parse(readFileSync(new URL('../../assets/lumen6-orbit-day.scenario.json', import.meta.url), 'utf8')) as {
  epochUtc: string;
  orbit: { tle: string[]; sites: { latitudeDeg: number; longitudeDeg: number; heightM: number }[] };
};
const prep = preparePipeline(json);
if (!prep.ok) throw new Error(JSON.stringify(prep.errors));
const eph = prep.value.orbit!.ephemeris;
const samples = orbitViewSamples(eph)!;
const epochMs = Date.parse(json.epochUtc);

// satellite.js directly on the TLE, minutes from the element epoch computed from the TLE's own
// epoch fields (year, day of year with fraction), so no Julian-date rounding enters.
const satrec = twoline2satrec(json.orbit.tle[1]!, json.orbit.tle[2]!);
const elementEpochMs = Date.UTC(2000 + satrec.epochyr, 0, 1) + (satrec.epochdays - 1) * 86_400_000;
function sgp4Eme2000(out: Float64Array, t: number): void {
  const pv = sgp4(satrec, (epochMs + 1000 * t - elementEpochMs) / 60_000);
  if (!pv || typeof pv.position === 'boolean') throw new Error('sgp4 failed');
  const m = temeToEme2000Matrix(new Float64Array(9), eph.epochTaiS + t);
  const p = [pv.position.x * 1000, pv.position.y * 1000, pv.position.z * 1000];
  for (let i = 0; i < 3; i++) out[i] = m[i]! * p[0]! + m[3 + i]! * p[1]! + m[6 + i]! * p[2]!;
}
/** Days of TT since J2000.0 (2000-01-01T12:00:00 TT = Unix 946 728 000 s in this count). */
const ttDays = (t: number) => ((epochMs + 1000 * t) / 1000 + 37 + 32.184 - 946_728_000) / 86_400;

describe('orbit view samples: what is sampled', () => {
  it('covers the ephemeris span at the view spacing', () => {
    expect(samples.frame).toBe('EME2000');
    expect(samples.stepS).toBe(VIEW_STEP_S);
    expect(samples.endS).toBe(eph.endS);
    expect((samples.n - 1) * samples.stepS).toBeGreaterThanOrEqual(eph.endS - 1e-9);
    // Vis-viva period against the TLE's mean motion 15.2 rev/day (86400/15.2 = 5684 s); osculating
    // and Kozai mean motions differ by J2 terms of order 1e-3 (Vallado 4th ed. §9.6, from memory): 0.5 %.
    expect(Math.abs(samples.periodS - 86_400 / 15.2) / (86_400 / 15.2)).toBeLessThan(5e-3);
  });

  it('|r| at every sample equals the satellite.js sgp4 radius (npm reference library): 1 mm on ephemeris nodes, 5 cm between', () => {
    const p = createOrbitViewPoint();
    const ref = new Float64Array(3);
    let worstNode = 0,
      worst = 0;
    for (let k = 0; k < samples.n; k++) {
      const t = Math.min(k * samples.stepS, samples.endS);
      orbitViewAt(p, samples, t);
      sgp4Eme2000(ref, t);
      const e = Math.abs(Math.hypot(...p.rM) - Math.hypot(...ref));
      worst = Math.max(worst, e);
      // On the ephemeris' SGP4 nodes (every 30 s) the sample is SGP4 itself, turned to EME2000.
      if (Math.abs(t / eph.orbitStepS - Math.round(t / eph.orbitStepS)) < 1e-9) worstNode = Math.max(worstNode, e);
    }
    console.info(`orbit view: |r| vs sgp4 worst ${worst.toExponential(3)} m, on nodes ${worstNode.toExponential(3)} m`);
    expect(worstNode).toBeLessThan(1e-3);
    // Between nodes the samples carry the ephemeris' 30 s Hermite error (orbit-ephemeris.test.ts).
    expect(worst).toBeLessThan(0.05);
  });

  it('Sun and Moon directions at sample times equal astronomy-engine minus the position to 1e-9', () => {
    const p = createOrbitViewPoint();
    const M_PER_AU = KM_PER_AU * 1000;
    let worstSun = 0,
      worstMoon = 0;
    for (let k = 0; k < samples.n; k += 7) {
      const t = k * samples.stepS;
      if (t > samples.endS) break;
      orbitViewAt(p, samples, t);
      const time = AstroTime.FromTerrestrialTime(ttDays(t));
      const sv = GeoVector(Body.Sun, time, true);
      const mv = GeoMoon(time);
      const r = p.rM;
      const sd = [sv.x * M_PER_AU - r[0]!, sv.y * M_PER_AU - r[1]!, sv.z * M_PER_AU - r[2]!];
      const md = [mv.x * M_PER_AU - r[0]!, mv.y * M_PER_AU - r[1]!, mv.z * M_PER_AU - r[2]!];
      const sn = Math.hypot(...sd),
        mn = Math.hypot(...md);
      for (let i = 0; i < 3; i++) {
        worstSun = Math.max(worstSun, Math.abs(p.sunDir[i]! - sd[i]! / sn));
        worstMoon = Math.max(worstMoon, Math.abs(p.moonDir[i]! - md[i]! / mn));
      }
    }
    expect(worstSun).toBeLessThan(1e-9);
    expect(worstMoon).toBeLessThan(1e-9);
  });

  it('a ground site turns with the Earth as satellite.js gstime + ecfToEci (npm reference library) to 1 m', () => {
    const site = json.orbit.sites[0]!;
    const ecef = geodeticToEcef(new Float64Array(3), site.latitudeDeg * RAD_PER_DEG, site.longitudeDeg * RAD_PER_DEG, site.heightM);
    const p = createOrbitViewPoint();
    const out = new Float64Array(3);
    let worst = 0;
    for (const t of [0, 1234.5, 3600, 7000]) {
      orbitViewAt(p, samples, t);
      earthFixedPointAt(out, p, ecef);
      // satellite.js: UT1 taken as UTC, as the engine does (frames.ts gmstRad).
      const g = gstime(new Date(epochMs + 1000 * t));
      const teme = ecfToEci({ x: ecef[0]! / 1000, y: ecef[1]! / 1000, z: ecef[2]! / 1000 }, g);
      const m = temeToEme2000Matrix(new Float64Array(9), eph.epochTaiS + t);
      const v = [teme.x * 1000, teme.y * 1000, teme.z * 1000];
      for (let i = 0; i < 3; i++) worst = Math.max(worst, Math.abs(out[i]! - (m[i]! * v[0]! + m[3 + i]! * v[1]! + m[6 + i]! * v[2]!)));
    }
    // gstime on a Date rounds through the Julian date (~40 µs ≈ 2 cm of Earth rotation at the equator).
    expect(worst).toBeLessThan(1);
  });
});

describe('orbit view samples: interpolation between samples', () => {
  it('position error at mid-samples against satellite.js sgp4 stays under 0.05 m at the 10 s spacing', () => {
    const p = createOrbitViewPoint();
    const ref = new Float64Array(3);
    let worst = 0;
    for (let k = 0; k + 1 < samples.n; k++) {
      const t = (k + 0.5) * samples.stepS;
      if (t > samples.endS) break;
      orbitViewAt(p, samples, t);
      sgp4Eme2000(ref, t);
      worst = Math.max(worst, Math.hypot(p.rM[0]! - ref[0]!, p.rM[1]! - ref[1]!, p.rM[2]! - ref[2]!));
    }
    console.info(`orbit view: worst mid-sample position error ${worst.toExponential(3)} m over ${samples.n - 1} intervals`);
    expect(worst).toBeLessThan(0.05);
  });

  it('the eclipse state follows the conical shadow at the interpolated instant: umbra and sunlit both occur', () => {
    const p = createOrbitViewPoint();
    const states = new Set<number>();
    for (let t = 0; t <= 7200; t += 5) states.add(orbitViewAt(p, samples, t).shadow);
    expect(states.has(UMBRA)).toBe(true);
    expect(states.has(SUNLIT)).toBe(true);
    // The pipeline's eclipse windows (engine, sampleEphemeris at 30 s nodes, windows.ts) agree:
    // in the middle of each the view says umbra or penumbra.
    for (const e of prep.value.orbit!.eclipses) {
      expect(orbitViewAt(p, samples, 0.5 * (e.startS + e.endS)).shadow).not.toBe(SUNLIT);
    }
  });

  it('outside the span every value is NaN and valid is false; no exception', () => {
    const p = createOrbitViewPoint();
    orbitViewAt(p, samples, -1);
    expect(p.valid).toBe(false);
    expect(Number.isNaN(p.rM[0]!)).toBe(true);
    orbitViewAt(p, samples, samples.endS + 1);
    expect(p.valid).toBe(false);
    orbitViewAt(p, samples, Number.NaN);
    expect(p.valid).toBe(false);
  });
});
