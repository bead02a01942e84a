/**
 * The sky view's geometry (app/ui/orbit/skyModel.ts) against outside references: the definition
 * of right ascension and declination and astronomy-engine's EquatorFromVector (an npm reference
 * library), the spherical-geometry definition of a small circle, a rotation matrix written from
 * the quaternion formula (Shuster, "A survey of attitude representations", J. Astronaut. Sci. 41(4),
 * 1993, eq. 161, from memory on the equation number), and the Astronomical Almanac's low-precision
 * Sun formula (section C, "Low precision formulas for the Sun", about 0.01° in 1950–2050).
 */
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { EquatorFromVector, Vector, MakeTime } from 'astronomy-engine';
import { describe, expect, it } from 'vitest';
import { runPipeline } from '../../app/engine/pipeline/run';
import { angleBetween, bodyAxisPath, directionOfRaDec, raDecOf, skyPieces, skyScene, smallCircle } from '../../app/ui/orbit/skyModel';

const D = 180 / Math.PI; // test-side factor (the project's units.ts is what is under test elsewhere)

/** Seeded uniform numbers (mulberry32, common practice, no source) for random directions. */
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
function randomDir(r: () => number): number[] {
  const z = 2 * r() - 1,
    ph = 2 * Math.PI * r(),
    s = Math.sqrt(1 - z * z);
  return [s * Math.cos(ph), s * Math.sin(ph), z];
}

describe('right ascension and declination', () => {
  it('the EME2000 axes: +X (0°, 0°), +Y (90°, 0°), −X (180°, 0°), −Y (270°, 0°), ±Z (δ = ±90°)', () => {
    // Definition of equatorial coordinates (α from +X toward +Y in the equator, δ from the equator).
    const cases: [number[], number, number][] = [
      [[1, 0, 0], 0, 0],
      [[0, 1, 0], 90, 0],
      [[-1, 0, 0], 180, 0],
      [[0, -1, 0], 270, 0],
      [[0, 0, 1], 0, 90],
      [[0, 0, -1], 0, -90],
    ];
    for (const [v, ra, dec] of cases) {
      const r = raDecOf(v);
      expect(r.raRad * D).toBeCloseTo(ra, 12);
      expect(r.decRad * D).toBeCloseTo(dec, 12);
    }
    // RA stays in [0, 360) just below the +X axis
    expect(raDecOf([1, -1e-300, 0]).raRad).toBeLessThan(2 * Math.PI);
  });

  it('agrees with astronomy-engine EquatorFromVector on random directions to 1e-12', () => {
    const r = rng(7);
    const t = MakeTime(new Date(Date.UTC(2030, 0, 1)));
    for (let k = 0; k < 500; k++) {
      const v = randomDir(r).map((x) => x * (0.5 + r()));
      const ours = raDecOf(v);
      const ref = EquatorFromVector(new Vector(v[0]!, v[1]!, v[2]!, t)); // ra in hours, dec in degrees
      const dRa = Math.abs(((ours.raRad * D - ref.ra * 15 + 540) % 360) - 180);
      expect(dRa * Math.cos(ours.decRad)).toBeLessThan(1e-10);
      expect(Math.abs(ours.decRad * D - ref.dec)).toBeLessThan(1e-10);
      const back = directionOfRaDec(ours.raRad * D, ours.decRad * D);
      expect(angleBetween(back, v)).toBeLessThan(1e-12);
    }
  });
});

describe('small circles', () => {
  it('every outline point is at angular distance ρ from the axis to 1e-12, unit length, evenly spaced', () => {
    // Definition: the small circle of radius ρ about a is {p : angle(a, p) = ρ}.
    const r = rng(11);
    for (let k = 0; k < 200; k++) {
      const a = randomDir(r).map((x) => x * 3);
      const rho = r() * Math.PI;
      const n = 36;
      const pts = smallCircle(a, rho, n);
      for (let i = 0; i < n; i++) {
        const p = pts.subarray(3 * i, 3 * i + 3);
        expect(Math.abs(Math.hypot(p[0]!, p[1]!, p[2]!) - 1)).toBeLessThan(1e-14);
        expect(Math.abs(angleBetween(a, p) - rho)).toBeLessThan(1e-12);
      }
      // equal chords between neighbours: 2 sin ρ sin(π/n)
      const chord = 2 * Math.sin(rho) * Math.sin(Math.PI / n);
      for (let i = 0; i < n; i++) {
        const j = (i + 1) % n;
        const d = Math.hypot(pts[3 * i]! - pts[3 * j]!, pts[3 * i + 1]! - pts[3 * j + 1]!, pts[3 * i + 2]! - pts[3 * j + 2]!);
        expect(Math.abs(d - chord)).toBeLessThan(1e-12);
      }
    }
    // axes along the coordinate axes (the basis choice's edge cases)
    for (const a of [
      [1, 0, 0],
      [0, 1, 0],
      [0, 0, 1],
      [0, 0, -1],
    ])
      for (let i = 0; i < 8; i++)
        expect(Math.abs(angleBetween(a, smallCircle(a, 0.3, 8).subarray(3 * i, 3 * i + 3)) - 0.3)).toBeLessThan(1e-12);
  });
});

describe('cutting at the RA = 0°/360° meridian', () => {
  const maxStep = (p: { raDeg: number[] }) => Math.max(0, ...p.raDeg.slice(1).map((x, k) => Math.abs(x - p.raDeg[k]!)));

  it('a 10° circle about (0°, 0°) splits into two pieces ending exactly on the edges, crossing at δ = ±10°', () => {
    const pieces = skyPieces(smallCircle([1, 0, 0], 10 / D, 360), true);
    expect(pieces.length).toBe(2);
    const ends = pieces.flatMap((p) => [p.raDeg[0]!, p.raDeg[p.raDeg.length - 1]!]).sort((a, b) => a - b);
    expect(ends).toEqual([0, 0, 360, 360]);
    for (const p of pieces) {
      expect(maxStep(p)).toBeLessThan(5);
      // the cut points lie on the circle up to the chord's sag, ρ(1 − cos(π/n)) ≈ 1.3e-5°
      for (const e of [0, p.decDeg.length - 1]) expect(Math.abs(Math.abs(p.decDeg[e]!) - 10)).toBeLessThan(2e-5);
    }
    // 360 outline points + 4 cut points + the closing point, one point shared where the start was merged
    expect(pieces.reduce((s, p) => s + p.raDeg.length, 0)).toBe(360 + 4 + 1 - 1);
  });

  it('a circle round the pole is one piece across the whole chart; one away from the meridian stays closed', () => {
    const polar = skyPieces(smallCircle(directionOfRaDec(40, 80), 20 / D, 720), true);
    expect(polar.length).toBe(1);
    const p = polar[0]!;
    expect([p.raDeg[0], p.raDeg[p.raDeg.length - 1]].sort((a, b) => a! - b!)).toEqual([0, 360]);
    expect(maxStep(p)).toBeLessThan(2);
    const away = skyPieces(smallCircle(directionOfRaDec(180, -30), 25 / D, 90), true);
    expect(away.length).toBe(1);
    expect(away[0]!.raDeg[0]).toBeCloseTo(away[0]!.raDeg[away[0]!.raDeg.length - 1]!, 12);
    expect(maxStep(away[0]!)).toBeLessThan(30);
  });

  it('an equator path from 350° to 10° is cut once at δ = 0; crossing RA 180° is not cut', () => {
    const pts = Array.from({ length: 21 }, (_, k) => directionOfRaDec(350 + k, 0)).flat();
    const pieces = skyPieces(pts, false);
    expect(pieces.length).toBe(2);
    expect(pieces[0]!.raDeg[pieces[0]!.raDeg.length - 1]).toBe(360);
    expect(pieces[1]!.raDeg[0]).toBe(0);
    expect(Math.abs(pieces[1]!.decDeg[0]!)).toBeLessThan(1e-12);
    const back = Array.from({ length: 21 }, (_, k) => directionOfRaDec(170 + k, 5)).flat();
    expect(skyPieces(back, false).length).toBe(1);
  });
});

/** R(q) body → inertial from q = [x, y, z, w] (Shuster 1993, written out here independently). */
function rotate(q: ArrayLike<number>, v: number[]): number[] {
  const [x, y, z, w] = [q[0]!, q[1]!, q[2]!, q[3]!];
  const R = [
    [1 - 2 * (y * y + z * z), 2 * (x * y - z * w), 2 * (x * z + y * w)],
    [2 * (x * y + z * w), 1 - 2 * (x * x + z * z), 2 * (y * z - x * w)],
    [2 * (x * z - y * w), 2 * (y * z + x * w), 1 - 2 * (x * x + y * y)],
  ];
  return R.map((row) => row[0]! * v[0]! + row[1]! * v[1]! + row[2]! * v[2]!);
}

describe('the body axis path', () => {
  it('matches R(q)·b at the kept samples and keeps the last sample', () => {
    const r = rng(3);
    const n = 1001;
    const q = new Float64Array(4 * n);
    for (let i = 0; i < n; i++) {
      const a = randomDir(r);
      const th = r() * 2 * Math.PI;
      q.set([a[0]! * Math.sin(th / 2), a[1]! * Math.sin(th / 2), a[2]! * Math.sin(th / 2), Math.cos(th / 2)], 4 * i);
    }
    const b = [0.3, -0.4, 1.2];
    const bn = b.map((x) => x / Math.hypot(...b));
    const path = bodyAxisPath(q, n, b, 100);
    const kept = path.length / 3;
    expect(kept).toBeLessThanOrEqual(102);
    const stride = Math.ceil(n / 100);
    for (let k = 0; k < kept; k++) {
      const i = k === kept - 1 ? n - 1 : k * stride;
      const ref = rotate(q.subarray(4 * i, 4 * i + 4), bn);
      expect(angleBetween(path.subarray(3 * k, 3 * k + 3), ref)).toBeLessThan(1e-12);
    }
  });
});

/**
 * Sun RA/Dec in J2000 axes, degrees: the Astronomical Almanac's low-precision formula gives the
 * ecliptic longitude of date (n = days from J2000.0, TT ≈ UT here); we take out the general
 * precession in longitude, 5029.0966″ per Julian century (IAU 1976, Lieske et al. 1977, from
 * memory), and use the J2000 obliquity 23.439291° (IAU 1976). The motion of the ecliptic itself
 * (≈ 47″/century) is left out: ≲ 0.004° over 30 years.
 */
function almanacSunJ2000(utcMs: number): { ra: number; dec: number } {
  const n = (utcMs - Date.UTC(2000, 0, 1, 12)) / 86400e3;
  const L = 280.46 + 0.9856474 * n;
  const g = (357.528 + 0.9856003 * n) / D;
  const lamOfDate = L + 1.915 * Math.sin(g) + 0.02 * Math.sin(2 * g);
  const lam = (lamOfDate - (5029.0966 / 3600) * (n / 36525)) / D;
  const eps = 23.439291 / D;
  const ra = Math.atan2(Math.cos(eps) * Math.sin(lam), Math.cos(lam)) * D;
  return { ra: (ra + 360) % 360, dec: Math.asin(Math.sin(eps) * Math.sin(lam)) * D };
}

describe('the scene of a run', () => {
  const json = JSON.parse(readFileSync(join(__dirname, '../../assets/kestrel60-momentum.scenario.json'), 'utf8'));
  const first = (json.controllers as { id: string }[])[0]!.id;
  const r = runPipeline(json, { controllers: [first], modes: ['follow-plan'] });
  if (!r.ok) throw new Error(r.errors.map((e) => e.message).join('; '));
  const out = r.value;
  const key = out.runs[0]!.key;

  it('no orbit: the Sun at the epoch agrees with the almanac formula to 0.02°; the Moon is drawn', () => {
    const s = skyScene(out, key, [0, 0, 1]);
    const ref = almanacSunJ2000(out.scenario.epochUnixMs);
    const dRa = Math.abs(((s.sun!.raDeg - ref.ra + 540) % 360) - 180);
    expect(dRa * Math.cos(ref.dec / D)).toBeLessThan(0.02);
    expect(Math.abs(s.sun!.decDeg - ref.dec)).toBeLessThan(0.02);
    expect(s.moon).not.toBeNull();
    expect(s.sunPath.length).toBeGreaterThan(0);
  });

  it('the +Z keep-out cone is drawn as its 30° circle; the trail starts at the initial +Z and ends near target 3', () => {
    const s = skyScene(out, key, [0, 0, 1]);
    expect(s.cones.length).toBe(1);
    const k = out.keepOut[0]!;
    for (const p of s.cones[0]!.pieces)
      for (let i = 0; i < p.raDeg.length; i++) {
        const v = directionOfRaDec(p.raDeg[i]!, p.decDeg[i]!);
        // outline points exact; the cut points sit on the chord, at most sin ρ (1 − cos(π/n)) inside (n = 180)
        expect(Math.abs(angleBetween(v, k.inertialDirection) * D - 30)).toBeLessThan(0.5 * (1 - Math.cos(Math.PI / 180)) * D + 1e-9);
      }
    const z0 = rotate(out.initialQ, [0, 0, 1]);
    const st = directionOfRaDec(s.trailStart!.raDeg, s.trailStart!.decDeg);
    expect(angleBetween(st, z0) * D).toBeLessThan(1e-9);
    const zT = rotate(out.targets.subarray(8, 12), [0, 0, 1]);
    const mk = s.targets[2]!;
    expect(angleBetween(directionOfRaDec(mk.raDeg, mk.decDeg), zT) * D).toBeLessThan(1e-9);
    const en = directionOfRaDec(s.trailEnd!.raDeg, s.trailEnd!.decDeg);
    expect(angleBetween(en, zT) * D).toBeLessThan(0.5);
    // the chosen axis is not the cone's: no cone
    expect(skyScene(out, key, [1, 0, 0]).cones.length).toBe(0);
  });

  it('the geocentric Sun and Moon paths kept by epoch and span: a second scene draws the same, another epoch its own', () => {
    // Without the orbit block the paths are the geocentric ones at the epoch (the cached branch).
    const geo = { ...out, orbit: null };
    const a = skyScene(geo, key, [0, 0, 1]);
    const b = skyScene(geo, key, [1, 0, 0]);
    expect(b.sunPath).toEqual(a.sunPath);
    expect(b.moonPath).toEqual(a.moonPath);
    const ref0 = almanacSunJ2000(out.scenario.epochUnixMs);
    expect(Math.abs(((b.sun!.raDeg - ref0.ra + 540) % 360) - 180) * Math.cos(ref0.dec / D)).toBeLessThan(0.02);
    // A day later (same span): the Sun moves about 1° along the ecliptic (almanac formula above).
    const later = { ...geo, scenario: { ...out.scenario, epochUtc: new Date(out.scenario.epochUnixMs + 86_400_000).toISOString() } };
    const c = skyScene(later, key, [0, 0, 1]);
    const ref = almanacSunJ2000(out.scenario.epochUnixMs + 86_400_000);
    const dRa = Math.abs(((c.sun!.raDeg - ref.ra + 540) % 360) - 180);
    expect(dRa * Math.cos(ref.dec / D)).toBeLessThan(0.02);
    expect(Math.abs(c.sun!.raDeg - a.sun!.raDeg)).toBeGreaterThan(0.5);
  });
});
