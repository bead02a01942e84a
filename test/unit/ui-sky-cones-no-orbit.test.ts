/**
 * Sun and Moon keep-out cones of a scenario WITHOUT an orbit (app/ui/view/movingCones.ts through
 * viewRuns.ts constraintCones for the 3D view and skyPlayback.ts for the sky view): the bundled
 * invented Lumen-6 example (no orbit, epoch 2030-03-14T10:00:00Z) with a Sun cone on +Y and a Moon
 * cone on −Z added. References:
 * - the engine's geocentric directions (orbit/sky.ts, what constraints/directions.ts samples
 *   without an ephemeris): the drawn axis is that function's value at TAI = epoch + t, bit for bit;
 * - astronomy-engine `GeoVector(Sun, t, true)` and `GeoMoon` (npm reference library, J2000 mean
 *   equator EQJ) at TT = UTC + 69.184 s (TAI − UTC = 37 s, IERS Bulletin C; TT − TAI = 32.184 s).
 *   orbit/sky.ts is built on that library, so this checks the epoch and time scale the view uses
 *   (a wrong epoch or a UTC/TT slip would move the Moon by ~0.5″/s); measured 0 … 8e-17 rad;
 * - the engine's own check of the flown run (pipeline/constraints.ts checkRun margin series): the
 *   margin at a sample is the angle from the body axis (trace attitude, qInertialFromBody) to the
 *   drawn axis minus the half angle, for a keep-out cone (the definition constraints/directions.ts
 *   and cone.ts state; the engine interpolates its 600 s samples along the great circle, which
 *   moves the Sun by < 0.01° here).
 */
import { AstroTime, Body, GeoMoon, GeoVector } from 'astronomy-engine';
import { describe, expect, it } from 'vitest';
import { qRotate } from '../../app/engine/math/quaternion';
import { moonDirectionEme2000, sunDirectionEme2000 } from '../../app/engine/orbit/sky';
import { runPipeline } from '../../app/engine/pipeline/run';
import { parseUtcIso } from '../../app/engine/time/iso';
import { RAD_PER_DEG } from '../../app/engine/units';
import { skyNow } from '../../app/ui/orbit/skyPlayback';
import { angleBetween } from '../../app/ui/orbit/skyModel';
import { movingConeAvailable } from '../../app/ui/view/movingCones';
import { constraintCones, sampleAt } from '../../app/ui/view/viewRuns';
import { loadExample } from './scenario-fixtures';

const json = loadExample('lumen6-imaging');
json.constraints = [
  { name: 'tracker sun', kind: 'keep-out', bodyAxis: [0, 1, 0], halfAngleDeg: 25, direction: { kind: 'sun' } },
  { name: 'radiator moon', kind: 'keep-out', bodyAxis: [0, 0, -1], halfAngleDeg: 15, direction: { kind: 'moon' } },
];
const r = runPipeline(json);
if (!r.ok) throw new Error(JSON.stringify(r.errors));
const out = r.value;
const epoch = parseUtcIso(out.scenario.epochUtc);
if (!epoch.ok) throw new Error('epoch');
const epochTai = epoch.value.taiS;
const epochMs = Date.parse(json.epochUtc as string);

function unit(v: { x: number; y: number; z: number }): number[] {
  const n = Math.hypot(v.x, v.y, v.z);
  return [v.x / n, v.y / n, v.z / n];
}

describe('Sun and Moon cones without an orbit', () => {
  it('the example has no orbit and an epoch; Sun and Moon cones can be aimed, Earth ones cannot', () => {
    expect(out.scenario.orbit ?? null).toBeNull();
    expect(out.orbitView ?? null).toBeNull();
    expect([movingConeAvailable(out, 'sun'), movingConeAvailable(out, 'moon'), movingConeAvailable(out, 'earth-limb')]).toEqual([
      true,
      true,
      false,
    ]);
  });

  for (const t of [0, 120.5, 300]) {
    it(`3D view at t = ${t} s: the drawn axes are the engine's geocentric Sun and Moon, and match astronomy-engine`, () => {
      const cones = constraintCones(out, null, t);
      // The example's fixed keepOut cone first, then the two added ones.
      expect(cones.map((c) => [c.label, c.moving ?? false])).toEqual([
        ['Star tracker Sun exclusion', false],
        ['tracker sun', true],
        ['radiator moon', true],
      ]);
      const sun = new Float64Array(3),
        moon = new Float64Array(3);
      sunDirectionEme2000(sun, epochTai + t);
      moonDirectionEme2000(moon, epochTai + t);
      expect(Array.from(cones[1]!.dirInertial)).toEqual(Array.from(sun));
      expect(Array.from(cones[2]!.dirInertial)).toEqual(Array.from(moon));
      expect(cones[1]!.halfAngleRad).toBeCloseTo(25 * RAD_PER_DEG, 14);
      expect(cones[2]!.halfAngleRad).toBeCloseTo(15 * RAD_PER_DEG, 14);
      const time = AstroTime.FromTerrestrialTime(((epochMs + 1000 * t) / 1000 + 69.184 - 946_728_000) / 86_400);
      const dSun = angleBetween(cones[1]!.dirInertial, unit(GeoVector(Body.Sun, time, true)));
      const dMoon = angleBetween(cones[2]!.dirInertial, unit(GeoMoon(time)));
      console.info(`no-orbit cones t=${t}: sun ${dSun.toExponential(2)} rad, moon ${dMoon.toExponential(2)} rad from astronomy-engine`);
      // Same library underneath: rounding only (a 1 s time slip would move the Moon by ~2.7e-6 rad).
      expect(dSun).toBeLessThan(1e-12);
      expect(dMoon).toBeLessThan(1e-12);
    });
  }

  it("the drawn cone agrees with the engine's margin series of the flown run at every 50th sample", () => {
    const run = out.runs[0]!;
    const m = run.constraints!.marginRad;
    const info = out.constraints!;
    expect(info.map((c) => c.directionKind)).toEqual(['fixed', 'sun', 'moon']);
    const axis = new Float64Array(3),
      q = new Float64Array(4);
    let worst = 0;
    for (let k = 0; k < run.trace.n; k += 50) {
      const t = run.trace.t[k]!;
      expect(sampleAt(run.trace.t, run.trace.n, t)).toBe(k);
      const cones = constraintCones(out, run, t);
      for (const j of [1, 2]) {
        q.set(run.trace.q.subarray(4 * k, 4 * k + 4));
        qRotate(axis, q, info[j]!.bodyAxis);
        const drawn = angleBetween(axis, cones[j]!.dirInertial) - info[j]!.halfAngleRad - info[j]!.marginRad;
        worst = Math.max(worst, Math.abs(drawn - m[j]![k]!));
        expect(cones[j]!.violated).toBe(m[j]![k]! < 0);
      }
    }
    console.info(`no-orbit cones: largest |drawn margin − engine margin| ${worst.toExponential(2)} rad`);
    expect(worst).toBeLessThan(1e-6);
  });

  it('sky view: a circle of the half angle around the Sun on +Y and around the Moon on −Z, at the Sun and Moon marks', () => {
    for (const [axis, label, half, body] of [
      [[0, 1, 0], 'tracker sun', 25, 'Sun'],
      [[0, 0, -1], 'radiator moon', 15, 'Moon'],
    ] as const) {
      const now = skyNow(out, out.runs[0]!.key, axis, 150);
      expect(now.cones.map((c) => c.label)).toEqual([label]);
      const mark = body === 'Sun' ? now.sun! : now.moon!;
      const centre = [
        Math.cos(mark.decDeg * RAD_PER_DEG) * Math.cos(mark.raDeg * RAD_PER_DEG),
        Math.cos(mark.decDeg * RAD_PER_DEG) * Math.sin(mark.raDeg * RAD_PER_DEG),
        Math.sin(mark.decDeg * RAD_PER_DEG),
      ];
      let points = 0;
      for (const piece of now.cones[0]!.pieces)
        piece.raDeg.forEach((ra, i) => {
          // The points a piece gets where it is cut at the RA wrap (skyModel.ts skyPieces) are edge points, not on the circle.
          if (ra === 0 || ra === 360) return;
          const dec = piece.decDeg[i]! * RAD_PER_DEG;
          const p = [Math.cos(dec) * Math.cos(ra * RAD_PER_DEG), Math.cos(dec) * Math.sin(ra * RAD_PER_DEG), Math.sin(dec)];
          expect(angleBetween(p, centre) / RAD_PER_DEG).toBeCloseTo(half, 9);
          points++;
        });
      expect(points).toBeGreaterThanOrEqual(180);
    }
    // No cone on an axis that carries none.
    expect(skyNow(out, out.runs[0]!.key, [1, 0, 0], 150).cones).toEqual([]);
  });
});
