/**
 * Properties of allocation and limiting over random wheel arrays (fast-check, ≥ 1,000 cases each).
 *
 * Invariants checked (sources):
 * - −G τ_w = τ_c for both allocations (definition of allocation, methods note §6 / Markley &
 *   Crassidis 2014 ch. 7);
 * - min-max never worse than min-norm in max_i |τ_i|/l_i (it optimises that over a set containing
 *   the min-norm solution), and its optimum equals |τ_c| / torque capacity along τ_c (LP duality
 *   with the zonotope support function, Markley, Reynolds, Liu & Lebsock, JGCD 33(5), 2010);
 * - limiting keeps the body torque parallel to the request with s ∈ [0, 1], respects every torque
 *   and momentum rule, and is never worse than plain scaling; for four wheels its s equals the
 *   maximum found by an independent 2-variable vertex enumeration written here.
 */
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import {
  allocateMinMax,
  allocateMinMaxLp,
  allocateMinNorm,
  bodyTorqueFromWheelTorque,
  envelopeCapacity,
  limitWheelTorque,
  makeWheelArray,
  peakTorqueRatio,
  torqueEnvelope,
} from '../../app/engine/wheels';
import type { WheelArray } from '../../app/engine/wheels';

const RUNS = 1000;
const unit = fc.double({ min: -1, max: 1, noNaN: true });
const axisArb = fc
  .tuple(unit, unit, unit)
  .filter(([x, y, z]) => Math.hypot(x, y, z) > 0.2)
  .map(([x, y, z]) => {
    const L = Math.hypot(x, y, z);
    return [x / L, y / L, z / L];
  });
const specArb = fc.record({
  axis: axisArb,
  maxTorqueNm: fc.double({ min: 0.2, max: 2, noNaN: true }),
  maxMomentumNms: fc.double({ min: 0.2, max: 2, noNaN: true }),
  rotorInertiaKgm2: fc.constant(1e-4),
});
const arrayArb = (minN: number, maxN: number) =>
  fc
    .array(specArb, { minLength: minN, maxLength: maxN })
    .map((s) => makeWheelArray(s))
    .filter((r) => r.ok && r.value.singularValues[2]! > 0.05 * r.value.singularValues[0]!)
    .map((r) => (r as { value: WheelArray }).value);
const vec3 = fc.tuple(
  fc.double({ min: -3, max: 3, noNaN: true }),
  fc.double({ min: -3, max: 3, noNaN: true }),
  fc.double({ min: -3, max: 3, noNaN: true }),
);

const body = (arr: WheelArray, w: ArrayLike<number>) => bodyTorqueFromWheelTorque(new Float64Array(3), arr, w);

describe('allocation', () => {
  it('both allocations reproduce the body torque; min-max ≤ min-norm; min-max = |τ|/capacity', () => {
    fc.assert(
      fc.property(arrayArb(3, 8), vec3, (arr, tau) => {
        const a = allocateMinNorm(new Float64Array(arr.n), arr, tau);
        const b = allocateMinMax(new Float64Array(arr.n), arr, tau);
        const tn = Math.hypot(...tau);
        const ba = body(arr, a),
          bb = body(arr, b);
        for (let r = 0; r < 3; r++) {
          expect(Math.abs(ba[r]! - tau[r]!)).toBeLessThanOrEqual(1e-12 * (1 + tn));
          expect(Math.abs(bb[r]! - tau[r]!)).toBeLessThanOrEqual(1e-11 * (1 + tn));
        }
        const pa = peakTorqueRatio(arr, a),
          pb = peakTorqueRatio(arr, b);
        expect(pb).toBeLessThanOrEqual(pa * (1 + 1e-12) + 1e-15);
        if (tn > 1e-9) {
          const z = torqueEnvelope(arr);
          const cap = envelopeCapacity(z, tau);
          // Slack: the envelope treats axes parallel within z.tolerance.parallelRad as parallel
          // (zonotope.ts), moving its boundary by up to that × Σ|v_i|.
          let S = 0;
          for (let i = 0; i < arr.n; i++) S += arr.maxTorqueNm[i]!;
          expect(Math.abs(pb - tn / cap)).toBeLessThanOrEqual((1e-9 + (10 * z.tolerance.parallelRad * S) / cap) * pb);
        }
      }),
      { numRuns: RUNS },
    );
  });
  it('four wheels: the closed form equals the LP', () => {
    fc.assert(
      fc.property(arrayArb(4, 4), vec3, (arr, tau) => {
        const a = allocateMinMax(new Float64Array(4), arr, tau);
        const b = allocateMinMaxLp(new Float64Array(4), arr, tau);
        const pa = peakTorqueRatio(arr, a);
        // 1e-9: null vectors with ~1e-11 components (nearly dependent axes) leave both exact
        // methods with an ill-conditioned optimum.
        expect(Math.abs(pa - peakTorqueRatio(arr, b))).toBeLessThanOrEqual(1e-9 * (1 + pa));
      }),
      { numRuns: RUNS },
    );
  });
});

/** Wheel momentum drawn so that many wheels sit at, beyond or near their limits. */
const hFactor = fc.oneof(
  fc.constantFrom(-1.2, -1, 1, 1.2),
  fc.double({ min: -1, max: 1, noNaN: true }),
  fc.double({ min: 0.95, max: 1, noNaN: true }),
);

/**
 * Command components in units of τ_max: exactly 0 or between 1e-6 and 3 in size. (The limiter
 * treats an excess below 1e-10 τ_max as rounding, so denormal-size commands would make the exact
 * optimum of the enumeration below and the limiter's answer differ by design.)
 */
const cmdFactor = fc.oneof(fc.constant(0), fc.double({ min: 1e-6, max: 3, noNaN: true }), fc.double({ min: -3, max: -1e-6, noNaN: true }));

/** The admissible interval of wheel i, written independently of limits.ts from the stated rules. */
function interval(arr: WheelArray, i: number, h: number, dt: number): [number, number] {
  const l = arr.maxTorqueNm[i]!,
    hm = arr.maxMomentumNms[i]!;
  let lo = -l,
    hi = l;
  if (dt === 0) {
    if (h >= hm) hi = 0;
    if (h <= -hm) lo = 0;
  } else {
    hi = Math.min(hi, h > hm ? 0 : (hm - h) / dt);
    lo = Math.max(lo, h < -hm ? 0 : (-hm - h) / dt);
  }
  return [lo, hi];
}

/** Four wheels: max s over (s, α) with lo_i ≤ s c_i + ν_i α ≤ hi_i, 0 ≤ s ≤ 1, by enumerating 2×2 vertices. */
function bruteMaxScale(arr: WheelArray, c: number[], iv: [number, number][]): number {
  // Null-vector entries below 1e-13 of the largest (per unit of torque limit) are rounding noise
  // such as 1e-150 components, which the limiter's LP reads as zero (lp.ts); do the same here.
  const l = arr.maxTorqueNm;
  const big = Math.max(...[0, 1, 2, 3].map((i) => Math.abs(arr.nullBasis[i]!) / l[i]!));
  const nu = [0, 1, 2, 3].map((i) => (Math.abs(arr.nullBasis[i]!) / l[i]! < 1e-13 * big ? 0 : arr.nullBasis[i]));
  const rows: [number, number, number][] = []; // a s + b α ≤ r
  for (let i = 0; i < 4; i++) {
    rows.push([c[i]!, nu[i]!, iv[i]![1]]);
    rows.push([-c[i]!, -nu[i]!, -iv[i]![0]]);
  }
  rows.push([1, 0, 1], [-1, 0, 0]);
  let best = 0;
  for (let p = 0; p < rows.length; p++) {
    for (let q = p + 1; q < rows.length; q++) {
      const [a1, b1, r1] = rows[p]!,
        [a2, b2, r2] = rows[q]!;
      const det = a1 * b2 - a2 * b1;
      if (Math.abs(det) <= 1e-12 * (Math.abs(a1) + Math.abs(b1)) * (Math.abs(a2) + Math.abs(b2))) continue;
      const s = (r1 * b2 - r2 * b1) / det,
        al = (a1 * r2 - a2 * r1) / det;
      // Tolerance relative to each row's own size: commands and intervals can both be tiny.
      if (rows.every(([a, b, r]) => a * s + b * al <= r + 1e-9 * (Math.abs(a * s) + Math.abs(b * al) + Math.abs(r)) + 1e-300)) {
        best = Math.max(best, s);
      }
    }
  }
  return Math.min(1, best);
}

describe('limitWheelTorque', () => {
  const scenario = (minN: number, maxN: number) =>
    arrayArb(minN, maxN).chain((arr) =>
      fc.record({
        arr: fc.constant(arr),
        cmd: fc.array(cmdFactor, { minLength: arr.n, maxLength: arr.n }),
        hf: fc.array(hFactor, { minLength: arr.n, maxLength: arr.n }),
        dt: fc.oneof(fc.constant(0), fc.double({ min: 0.01, max: 2, noNaN: true })),
      }),
    );

  it('delivers s × the requested body torque, s ∈ [0,1], inside every limit, never worse than plain scaling', () => {
    fc.assert(
      fc.property(scenario(3, 7), ({ arr, cmd, hf, dt }) => {
        const n = arr.n;
        const wc = cmd.map((x, i) => x * arr.maxTorqueNm[i]!);
        const h = hf.map((f, i) => f * arr.maxMomentumNms[i]!);
        const out = new Float64Array(n);
        const info = limitWheelTorque(out, arr, wc, h, dt);
        const s = info.scale;
        expect(s).toBeGreaterThanOrEqual(0);
        expect(s).toBeLessThanOrEqual(1);
        const req = body(arr, wc),
          got = body(arr, out);
        const rn = Math.hypot(...req);
        // The limiter sets a wheel within 1e-9 τ_max of its bound onto it (LP rounding, limits.ts).
        const slack = 1e-9 * arr.maxTorqueNm.reduce((a, b) => a + b, 0);
        for (let r = 0; r < 3; r++) expect(Math.abs(got[r]! - s * req[r]!)).toBeLessThanOrEqual(slack + 1e-12 * rn);
        let sScale = 1;
        for (let i = 0; i < n; i++) {
          const [lo, hi] = interval(arr, i, h[i]!, dt);
          const tol = 1e-12 * arr.maxTorqueNm[i]!;
          expect(out[i]).toBeLessThanOrEqual(hi + tol);
          expect(out[i]).toBeGreaterThanOrEqual(lo - tol);
          if (dt > 0 && Math.abs(h[i]!) <= arr.maxMomentumNms[i]!) {
            expect(Math.abs(h[i]! + out[i]! * dt)).toBeLessThanOrEqual(arr.maxMomentumNms[i]! * (1 + 1e-12));
          }
          if (wc[i]! > 0) sScale = Math.min(sScale, hi / wc[i]!);
          if (wc[i]! < 0) sScale = Math.min(sScale, lo / wc[i]!);
        }
        expect(s).toBeGreaterThanOrEqual(Math.max(0, sScale) * (1 - 1e-9) - 1e-12);
        if (info.reason === 'none') expect(Array.from(out)).toEqual(wc);
      }),
      { numRuns: RUNS },
    );
  });

  it('four wheels: s is the largest direction-preserving scale (independent vertex enumeration)', () => {
    fc.assert(
      fc.property(scenario(4, 4), ({ arr, cmd, hf, dt }) => {
        const wc = cmd.map((x, i) => x * arr.maxTorqueNm[i]!);
        const h = hf.map((f, i) => f * arr.maxMomentumNms[i]!);
        const iv = wc.map((_, i) => interval(arr, i, h[i]!, dt));
        const momentumBound = wc.some((c, i) => {
          const [lo, hi] = interval(arr, i, h[i]!, dt);
          const l = arr.maxTorqueNm[i]!;
          return (c > hi && hi < l) || (c < lo && lo > -l);
        });
        const info = limitWheelTorque(new Float64Array(4), arr, wc, h, dt);
        // The null space is used for momentum limits only; pure torque excess is plain scaling (methods §6).
        if (momentumBound) expect(info.scale).toBeCloseTo(bruteMaxScale(arr, wc, iv), 8);
      }),
      { numRuns: RUNS },
    );
  });
});
