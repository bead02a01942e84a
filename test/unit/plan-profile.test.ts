/**
 * Scalar rest-to-rest profiles against the standard closed forms (rest-to-rest kinematics as in
 * B. Wie, Space Vehicle Dynamics and Control, 2nd ed., AIAA 2008, and Wie, Bailey & Heiberg,
 * "Rapid Multitarget Acquisition and Pointing Control of Agile Spacecraft", JGCD 25(1), 2002 —
 * from memory). Expected values are computed here, in the test, from those formulas.
 */
import { describe, expect, it } from 'vitest';
import { profileAt, profileSwitchTimes, restToRestProfile } from '../../app/engine/plan/profile';

const D = Math.PI / 180;

describe('restToRestProfile closed forms', () => {
  it('bang-coast-bang: 90° about an axis, 1 deg/s², 3 deg/s cap ⇒ 3 s + 27 s + 3 s = 33 s', () => {
    const th = 90 * D,
      a = 1 * D,
      w = 3 * D;
    // Closed form: t_a = w/a, coast = θ/w − w/a, T = θ/w + w/a (θ > θ* = w²/a).
    const tA = w / a,
      tC = th / w - w / a,
      T = th / w + w / a;
    expect(tA).toBeCloseTo(3, 12);
    expect(tC).toBeCloseTo(27, 12);
    const p = restToRestProfile(th, a, w);
    expect(p.kind).toBe('bang-coast-bang');
    expect(Math.abs(p.accelTimeS - tA)).toBeLessThan(1e-9);
    expect(Math.abs(p.coastTimeS - tC)).toBeLessThan(1e-9);
    expect(Math.abs(p.durationS - T)).toBeLessThan(1e-9);
    expect(Math.abs(p.durationS - 33)).toBeLessThan(1e-9);
    expect(p.peakRateRadPerS).toBe(w);
    const sw = profileSwitchTimes(p);
    expect(sw.length).toBe(2);
    expect(Math.abs(sw[0]! - 3)).toBeLessThan(1e-9);
    expect(Math.abs(sw[1]! - 30)).toBeLessThan(1e-9);
  });

  it('bang-bang when θ ≤ θ* = w²/a: T = 2√(θ/a), switch at T/2, peak √(θ a)', () => {
    const a = 1 * D,
      w = 3 * D;
    const th = 8 * D; // θ* = 9°
    const T = 2 * Math.sqrt(th / a);
    const p = restToRestProfile(th, a, w);
    expect(p.kind).toBe('bang-bang');
    expect(Math.abs(p.durationS - T)).toBeLessThan(1e-9);
    expect(Math.abs(p.durationS - 2 * Math.sqrt(8))).toBeLessThan(1e-9);
    expect(Math.abs(p.peakRateRadPerS - Math.sqrt(th * a))).toBeLessThan(1e-12);
    expect(profileSwitchTimes(p)).toEqual([p.accelTimeS]);
    expect(Math.abs(p.accelTimeS - T / 2)).toBeLessThan(1e-12);
    expect(p.coastTimeS).toBe(0);
  });

  it('no rate cap (Infinity) is bang-bang; exactly θ = θ* is bang-bang with zero coast', () => {
    const p = restToRestProfile(2, 0.01, Infinity);
    expect(p.kind).toBe('bang-bang');
    expect(Math.abs(p.durationS - 2 * Math.sqrt(2 / 0.01))).toBeLessThan(1e-9);
    // θ* = w²/a with w = 0.1, a = 0.01 ⇒ θ* = 1
    const q = restToRestProfile(1, 0.01, 0.1);
    expect(q.coastTimeS).toBeLessThanOrEqual(1e-12);
    expect(Math.abs(q.durationS - 20)).toBeLessThan(1e-9);
  });

  it('zero angle is the rest profile', () => {
    const p = restToRestProfile(0, 1, 1);
    expect(p.kind).toBe('rest');
    expect(p.durationS).toBe(0);
    expect(profileSwitchTimes(p)).toEqual([]);
    const out = profileAt(new Float64Array(3), p, 5);
    expect(Array.from(out)).toEqual([0, 0, 0]);
  });
});

describe('profileAt', () => {
  it('matches the angles of the bang-coast-bang fixture (references §1.9, computed)', () => {
    // Angles 0, 1.125, 4.5, 49.5, 85.5, 88.875, 90° and rates 0, 1.5, 3, 3, 3, 1.5, 0 deg/s at these times.
    const p = restToRestProfile(90 * D, 1 * D, 3 * D);
    const times = [0, 1.5, 3, 18, 30, 31.5, 33];
    const angles = [0, 1.125, 4.5, 49.5, 85.5, 88.875, 90];
    const rates = [0, 1.5, 3, 3, 3, 1.5, 0];
    const out = new Float64Array(3);
    times.forEach((t, i) => {
      profileAt(out, p, t);
      expect(Math.abs(out[0]! / D - angles[i]!)).toBeLessThan(1e-9);
      expect(Math.abs(out[1]! / D - rates[i]!)).toBeLessThan(1e-9);
    });
  });

  it('is continuous in φ and ω, right-continuous in α, and consistent by finite differences', () => {
    for (const p of [restToRestProfile(1.3, 0.02, 0.05), restToRestProfile(0.4, 0.02, 1)]) {
      const out = new Float64Array(3),
        lo = new Float64Array(3),
        hi = new Float64Array(3);
      for (const ts of profileSwitchTimes(p)) {
        profileAt(lo, p, ts - 1e-9);
        profileAt(hi, p, ts + 1e-9);
        profileAt(out, p, ts);
        expect(Math.abs(lo[0]! - hi[0]!)).toBeLessThan(1e-9); // ω·2e-9 apart at most
        expect(Math.abs(lo[1]! - hi[1]!)).toBeLessThan(1e-10);
        expect(out[2]).toBe(hi[2]); // right-continuous
      }
      // Central differences away from switches: dφ/dt = ω, dω/dt = α (quadratic φ ⇒ exact up to rounding).
      const h = 1e-4;
      for (let k = 1; k < 50; k++) {
        const t = (p.durationS * k) / 50;
        if (profileSwitchTimes(p).some((s) => Math.abs(s - t) < 2 * h)) continue;
        profileAt(lo, p, t - h);
        profileAt(hi, p, t + h);
        profileAt(out, p, t);
        expect(Math.abs((hi[0]! - lo[0]!) / (2 * h) - out[1]!)).toBeLessThan(1e-9);
        expect(Math.abs((hi[1]! - lo[1]!) / (2 * h) - out[2]!)).toBeLessThan(1e-9);
      }
      // Ends: at rest at 0 and θ; before the start and NaN: at rest at 0.
      profileAt(out, p, p.durationS);
      expect(out[0]).toBe(p.angleRad);
      expect(out[1]).toBe(0);
      profileAt(out, p, -1);
      expect(Array.from(out)).toEqual([0, 0, 0]);
      profileAt(out, p, NaN);
      expect(Array.from(out)).toEqual([0, 0, 0]);
    }
  });
});
