/**
 * The bisection scan of the history check (app/engine/constraints/bisect.ts) reports exactly what
 * the scan of every sample reports (the series path, which evaluates all of them), on seeded
 * random histories and constraints: random-walk attitudes with pauses and bursts, fixed and moving
 * sources (both interpolations, constant and varying radius), both kinds, windows. Self-consistency
 * of two scans of the project; the bound behind the bisection is checked against Math.asin below.
 */
import { describe, expect, it } from 'vitest';
import { checkAttitudeHistory } from '../../app/engine/constraints/check';
import { rotationPrefix, stepAngleBound } from '../../app/engine/constraints/motionBound';
import type { AttitudeConstraint, DirectionSource } from '../../app/engine/constraints/types';
import { makeRng, type Rng } from '../../app/engine/math/prng';

const D = Math.PI / 180;

function unit(rng: Rng): number[] {
  const v = [rng.normal(), rng.normal(), rng.normal()];
  const n = Math.hypot(v[0]!, v[1]!, v[2]!);
  return v.map((x) => x / n);
}

/** A random walk on the quaternions: rate changes at random, with pauses (rate 0) and bursts. */
function history(rng: Rng, n: number): { timesS: Float64Array; qInertialFromBody: Float64Array } {
  const t = new Float64Array(n),
    q = new Float64Array(4 * n);
  let cur = [0, 0, 0, 1],
    axis = unit(rng),
    rate = 0.01,
    time = 0;
  for (let i = 0; i < n; i++) {
    if (rng.next() < 0.01) {
      axis = unit(rng);
      const r = rng.next();
      rate = r < 0.2 ? 0 : r < 0.9 ? 0.02 * rng.next() : 0.5 * rng.next();
    }
    const dt = 0.05 + 0.1 * rng.next();
    time += dt;
    const h = 0.5 * rate * dt,
      s = Math.sin(h);
    const b = [axis[0]! * s, axis[1]! * s, axis[2]! * s, Math.cos(h)];
    const [ax, ay, az, aw] = cur as [number, number, number, number];
    cur = [
      aw * b[0]! + ax * b[3]! + ay * b[2]! - az * b[1]!,
      aw * b[1]! - ax * b[2]! + ay * b[3]! + az * b[0]!,
      aw * b[2]! + ax * b[1]! - ay * b[0]! + az * b[3]!,
      aw * b[3]! - ax * b[0]! - ay * b[1]! - az * b[2]!,
    ];
    t[i] = time;
    // Non-unit scale on purpose: the check rotates with q/|q|.
    const k = 0.5 + rng.next();
    for (let c = 0; c < 4; c++) q[4 * i + c] = k * cur[c]!;
  }
  return { timesS: t, qInertialFromBody: q };
}

function source(rng: Rng, spanS: number): DirectionSource {
  const r = rng.next();
  if (r < 0.35) return { kind: 'fixed', direction: unit(rng), ...(rng.next() < 0.3 ? { angularRadiusRad: 20 * D * rng.next() } : {}) };
  const m = 2 + Math.floor(40 * rng.next());
  const times: number[] = [],
    dirs: number[] = [],
    radii: number[] = [];
  let d = unit(rng);
  const turn = unit(rng);
  for (let k = 0; k < m; k++) {
    times.push((spanS * k) / (m - 1) - 5);
    dirs.push(...d);
    radii.push(30 * D * rng.next());
    // Step by up to ~40° about a slowly changing axis.
    const a = 0.7 * rng.next();
    const c = Math.cos(a),
      s = Math.sin(a);
    const dot = turn[0]! * d[0]! + turn[1]! * d[1]! + turn[2]! * d[2]!;
    const cr = [turn[1]! * d[2]! - turn[2]! * d[1]!, turn[2]! * d[0]! - turn[0]! * d[2]!, turn[0]! * d[1]! - turn[1]! * d[0]!];
    d = d.map((x, i) => x * c + cr[i]! * s + turn[i]! * dot * (1 - c));
  }
  const radius = rng.next() < 0.3 ? radii : rng.next() < 0.5 ? 10 * D * rng.next() : undefined;
  return {
    kind: 'sampled',
    timesS: times,
    directions: dirs,
    interpolation: rng.next() < 0.5 ? 'linear' : 'great-circle',
    ...(radius !== undefined ? { angularRadiusRad: radius } : {}),
  };
}

describe('bisection scan = scan of every sample', () => {
  it('60 seeded random histories (4,000 samples) against 6 random constraints each', () => {
    let withIntervals = 0;
    for (let seed = 0; seed < 60; seed++) {
      const rng = makeRng(1000 + seed, 5);
      const h = history(rng, 4000);
      const span = h.timesS[h.timesS.length - 1]!;
      const cs: AttitudeConstraint[] = [];
      for (let k = 0; k < 6; k++) {
        const keepIn = rng.next() < 0.4;
        const w = rng.next() < 0.3 ? { startS: span * rng.next() * 0.5, endS: span * (0.5 + 0.6 * rng.next()) } : undefined;
        cs.push({
          name: `c${k}`,
          kind: keepIn ? 'keep-in' : 'keep-out',
          bodyAxis: unit(rng),
          halfAngleRad: (keepIn ? 50 + 80 * rng.next() : 5 + 60 * rng.next()) * D,
          marginRad: 3 * D * rng.next(),
          source: source(rng, span),
          ...(w ? { window: w } : {}),
        });
      }
      const fast = checkAttitudeHistory(h, cs);
      const dense = checkAttitudeHistory(h, cs, { series: true });
      if (!fast.ok) throw new Error(JSON.stringify(fast.errors));
      if (!dense.ok) throw new Error(JSON.stringify(dense.errors));
      fast.value.constraints.forEach((c, k) => {
        const d = dense.value.constraints[k]!;
        expect(c.minMarginRad, `seed ${seed} constraint ${k}`).toBe(d.minMarginRad);
        expect(c.minAtS, `seed ${seed} constraint ${k}`).toBe(d.minAtS);
        expect(c.intervals, `seed ${seed} constraint ${k}`).toEqual(d.intervals);
        expect(c.samplesChecked).toBe(d.samplesChecked);
        expect(c.violatedS).toBe(d.violatedS);
        if (c.intervals.length) withIntervals++;
      });
      expect(fast.value.minimumMarginRad).toBe(dense.value.minimumMarginRad);
    }
    // The cases exercise crossings, not only clear histories.
    expect(withIntervals).toBeGreaterThan(60);
  });
});

describe('the bound behind the bisection', () => {
  it('stepAngleBound(sin(θ/2)) ≥ θ = 2 asin(sin(θ/2)) over [0, π] (Math.asin as the reference)', () => {
    for (let k = 0; k <= 100_000; k++) {
      const th = (Math.PI * k) / 100_000;
      const s = Math.sin(th / 2);
      expect(stepAngleBound(s)).toBeGreaterThanOrEqual(2 * Math.asin(s) - 1e-15);
    }
  });

  it('the running bound is at least the rotation angle between any two samples (triangle inequality)', () => {
    const rng = makeRng(3, 9);
    const h = history(rng, 3000);
    const phi = rotationPrefix(h.qInertialFromBody, 3000);
    const q = h.qInertialFromBody;
    for (let k = 0; k < 2000; k++) {
      const a = Math.floor(3000 * rng.next()),
        b = Math.floor(3000 * rng.next());
      const [i, j] = a < b ? [a, b] : [b, a];
      let d = 0,
        ni = 0,
        nj = 0;
      for (let c = 0; c < 4; c++) {
        d += q[4 * i + c]! * q[4 * j + c]!;
        ni += q[4 * i + c]! ** 2;
        nj += q[4 * j + c]! ** 2;
      }
      const angle = 2 * Math.acos(Math.min(1, Math.abs(d) / Math.sqrt(ni * nj)));
      expect(phi[j]! - phi[i]!).toBeGreaterThanOrEqual(angle - 1e-9);
    }
  });
});
