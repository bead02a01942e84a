/**
 * The sky view at the playback time (app/ui/orbit/skyPlayback.ts) and the chart's split over a
 * celestial pole (skyModel.ts skyPieces), against outside references:
 * - the body axis at time t: R(q)·b with R written from the quaternion formula (Shuster, "A survey
 *   of attitude representations", J. Astronaut. Sci. 41(4), 1993, eq. 161, from memory on the
 *   equation number) at the samples, and Shoemake's slerp written out here (Shoemake, "Animating
 *   rotation with quaternion curves", SIGGRAPH 1985: q(α) = [sin((1−α)Ω) q0 + sin(αΩ) q1] / sin Ω,
 *   q1 negated first when q0·q1 < 0 for the shorter arc) between them;
 * - the moving cones on the sky: centre from satellite.js `sgp4` (npm reference library) for the
 *   spacecraft and astronomy-engine `GeoVector(Sun)` / `GeoMoon` (npm reference library) at TT =
 *   UTC + 69.184 s (TAI − UTC = 37 s, IERS Bulletin C; TT − TAI = 32.184 s), turned from TEME with
 *   the engine's frame matrix (checked in test/reference/orbit-frames.test.ts); every outline point
 *   at the half angle from that centre (the definition of a small circle: {p : angle(a, p) = ρ});
 *   the Earth limb's half angle plus asin(R⊕/|r|), R⊕ = 6 378 137 m (WGS-84 equatorial radius);
 * - the Sun and Moon without an orbit: astronomy-engine's geocentric vectors (EQJ, the J2000 mean
 *   equator; EME2000 differs by the frame bias, 23 mas, IERS Conventions 2010 §5.5.5, from memory).
 */
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { AstroTime, Body, GeoMoon, GeoVector, KM_PER_AU } from 'astronomy-engine';
import { sgp4, twoline2satrec } from 'satellite.js';
import { describe, expect, it } from 'vitest';
import { temeToEme2000Matrix } from '../../app/engine/orbit/frames';
import { orbitViewSamples } from '../../app/engine/orbit/viewSamples';
import { preparePipeline, runPipeline } from '../../app/engine/pipeline/run';
import type { PipelineOutput } from '../../app/engine/pipeline/types';
import { scenarioSummary } from '../../app/engine/pipeline/summarise';
import { directionOfRaDec, skyPieces } from '../../app/ui/orbit/skyModel';
import { bodyAxisAt, movingSkyCones, skyNow } from '../../app/ui/orbit/skyPlayback';

const D = 180 / Math.PI; // test-side factor

function angle(a: ArrayLike<number>, b: ArrayLike<number>): number {
  const cx = a[1]! * b[2]! - a[2]! * b[1]!,
    cy = a[2]! * b[0]! - a[0]! * b[2]!,
    cz = a[0]! * b[1]! - a[1]! * b[0]!;
  return Math.atan2(Math.hypot(cx, cy, cz), a[0]! * b[0]! + a[1]! * b[1]! + a[2]! * b[2]!);
}
const unit = (v: number[]) => v.map((x) => x / Math.hypot(...v));

/** Seeded uniform numbers (mulberry32, common practice, no source). */
function rng(seed: number) {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

/** R(q) body → inertial from q = [x, y, z, w] (Shuster 1993, written out here). */
function rotate(q: ArrayLike<number>, v: ArrayLike<number>): number[] {
  const [x, y, z, w] = [q[0]!, q[1]!, q[2]!, q[3]!];
  const R = [
    [1 - 2 * (y * y + z * z), 2 * (x * y - z * w), 2 * (x * z + y * w)],
    [2 * (x * y + z * w), 1 - 2 * (x * x + z * z), 2 * (y * z - x * w)],
    [2 * (x * z - y * w), 2 * (y * z + x * w), 1 - 2 * (x * x + y * y)],
  ];
  return R.map((row) => row[0]! * v[0]! + row[1]! * v[1]! + row[2]! * v[2]!);
}

/** Shoemake 1985 slerp, written out here. */
function slerp(a: number[], b: number[], t: number): number[] {
  let d = a[0]! * b[0]! + a[1]! * b[1]! + a[2]! * b[2]! + a[3]! * b[3]!;
  let bb = b;
  if (d < 0) {
    d = -d;
    bb = b.map((x) => -x);
  }
  if (d > 1 - 1e-12) return a.map((x, i) => x + t * (bb[i]! - x));
  const om = Math.acos(d);
  const s0 = Math.sin((1 - t) * om) / Math.sin(om),
    s1 = Math.sin(t * om) / Math.sin(om);
  return a.map((x, i) => s0 * x + s1 * bb[i]!);
}

describe('the body axis at the playback time', () => {
  it('is R(q)·b at the samples and the slerp of the neighbouring samples between them (to 1e-12 rad)', () => {
    const r = rng(5);
    const n = 50;
    const t = Float64Array.from({ length: n }, (_, i) => 0.1 * i);
    const q = new Float64Array(4 * n);
    // A tumbling attitude: random axis per step, up to 40° per step (slerp differs from chord blending there).
    let cur = [0, 0, 0, 1];
    for (let i = 0; i < n; i++) {
      q.set(cur, 4 * i);
      const ax = unit([r() - 0.5, r() - 0.5, r() - 0.5]);
      const th = (40 / D) * r();
      const dq = [...ax.map((x) => x * Math.sin(th / 2)), Math.cos(th / 2)];
      const [x1, y1, z1, w1] = cur as [number, number, number, number];
      const [x2, y2, z2, w2] = dq as [number, number, number, number];
      cur = [
        w1 * x2 + x1 * w2 + y1 * z2 - z1 * y2,
        w1 * y2 - x1 * z2 + y1 * w2 + z1 * x2,
        w1 * z2 + x1 * y2 - y1 * x2 + z1 * w2,
        w1 * w2 - x1 * x2 - y1 * y2 - z1 * z2,
      ];
      if (i % 7 === 3) cur = cur.map((x) => -x); // the same attitude, the other sign: slerp must take the short way
    }
    const b = unit([0.2, -0.7, 0.5]);
    const out = new Float64Array(3);
    let worst = 0;
    for (let i = 0; i < n; i++) {
      bodyAxisAt(out, t, q, n, b, t[i]!);
      worst = Math.max(worst, angle(out, rotate(q.subarray(4 * i, 4 * i + 4), b)));
    }
    for (let i = 0; i + 1 < n; i++)
      for (const f of [0.25, 0.5, 0.9]) {
        bodyAxisAt(out, t, q, n, b, t[i]! + f * 0.1);
        const ref = rotate(slerp([...q.subarray(4 * i, 4 * i + 4)], [...q.subarray(4 * i + 4, 4 * i + 8)], f), b);
        worst = Math.max(worst, angle(out, ref));
      }
    expect(worst).toBeLessThan(1e-12);
    // before the first and after the last sample: clamped to them
    bodyAxisAt(out, t, q, n, b, -5);
    expect(angle(out, rotate(q.subarray(0, 4), b))).toBeLessThan(1e-12);
    bodyAxisAt(out, t, q, n, b, 99);
    expect(angle(out, rotate(q.subarray(4 * (n - 1)), b))).toBeLessThan(1e-12);
    expect(bodyAxisAt(out, t, q, 0, b, 0)).toBeNull();
  });
});

describe('cones against moving directions on the sky at the playback time (orbit example)', () => {
  const file = JSON.parse(readFileSync(join(__dirname, '../../assets/lumen6-orbit-day.scenario.json'), 'utf8')) as Record<
    string,
    unknown
  > & {
    epochUtc: string;
    orbit: { tle: string[] };
  };
  file.constraints = [
    { name: 'panel sun', kind: 'keep-out', bodyAxis: [0, 0, -1], halfAngleDeg: 30, direction: { kind: 'sun' } },
    { name: 'tracker moon', kind: 'keep-out', bodyAxis: [0, 1, 0], halfAngleDeg: 15, direction: { kind: 'moon' } },
    { name: 'tracker limb', kind: 'keep-out', bodyAxis: [0, 1, 0], halfAngleDeg: 10, direction: { kind: 'earth-limb' } },
    {
      name: 'fixed one',
      kind: 'keep-out',
      bodyAxis: [0, 1, 0],
      halfAngleDeg: 10,
      direction: { kind: 'fixed', inertialDirection: [1, 0, 0] },
    },
  ];
  const prep = preparePipeline(file);
  if (!prep.ok) throw new Error(JSON.stringify(prep.errors));
  const p = prep.value;
  const out = {
    scenario: scenarioSummary(p.scenario, p.file!),
    keepOut: p.scenario.keepOut,
    constraints: p.constraints.info,
    orbitView: orbitViewSamples(p.orbit!.ephemeris),
    orbit: {},
    runs: [],
  } as unknown as PipelineOutput;
  const epochMs = Date.parse(file.epochUtc);
  const satrec = twoline2satrec(file.orbit.tle[1]!, file.orbit.tle[2]!);
  const elementEpochMs = Date.UTC(2000 + satrec.epochyr, 0, 1) + (satrec.epochdays - 1) * 86_400_000;
  const M_PER_AU = KM_PER_AU * 1000;
  function reference(t: number) {
    const pv = sgp4(satrec, (epochMs + 1000 * t - elementEpochMs) / 60_000);
    if (!pv || typeof pv.position === 'boolean') throw new Error('sgp4');
    const m = temeToEme2000Matrix(new Float64Array(9), p.orbit!.ephemeris.epochTaiS + t);
    const v = [pv.position.x * 1000, pv.position.y * 1000, pv.position.z * 1000];
    const r = [0, 1, 2].map((i) => m[i]! * v[0]! + m[3 + i]! * v[1]! + m[6 + i]! * v[2]!);
    const time = AstroTime.FromTerrestrialTime(((epochMs + 1000 * t) / 1000 + 69.184 - 946_728_000) / 86_400);
    const sun = GeoVector(Body.Sun, time, true);
    const moon = GeoMoon(time);
    return {
      r,
      sun: unit([sun.x * M_PER_AU - r[0]!, sun.y * M_PER_AU - r[1]!, sun.z * M_PER_AU - r[2]!]),
      moon: unit([moon.x * M_PER_AU - r[0]!, moon.y * M_PER_AU - r[1]!, moon.z * M_PER_AU - r[2]!]),
      earth: unit(r.map((x) => -x)),
    };
  }
  /** Largest |angle(outline point, centre) − ρ| over a cone's drawn points, rad. */
  function worstRadiusError(pieces: { raDeg: number[]; decDeg: number[] }[], centre: number[], rho: number): number {
    let w = 0;
    // Outline points are exact; the points added at the RA = 0° cut or a pole edge sit on the chord
    // between two outline points (≤ ρ(1 − cos(π/180)) ≈ 1.5e-4 ρ off): leave out those at a piece's ends.
    for (const pc of pieces)
      for (let i = 1; i + 1 < pc.raDeg.length; i++)
        w = Math.max(w, Math.abs(angle(directionOfRaDec(pc.raDeg[i]!, pc.decDeg[i]!), centre) - rho));
    return w;
  }

  for (const t of [120, 2500.5]) {
    it(`at t = ${t} s the Sun, Moon and limb circles lie at their half angles about satellite.js / astronomy-engine directions`, () => {
      const ref = reference(t);
      const sunCones = movingSkyCones(out, [0, 0, -1], t);
      expect(sunCones.map((c) => c.label)).toEqual(['panel sun']);
      const tracker = movingSkyCones(out, [0, 1, 0], t);
      expect(tracker.map((c) => c.label)).toEqual(['tracker moon', 'tracker limb']); // the fixed cone is the static scene's
      const limbRho = 10 / D + Math.asin(6_378_137 / Math.hypot(...ref.r));
      const errs = {
        sun: worstRadiusError(sunCones[0]!.pieces, ref.sun, 30 / D),
        moon: worstRadiusError(tracker[0]!.pieces, ref.moon, 15 / D),
        limb: worstRadiusError(tracker[1]!.pieces, ref.earth, limbRho),
      };
      console.info(
        `sky cones t=${t}: radius errors sun ${errs.sun.toExponential(2)}, moon ${errs.moon.toExponential(2)}, limb ${errs.limb.toExponential(2)} rad`,
      );
      // The view's interpolated position is within 2 cm of sgp4's (orbit-view-samples.test.ts); RA/Dec in degrees round-trip to ~1e-14.
      expect(errs.sun).toBeLessThan(1e-8);
      expect(errs.moon).toBeLessThan(1e-8);
      expect(errs.limb).toBeLessThan(1e-7);
      // and the scene at t carries them, with the Sun and the Moon where the references put them
      const now = skyNow(out, null, [0, 1, 0], t);
      expect(now.axis).toBeNull(); // no run
      expect(now.cones.length).toBe(2);
      expect(angle(directionOfRaDec(now.sun!.raDeg, now.sun!.decDeg), ref.sun)).toBeLessThan(1e-9);
      expect(angle(directionOfRaDec(now.moon!.raDeg, now.moon!.decDeg), ref.moon)).toBeLessThan(1e-9);
    });
  }

  it('the cones move with the playback time: the Earth limb circle turns with the orbit', () => {
    const a = movingSkyCones(out, [0, 1, 0], 1000)[1]!;
    const b = movingSkyCones(out, [0, 1, 0], 1600)[1]!;
    const ra = (c: typeof a) => c.pieces[0]!.raDeg[1]!;
    expect(Math.abs(ra(a) - ra(b))).toBeGreaterThan(1);
    // The limb centre turns with the orbit, 360° per period (sgp4: ~95 min): about 38° in 600 s.
    const turn = angle(reference(1000).earth, reference(1600).earth) * D;
    expect(turn).toBeGreaterThan(30);
  });

  it('without orbit samples there are no moving cones (no exception)', () => {
    expect(movingSkyCones({ ...out, orbitView: null } as PipelineOutput, [0, 1, 0], 10)).toEqual([]);
  });
});

describe('the Sun and Moon at the playback time without an orbit (geocentric)', () => {
  const json = JSON.parse(readFileSync(join(__dirname, '../../assets/lumen6-imaging.scenario.json'), 'utf8'));
  const first = (json.controllers as { id: string }[])[0]!.id;
  const r = runPipeline(json, { controllers: [first], modes: ['follow-plan'] });
  if (!r.ok) throw new Error(r.errors.map((e) => e.message).join('; '));
  const out = r.value;

  it('agree with astronomy-engine GeoVector / GeoMoon (J2000) to 0.01°, and the marker follows the run', () => {
    const run = out.runs[0]!;
    const tEnd = run.trace.t[run.trace.n - 1]!;
    for (const t of [0, tEnd / 2, tEnd]) {
      const now = skyNow(out, run.key, [0, 0, 1], t);
      const time = AstroTime.FromTerrestrialTime((out.scenario.epochUnixMs / 1000 + t + 69.184 - 946_728_000) / 86_400);
      const s = GeoVector(Body.Sun, time, true);
      const m = GeoMoon(time);
      const sunErr = angle(directionOfRaDec(now.sun!.raDeg, now.sun!.decDeg), [s.x, s.y, s.z]) * D;
      const moonErr = angle(directionOfRaDec(now.moon!.raDeg, now.moon!.decDeg), [m.x, m.y, m.z]) * D;
      console.info(`geocentric at t=${t.toFixed(1)} s: Sun ${sunErr.toExponential(2)}°, Moon ${moonErr.toExponential(2)}°`);
      expect(sunErr).toBeLessThan(0.01);
      expect(moonErr).toBeLessThan(0.01);
      // the marker: R(q)·b at the sample at or before t, slerped — at a sample time it is R(q_i)·b
      const i = Math.max(
        0,
        run.trace.t.findIndex((x) => x >= t),
      );
      const at = skyNow(out, run.key, [0, 0, 1], run.trace.t[i]!);
      expect(
        angle(directionOfRaDec(at.axis!.raDeg, at.axis!.decDeg), rotate(run.trace.q.subarray(4 * i, 4 * i + 4), [0, 0, 1])),
      ).toBeLessThan(1e-9);
    }
  });
});

describe('a path over a celestial pole', () => {
  /**
   * 46 points 1° apart on the great circle whose highest point is at δ = ±(90° − miss), RA ra0,
   * two of them 0.5° either side of that point. The circle's pole n is at angle `miss` from the celestial pole, so its
   * closest approach to the pole is `miss` (spherical geometry: the largest |δ| on a great circle is
   * 90° − angle(n, ±z)).
   */
  function passNearPole(ra0: number, sign: number, missDeg: number): number[] {
    const h = directionOfRaDec(ra0, sign * (90 - missDeg));
    const n = directionOfRaDec(ra0 + 180, sign * missDeg); // ⟂ h, in the same meridian plane
    const w = [n[1]! * h[2]! - n[2]! * h[1]!, n[2]! * h[0]! - n[0]! * h[2]!, n[0]! * h[1]! - n[1]! * h[0]!];
    const out: number[] = [];
    for (let k = -22; k <= 23; k++) {
      const th = (k - 0.5) / D; // the top lies half way between two samples
      out.push(...h.map((x, i) => Math.cos(th) * x + Math.sin(th) * w[i]!));
    }
    return out;
  }
  const maxRaStep = (p: { raDeg: number[] }) => Math.max(0, ...p.raDeg.slice(1).map((x, k) => Math.abs(x - p.raDeg[k]!)));

  const overPole = passNearPole;
  for (const [ra0, dec, missDeg] of [
    [30, 1, 0.2],
    [30, -1, 0.05],
    [120, 1, 0.1],
    [300, -1, 0.3],
  ] as const)
    it(`from RA ${ra0}° over the ${dec > 0 ? 'north' : 'south'} pole, ${missDeg}° from it: split at the pole edge, no line across the chart`, () => {
      const pts = overPole(ra0, dec, missDeg);
      // the closest samples are 0.5° either side of the highest point: cos c = cos 0.5° cos miss from
      // the pole (spherical Pythagorean theorem, right angle at the highest point)
      const closest = Math.min(...Array.from({ length: 46 }, (_, k) => angle(pts.slice(3 * k, 3 * k + 3), [0, 0, dec])));
      expect(Math.abs(closest - Math.acos(Math.cos(0.5 / D) * Math.cos(missDeg / D)))).toBeLessThan(1e-9);
      // so the step between them turns 2·atan(tan 0.5° / sin miss) in RA (Napier's rules for the right
      // spherical triangle pole–top–sample), more than 90° for miss < 0.5°
      const ra = (k: number) => Math.atan2(pts[3 * k + 1]!, pts[3 * k]!);
      const turn = Math.abs((((ra(23) - ra(22)) * D + 540) % 360) - 180);
      expect(Math.abs(turn - 2 * Math.atan(Math.tan(0.5 / D) / Math.sin(missDeg / D)) * D)).toBeLessThan(1e-9);
      expect(turn).toBeGreaterThan(90);
      const pieces = skyPieces(pts, false);
      for (const p of pieces) expect(maxRaStep(p)).toBeLessThan(90);
      // one piece ends and the next starts at the pole edge δ = ±90°
      const edges = pieces.flatMap((p) => [p.decDeg[0]!, p.decDeg[p.decDeg.length - 1]!]).filter((d) => Math.abs(Math.abs(d) - 90) < 1e-12);
      expect(edges.length).toBeGreaterThanOrEqual(2);
      expect(edges.every((d) => Math.sign(d) === dec)).toBe(true);
      // every sample point is still drawn
      expect(pieces.reduce((s, p) => s + p.raDeg.length, 0)).toBeGreaterThanOrEqual(46);
    });

  it('a path 5° from the pole in 1° steps is not split at the pole, its RA sweep in steps under 90°', () => {
    for (const ra0 of [30, 120, 250]) {
      const pieces = skyPieces(overPole(ra0, 1, 5), false);
      // at most the RA = 0° cut; no piece leaves at the pole edge
      expect(pieces.length).toBeLessThanOrEqual(2);
      expect(pieces.flatMap((p) => p.decDeg).some((d) => Math.abs(d) === 90)).toBe(false);
      const steps = pieces.map(maxRaStep);
      expect(Math.max(...steps)).toBeLessThan(90);
      expect(Math.max(...steps)).toBeGreaterThan(5); // the sweep near the pole is real, just not one line across
    }
  });

  it('a path away from the poles is not split (1° steps along δ = 60°)', () => {
    const pts = Array.from({ length: 100 }, (_, k) => directionOfRaDec(100 + k, 60)).flat();
    expect(skyPieces(pts, false).length).toBe(1);
  });
});
