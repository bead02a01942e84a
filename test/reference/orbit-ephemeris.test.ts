/**
 * Ephemeris interpolation against direct evaluation (the library's own SGP4 → EME2000 chain, whose
 * pieces are checked against published cases in orbit-sgp4 / orbit-frames / orbit-sky), over one
 * day of the invented Lumen-6 orbit (500 km, 97.4°) and of the eccentric verification orbit 00005.
 * Measured maxima are written beside each bound.
 */
import { describe, expect, it } from 'vitest';
import { orbitFromTle } from '../../app/engine/orbit/tle';
import { buildEphemeris, type Ephemeris } from '../../app/engine/orbit/ephemeris';
import {
  createEphemerisSample,
  moonStateAt,
  orbitStateAt,
  sampleEphemeris,
  siteStateAt,
  sunStateAt,
} from '../../app/engine/orbit/ephemerisEval';
import { sgp4Teme, type Sgp4Orbit } from '../../app/engine/orbit/propagate';
import { mulMat3Vec, temeToEme2000Matrix } from '../../app/engine/orbit/frames';
import { moonPositionEme2000, sunPositionEme2000, conicalShadow, createShadowInfo } from '../../app/engine/orbit/sky';
import { makeSite, siteEme2000 } from '../../app/engine/orbit/sites';
import { makeRng } from '../../app/engine/math/prng';
import { RAD_PER_DEG } from '../../app/engine/units';
import { DEMO_TLE_LEO, DEMO_TLE_SSO, VALLADO_00005, editColumns } from './orbit-fixtures';
import { parseUtcIso, utcLabelFromTai } from '../../app/engine/time';

function orbitOf(text: string): Sgp4Orbit {
  const o = orbitFromTle(text);
  if (!o.ok) throw new Error('fixture');
  return o.value;
}

/** Direct EME2000 position at taiS, and its time derivative by a 4th-order stencil (δ = 1 s). */
function direct(outR: Float64Array, outV: Float64Array, orbit: Sgp4Orbit, taiS: number): void {
  const m = new Float64Array(9),
    scratch = new Float64Array(3);
  const at = (dt: number) => {
    const p = new Float64Array(3);
    sgp4Teme(p, scratch, orbit, taiS + dt);
    temeToEme2000Matrix(m, taiS + dt);
    return mulMat3Vec(p, m, p);
  };
  const [pm2, pm1, p0, pp1, pp2] = [-2, -1, 0, 1, 2].map(at) as Float64Array[];
  for (let i = 0; i < 3; i++) {
    outR[i] = p0![i]!;
    outV[i] = (8 * (pp1![i]! - pm1![i]!) - (pp2![i]! - pm2![i]!)) / 12;
  }
}

function dist(a: ArrayLike<number>, b: ArrayLike<number>): number {
  return Math.hypot(a[0]! - b[0]!, a[1]! - b[1]!, a[2]! - b[2]!);
}

function build(orbit: Sgp4Orbit): Ephemeris {
  const e = buildEphemeris(orbit, orbit.epochTaiS, 0, 86400);
  if (!e.ok) throw new Error(JSON.stringify(e.errors));
  return e.value;
}

describe.each([
  // Measured maxima with 30 s nodes: Lumen-6 0.022 m and 5.5e-5 m/s; 00005 0.031 m and 1.0e-4 m/s.
  ['Lumen-6 (invented, 500 km circular)', DEMO_TLE_SSO, 0.05, 2e-4],
  ['verification case 00005 (e = 0.186)', VALLADO_00005, 0.05, 2e-4],
])('ephemeris over one day: %s', (_name, tle, posBoundM, velBoundMps) => {
  const orbit = orbitOf(tle);
  const eph = build(orbit);
  const rng = makeRng(51, 0);
  const times = [...Array.from({ length: 1500 }, () => rng.next() * 86400), ...Array.from({ length: 300 }, (_, k) => (k + 0.5) * 30)];

  it(`position within ${posBoundM} m and velocity within ${velBoundMps} m/s of direct SGP4 (velocity = d r/dt)`, () => {
    const r = new Float64Array(3),
      v = new Float64Array(3),
      rd = new Float64Array(3),
      vd = new Float64Array(3);
    let worstR = 0,
      worstV = 0;
    for (const t of times) {
      orbitStateAt(r, v, null, null, eph, t);
      direct(rd, vd, orbit, orbit.epochTaiS + t);
      worstR = Math.max(worstR, dist(r, rd));
      worstV = Math.max(worstV, dist(v, vd));
    }
    expect(worstR).toBeLessThan(posBoundM);
    expect(worstV).toBeLessThan(velBoundMps);
  });

  it('acceleration and jerk are the derivatives of the interpolated velocity (central differences)', () => {
    const a = new Float64Array(3),
      j = new Float64Array(3),
      vm = new Float64Array(3),
      vp = new Float64Array(3),
      am = new Float64Array(3),
      ap = new Float64Array(3);
    for (const t of times.slice(0, 200)) {
      if (t < 1 || t > 86399) continue;
      orbitStateAt(null, null, a, j, eph, t);
      orbitStateAt(null, vm, am, null, eph, t - 0.01);
      orbitStateAt(null, vp, ap, null, eph, t + 0.01);
      for (let i = 0; i < 3; i++) expect(Math.abs(a[i]! - (vp[i]! - vm[i]!) / 0.02)).toBeLessThan(2e-6);
      // Jerk is piecewise linear with jumps at nodes: compare away from nodes.
      const s = (t / eph.orbitStepS) % 1;
      if (s > 0.01 && s < 0.99) for (let i = 0; i < 3; i++) expect(Math.abs(j[i]! - (ap[i]! - am[i]!) / 0.02)).toBeLessThan(1e-6);
    }
  });

  it('Sun and Moon within 1e-9 and 1e-7 rad of astronomy-engine called directly', () => {
    const s = new Float64Array(3),
      sd = new Float64Array(3),
      m = new Float64Array(3),
      md = new Float64Array(3);
    for (const t of times.slice(0, 300)) {
      sunStateAt(s, null, eph, t);
      sunPositionEme2000(sd, orbit.epochTaiS + t);
      expect(dist(s, sd) / Math.hypot(sd[0]!, sd[1]!, sd[2]!)).toBeLessThan(1e-9);
      moonStateAt(m, null, eph, t);
      moonPositionEme2000(md, orbit.epochTaiS + t);
      expect(dist(m, md) / Math.hypot(md[0]!, md[1]!, md[2]!)).toBeLessThan(1e-7);
    }
  });
});

describe('ephemeris samples and sites', () => {
  const orbit = orbitOf(DEMO_TLE_SSO);
  const eph = build(orbit);

  it('the control sample matches the direct geometry (Sun direction 1e-8 rad, same shadow state)', () => {
    const out = createEphemerisSample();
    const rd = new Float64Array(3),
      vd = new Float64Array(3),
      sun = new Float64Array(3);
    const info = createShadowInfo();
    let eclipses = 0;
    for (let t = 0; t <= 86400; t += 37) {
      expect(sampleEphemeris(out, eph, t)).toBe(true);
      direct(rd, vd, orbit, orbit.epochTaiS + t);
      sunPositionEme2000(sun, orbit.epochTaiS + t);
      const rel = [sun[0]! - rd[0]!, sun[1]! - rd[1]!, sun[2]! - rd[2]!];
      const n = Math.hypot(rel[0]!, rel[1]!, rel[2]!);
      expect(dist(out.sunDir, [rel[0]! / n, rel[1]! / n, rel[2]! / n])).toBeLessThan(1e-8);
      conicalShadow(info, rd, sun);
      if (Math.abs(info.sunFraction - 0.5) < 0.49) continue; // boundary samples: state may differ by the 1 cm interpolation
      expect(out.shadow).toBe(info.state);
      expect(out.eclipse).toBe(info.state === 0 ? 0 : 1);
      eclipses += out.eclipse;
    }
    expect(eclipses).toBeGreaterThan(200); // a 500 km orbit spends ~35 % of the time in shadow
  });

  it('site state: position within 5 cm of frames.ts, velocity and acceleration equal d/dt', () => {
    const site = makeSite({ name: 'Invented ground station', latitudeRad: 47 * RAD_PER_DEG, longitudeRad: 8 * RAD_PER_DEG, heightM: 500 });
    if (!site.ok) throw new Error('site');
    const r = new Float64Array(3),
      v = new Float64Array(3),
      a = new Float64Array(3),
      rd = new Float64Array(3),
      rm = new Float64Array(3),
      rp = new Float64Array(3),
      vm = new Float64Array(3),
      vp = new Float64Array(3);
    for (let t = 100; t < 86000; t += 997) {
      siteStateAt(r, v, a, eph, site.value, t);
      siteEme2000(rd, null, site.value, orbit.epochTaiS + t);
      expect(dist(r, rd)).toBeLessThan(0.05); // single-double Julian dates in gstime resolve ~2 cm
      siteStateAt(rm, vm, null, eph, site.value, t - 1);
      siteStateAt(rp, vp, null, eph, site.value, t + 1);
      for (let i = 0; i < 3; i++) {
        // θ at nodes comes from gstime on one double Julian date (~40 µs resolution), so the node-to-node
        // slope of θ differs from the Earth rate by up to ~1e-10 rad/s: ≤ 1e-3 m/s (measured 3.4e-4).
        expect(Math.abs(v[i]! - (rp[i]! - rm[i]!) / 2)).toBeLessThan(1e-3);
        expect(Math.abs(a[i]! - (vp[i]! - vm[i]!) / 2)).toBeLessThan(1e-7);
      }
    }
  });

  it('is plain data: a structured clone evaluates identically; outside the span gives NaN', () => {
    for (const value of Object.values(eph)) expect(typeof value === 'number' || value instanceof Float64Array).toBe(true);
    const copy = structuredClone(eph);
    const a = createEphemerisSample(),
      b = createEphemerisSample();
    sampleEphemeris(a, eph, 12345.6);
    sampleEphemeris(b, copy, 12345.6);
    expect(b).toEqual(a);
    expect(sampleEphemeris(a, eph, 86400.5)).toBe(false);
    expect(a.r[0]).toBeNaN();
    expect(sampleEphemeris(a, eph, 86400)).toBe(true);
  });

  it('refuses a bad span and reports an SGP4 failure with its time', () => {
    const bad = buildEphemeris(orbit, orbit.epochTaiS, 10, 5, { orbitStepS: 0 });
    expect(!bad.ok && bad.errors.map((e) => e.rule)).toEqual(['span', 'positive']);
    const far = buildEphemeris(orbit, orbit.epochTaiS, 20 * 86400, 20 * 86400 + 600);
    expect(far.ok && far.warnings.map((w) => w.rule)).toEqual(['far-from-epoch']);
  });
});

describe('ephemeris across the 2016-12-31 leap second', () => {
  it('the spacecraft moves continuously through 23:59:60 (elapsed-time SGP4; Bulletin C 52 leap second)', () => {
    const [l1, l2] = DEMO_TLE_LEO.split('\n') as [string, string];
    const o2 = orbitFromTle(`${editColumns(l1, 19, 32, '16366.50000000')}\n${l2}`); // invented, epoch 2016-12-31T12:00Z
    const ep = parseUtcIso('2016-12-31T23:50:00Z');
    if (!o2.ok || !ep.ok) throw new Error('fixture');
    const e = buildEphemeris(o2.value, ep.value.taiS, 0, 1200);
    if (!e.ok) throw new Error('ephemeris');
    expect(utcLabelFromTai(ep.value.taiS + 600.5, 1)).toBe('2016-12-31T23:59:60.5');
    const ra = new Float64Array(3),
      rb = new Float64Array(3),
      vm = new Float64Array(3);
    for (const t of [598, 599.5, 600, 600.5, 601, 602]) {
      orbitStateAt(ra, null, null, null, e.value, t - 0.25);
      orbitStateAt(rb, null, null, null, e.value, t + 0.25);
      orbitStateAt(null, vm, null, null, e.value, t);
      // Half a second of motion: |Δr| = |v|·0.5 s to 1 mm (no one-second jump of ~7.6 km).
      expect(Math.abs(dist(ra, rb) - 0.5 * Math.hypot(vm[0]!, vm[1]!, vm[2]!))).toBeLessThan(1e-3);
    }
  });
});
