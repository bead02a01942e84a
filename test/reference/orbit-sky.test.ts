/**
 * Sun, Moon and shadow against outside references:
 * - The Astronomical Almanac's low-precision solar formula (section C, "Sun: low precision
 *   formulas", stated accuracy 0.01° for 1950–2050; formula from memory, matching public copies):
 *   n = JD − 2451545.0, L = 280.460° + 0.9856474° n, g = 357.528° + 0.9856003° n,
 *   λ = L + 1.915° sin g + 0.020° sin 2g, β = 0, R = 1.00014 − 0.01671 cos g − 0.00014 cos 2g AU.
 *   It gives the apparent position referred to the mean ecliptic and equinox of date, so the
 *   library's EME2000 vector is rotated to the true ecliptic of date with astronomy-engine
 *   Rotation_EQJ_ECT and its longitude reduced by the nutation in longitude Δψ (e_tilt).
 * - The Astronomical Almanac's low-precision lunar formula (same section, accuracy about 0.3° in
 *   longitude and 0.2° in latitude; coefficients from memory): checked to 0.5°.
 * - satellite.js shadowFraction (npm reference, conical geometry) with the same radii.
 */
import { describe, expect, it } from 'vitest';
import { Rotation_EQJ_ECT, e_tilt } from 'astronomy-engine';
import { shadowFraction } from 'satellite.js';
import {
  ANNULAR,
  PENUMBRA,
  SUNLIT,
  UMBRA,
  conicalShadow,
  createShadowInfo,
  earthAngularRadiusRad,
  moonDirectionEme2000,
  sunDirectionEme2000,
  sunPositionEme2000,
} from '../../app/engine/orbit/sky';
import { astroTimeFromTai, mat3FromAstronomy, mulMat3Vec } from '../../app/engine/orbit/frames';
import { julianDateUt1FromTai, taiFromUtc } from '../../app/engine/time';
import { makeRng } from '../../app/engine/math/prng';
import { DEG_PER_RAD, RAD_PER_DEG } from '../../app/engine/units';

/** Mean-ecliptic-of-date longitude and latitude (deg) of an EME2000 unit vector. */
function eclipticOfDate(dir: Float64Array, taiS: number): [number, number] {
  const time = astroTimeFromTai(taiS);
  const v = mulMat3Vec(new Float64Array(3), mat3FromAstronomy(new Float64Array(9), Rotation_EQJ_ECT(time)), dir);
  const lonTrue = Math.atan2(v[1]!, v[0]!) * DEG_PER_RAD;
  const lat = Math.asin(v[2]!) * DEG_PER_RAD;
  return [lonTrue - e_tilt(time).dpsi / 3600, lat];
}

function wrap180(d: number): number {
  return ((((d + 180) % 360) + 360) % 360) - 180;
}

const rng = makeRng(41, 0);
// 150 instants over 1972–2050 (the leap-second table starts in 1972).
const dates = Array.from({ length: 150 }, () => taiFromUtc(1972, 1, 1, 0, 0, 0) + rng.next() * 78 * 365.25 * 86400);

describe('Sun', () => {
  it('direction within 0.01° of the Astronomical Almanac low-precision formula on 150 dates', () => {
    const dir = new Float64Array(3);
    let worst = 0,
      worstR = 0;
    for (const t of dates) {
      const dist = sunDirectionEme2000(dir, t);
      const n = julianDateUt1FromTai(t) - 2451545.0;
      const L = 280.46 + 0.9856474 * n;
      const g = (357.528 + 0.9856003 * n) * RAD_PER_DEG;
      const lambda = L + 1.915 * Math.sin(g) + 0.02 * Math.sin(2 * g);
      const [lon, lat] = eclipticOfDate(dir, t);
      const sep = Math.hypot(wrap180(lon - lambda) * Math.cos(lat * RAD_PER_DEG), lat);
      worst = Math.max(worst, sep);
      const R = 1.00014 - 0.01671 * Math.cos(g) - 0.00014 * Math.cos(2 * g);
      worstR = Math.max(worstR, Math.abs(dist / 149597870700 - R)); // AU
    }
    expect(worst).toBeLessThan(0.01);
    // Measured: worst 30″ (0.0084°) over these dates. The distance formula carries 5 decimals; no accuracy is
    // stated for it here: 1e-4 AU (common practice, no source; measured 8e-5 AU).
    expect(worstR).toBeLessThan(1e-4);
  });

  it('the position and direction functions agree', () => {
    const p = new Float64Array(3),
      d = new Float64Array(3);
    const t = dates[0]!;
    const r = sunPositionEme2000(p, t);
    sunDirectionEme2000(d, t);
    for (let i = 0; i < 3; i++) expect(d[i]).toBeCloseTo(p[i]! / r, 15);
  });
});

describe('Moon', () => {
  it('direction within 0.5° of the Astronomical Almanac low-precision lunar formula', () => {
    const dir = new Float64Array(3);
    for (const t of dates) {
      const dist = moonDirectionEme2000(dir, t);
      const T = (julianDateUt1FromTai(t) - 2451545.0) / 36525;
      const s = (a: number, b: number) => Math.sin((a + b * T) * RAD_PER_DEG);
      const c = (a: number, b: number) => Math.cos((a + b * T) * RAD_PER_DEG);
      const lambda =
        218.32 +
        481267.881 * T +
        6.29 * s(135.0, 477198.87) -
        1.27 * s(259.3, -413335.36) +
        0.66 * s(235.7, 890534.22) +
        0.21 * s(269.9, 954397.74) -
        0.19 * s(357.5, 35999.05) -
        0.11 * s(186.5, 966404.03);
      const beta = 5.13 * s(93.3, 483202.02) + 0.28 * s(228.2, 960400.89) - 0.28 * s(318.3, 6003.15) - 0.17 * s(217.6, -407332.21);
      const parallax =
        0.9508 + 0.0518 * c(135.0, 477198.87) + 0.0095 * c(259.3, -413335.36) + 0.0078 * c(235.7, 890534.22) + 0.0028 * c(269.9, 954397.74);
      const [lon, lat] = eclipticOfDate(dir, t);
      expect(Math.abs(wrap180(lon - lambda))).toBeLessThan(0.5);
      expect(Math.abs(lat - beta)).toBeLessThan(0.5);
      // Distance = Earth radius / sin(parallax), within 1 %.
      expect(Math.abs(dist / (6378140 / Math.sin(parallax * RAD_PER_DEG)) - 1)).toBeLessThan(0.01);
    }
  });
});

describe('conical shadow', () => {
  it('sunlit fraction equals satellite.js shadowFraction (1 − fraction) with the same radii', () => {
    const info = createShadowInfo();
    const sun = new Float64Array(3);
    const rng2 = makeRng(42, 0);
    let penumbra = 0;
    for (let k = 0; k < 4000; k++) {
      const t = dates[k % dates.length]!;
      sunPositionEme2000(sun, t);
      // Points near the shadow boundary: antisolar direction plus a random offset, 6700–8000 km.
      const rn = 6.7e6 + rng2.next() * 1.3e6;
      const s = Math.hypot(sun[0]!, sun[1]!, sun[2]!);
      const off = 0.9 + rng2.next() * 0.25;
      const axis = [-sun[0]! / s, -sun[1]! / s, -sun[2]! / s];
      const perp = [axis[1]!, -axis[0]!, 0];
      const pn = Math.hypot(perp[0]!, perp[1]!, perp[2]!);
      const ang = Math.asin(Math.min(1, (6378135 / rn) * off));
      const r = axis.map((a, i) => rn * (Math.cos(ang) * a + (Math.sin(ang) * perp[i]!) / pn));
      conicalShadow(info, r, sun, 6378135, 695700e3); // satellite.js radii: WGS-72 Earth, IAU 2015 Sun
      // satellite.js measures the Sun from the Earth's centre; the library from the spacecraft
      // (parallax ≈ |r|/|s| ≈ 5e-5 rad, ~1 % of the penumbra). Give satellite.js the
      // spacecraft-relative Sun vector s − r so both see the same geometry.
      const au = 149597870.69098932 * 1000; // satellite.js KM_PER_AU
      const rel = { x: (sun[0]! - r[0]!) / au, y: (sun[1]! - r[1]!) / au, z: (sun[2]! - r[2]!) / au };
      const ref = shadowFraction(rel, { x: r[0]! / 1000, y: r[1]! / 1000, z: r[2]! / 1000 });
      expect(Math.abs(info.sunFraction - (1 - ref))).toBeLessThan(1e-7); // two algebraic forms of the lens area
      if (info.state === PENUMBRA) penumbra++;
    }
    expect(penumbra).toBeGreaterThan(100);
  });

  it('states: antisolar LEO point in umbra, subsolar sunlit, far behind a small disc annular; Earth angular radius', () => {
    const info = createShadowInfo();
    const sun = [1.496e11, 0, 0];
    expect(conicalShadow(info, [-7e6, 0, 0], sun).state).toBe(UMBRA);
    expect(info.sunFraction).toBe(0);
    expect(conicalShadow(info, [7e6, 0, 0], sun).state).toBe(SUNLIT);
    expect(conicalShadow(info, [-1e10, 0, 0], sun).state).toBe(ANNULAR);
    // Annular fraction: 1 − (b/a)² for discs of angular radii a (Sun) and b (Earth).
    expect(info.sunFraction).toBeCloseTo(1 - (info.earthAngularRadiusRad / info.sunAngularRadiusRad) ** 2, 12);
    // Earth seen from r = R / sin 30° spans 30°.
    expect(earthAngularRadiusRad([6378137 * 2, 0, 0]) * DEG_PER_RAD).toBeCloseTo(30, 12);
  });
});
