/**
 * Moving keep-out cones in the 3D attitude view (app/ui/view/movingCones.ts through
 * viewRuns.ts constraintCones): on the bundled invented orbit example with Sun, Moon, Earth-limb
 * and ground-station constraints added, each cone's axis at a playback time against outside
 * references:
 * - satellite.js `sgp4` on the example's TLE and `gstime` + `geodeticToEcf` + `ecfToEci` for the
 *   station (npm reference library), turned from TEME to EME2000 with the engine's frame matrix
 *   (checked in test/reference/orbit-frames.test.ts); measured agreement 5e-10 … 3e-9 rad (its
 *   ellipsoid for geodeticToEcf: WGS-84 as far as the agreement shows), bound 1e-7 rad;
 * - astronomy-engine `GeoVector(Sun, t, true)` and `GeoMoon` (npm reference library) at TT = UTC +
 *   69.184 s (TAI − UTC = 37 s, IERS Bulletin C; TT − TAI = 32.184 s);
 * - Earth limb: half angle + asin(R⊕/|r|) with R⊕ = 6 378 137 m (WGS-84 equatorial radius), the
 *   definition the engine's constraint directions state (constraints/directions.ts).
 */
import { readFileSync } from 'node:fs';
import { AstroTime, Body, GeoMoon, GeoVector, KM_PER_AU } from 'astronomy-engine';
import { ecfToEci, geodeticToEcf, gstime, sgp4, twoline2satrec } from 'satellite.js';
import { describe, expect, it } from 'vitest';
import { temeToEme2000Matrix } from '../../app/engine/orbit/frames';
import { orbitViewSamples } from '../../app/engine/orbit/viewSamples';
import { preparePipeline } from '../../app/engine/pipeline/run';
import type { PipelineOutput } from '../../app/engine/pipeline/types';
import { scenarioSummary } from '../../app/engine/pipeline/summarise';
import { RAD_PER_DEG } from '../../app/engine/units';
import { conesKey, constraintCones } from '../../app/ui/view/viewRuns';

const file = JSON.parse(readFileSync(new URL('../../assets/lumen6-orbit-day.scenario.json', import.meta.url), 'utf8')) as Record<
  string,
  unknown
> & { epochUtc: string; orbit: { tle: string[] } };
const station = { latitudeDeg: 47.5, longitudeDeg: 10.25, altitudeM: 400 };
file.constraints = [
  { name: 'panel sun', kind: 'keep-out', bodyAxis: [0, 0, -1], halfAngleDeg: 30, direction: { kind: 'sun' } },
  { name: 'tracker moon', kind: 'keep-out', bodyAxis: [0, 1, 0], halfAngleDeg: 15, direction: { kind: 'moon' } },
  { name: 'tracker limb', kind: 'keep-out', bodyAxis: [0, 1, 0], halfAngleDeg: 10, direction: { kind: 'earth-limb' } },
  { name: 'antenna station', kind: 'keep-in', bodyAxis: [1, 0, 0], halfAngleDeg: 60, direction: { kind: 'ground-station', ...station } },
];

const prep = preparePipeline(file);
if (!prep.ok) throw new Error(JSON.stringify(prep.errors));
const p = prep.value;
// The parts of a pipeline output constraintCones reads (no flight needed for directions).
const out = {
  scenario: scenarioSummary(p.scenario, p.file!),
  keepOut: p.scenario.keepOut,
  constraints: p.constraints.info,
  orbitView: orbitViewSamples(p.orbit!.ephemeris),
} as unknown as PipelineOutput;

const epochMs = Date.parse(file.epochUtc);
const satrec = twoline2satrec(file.orbit.tle[1]!, file.orbit.tle[2]!);
const elementEpochMs = Date.UTC(2000 + satrec.epochyr, 0, 1) + (satrec.epochdays - 1) * 86_400_000;
const M_PER_AU = KM_PER_AU * 1000;

function toEme(v: ArrayLike<number>, t: number): number[] {
  const m = temeToEme2000Matrix(new Float64Array(9), p.orbit!.ephemeris.epochTaiS + t);
  return [0, 1, 2].map((i) => m[i]! * v[0]! + m[3 + i]! * v[1]! + m[6 + i]! * v[2]!);
}
function unit(v: number[]): number[] {
  const n = Math.hypot(...v);
  return v.map((x) => x / n);
}
/** Angle between two directions, atan2(|a × b|, a · b): accurate near zero, unlike acos. */
function angle(a: ArrayLike<number>, b: number[]): number {
  const cx = a[1]! * b[2]! - a[2]! * b[1]!,
    cy = a[2]! * b[0]! - a[0]! * b[2]!,
    cz = a[0]! * b[1]! - a[1]! * b[0]!;
  return Math.atan2(Math.hypot(cx, cy, cz), a[0]! * b[0]! + a[1]! * b[1]! + a[2]! * b[2]!);
}

describe('moving cones at a playback time', () => {
  for (const t of [95, 1234.5, 4000]) {
    it(`at t = ${t} s each axis matches satellite.js / astronomy-engine`, () => {
      const cones = constraintCones(out, null, t);
      expect(cones.map((c) => c.label)).toEqual(['panel sun', 'tracker moon', 'tracker limb', 'antenna station (keep-in)']);
      expect(cones.every((c) => c.moving)).toBe(true);
      const pv = sgp4(satrec, (epochMs + 1000 * t - elementEpochMs) / 60_000);
      if (!pv || typeof pv.position === 'boolean') throw new Error('sgp4');
      const r = toEme([pv.position.x * 1000, pv.position.y * 1000, pv.position.z * 1000], t);
      const time = AstroTime.FromTerrestrialTime(((epochMs + 1000 * t) / 1000 + 69.184 - 946_728_000) / 86_400);
      const sun = GeoVector(Body.Sun, time, true);
      const moon = GeoMoon(time);
      const sunDir = unit([sun.x * M_PER_AU - r[0]!, sun.y * M_PER_AU - r[1]!, sun.z * M_PER_AU - r[2]!]);
      const moonDir = unit([moon.x * M_PER_AU - r[0]!, moon.y * M_PER_AU - r[1]!, moon.z * M_PER_AU - r[2]!]);
      const earthDir = unit(r.map((x) => -x));
      const ecf = geodeticToEcf({
        latitude: station.latitudeDeg * RAD_PER_DEG,
        longitude: station.longitudeDeg * RAD_PER_DEG,
        height: station.altitudeM / 1000,
      });
      const teme = ecfToEci(ecf, gstime(new Date(epochMs + 1000 * t)));
      const st = toEme([teme.x * 1000, teme.y * 1000, teme.z * 1000], t);
      const stationDir = unit([st[0]! - r[0]!, st[1]! - r[1]!, st[2]! - r[2]!]);
      // The view's interpolated position differs from sgp4 by ≤ 2 cm (orbit-view-samples.test.ts).
      console.info(
        `moving cones t=${t}: sun ${angle(cones[0]!.dirInertial, sunDir).toExponential(2)}, moon ${angle(cones[1]!.dirInertial, moonDir).toExponential(2)}, earth ${angle(cones[2]!.dirInertial, earthDir).toExponential(2)}, station ${angle(cones[3]!.dirInertial, stationDir).toExponential(2)} rad`,
      );
      expect(angle(cones[0]!.dirInertial, sunDir)).toBeLessThan(1e-9);
      expect(angle(cones[1]!.dirInertial, moonDir)).toBeLessThan(1e-9);
      expect(angle(cones[2]!.dirInertial, earthDir)).toBeLessThan(1e-8);
      expect(angle(cones[3]!.dirInertial, stationDir)).toBeLessThan(1e-7);
      expect(cones[0]!.halfAngleRad).toBeCloseTo(30 * RAD_PER_DEG, 12);
      // Limb: 10° + asin(R/|r|), drawn at most a hemisphere (the view's cones stop at π/2); the
      // view's position is within 2 cm of sgp4's, so asin(R/|r|) agrees to ~1e-8 rad.
      expect(cones[2]!.halfAngleRad).toBeCloseTo(Math.min(Math.PI / 2, 10 * RAD_PER_DEG + Math.asin(6_378_137 / Math.hypot(...r))), 7);
    });
  }

  it('the cone key changes when a moving axis turns by more than 0.25°, not between nearby frames', () => {
    const k0 = conesKey(constraintCones(out, null, 1000));
    // Earth centre turns with the orbit, ~0.063°/s in this orbit (360° / 5684 s): 0.1 s ≈ 0.006°.
    expect(conesKey(constraintCones(out, null, 1000.1))).toBe(k0);
    expect(conesKey(constraintCones(out, null, 1030))).not.toBe(k0);
  });

  it('a scenario without orbit samples draws only fixed cones (no moving cone, no exception)', () => {
    const cones = constraintCones({ ...out, orbitView: null } as PipelineOutput, null, 10);
    expect(cones).toEqual([]);
  });
});
