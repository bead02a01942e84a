/**
 * The uniform attitude sampler against the Haar measure on SO(3).
 *
 * Source: under the Haar (uniform) measure the rotation angle θ ∈ [0, π] has density (1 − cos θ)/π,
 * so its CDF is F(θ) = (θ − sin θ)/π (R. E. Miles, "On random rotations in R³", Biometrika 52(3/4),
 * 1965; also K. Shoemake, "Uniform random rotations", Graphics Gems III, 1992). Kolmogorov–Smirnov
 * one-sample test on 10⁵ samples; the asymptotic critical value at α = 0.001 is 1.9495/√n (standard
 * KS table, from memory).
 */
import { describe, expect, it } from 'vitest';
import { qAngle, qRandomUniform } from '../../app/engine/math/rotation';
import { makeRng } from '../../app/engine/math/prng';

function ksStatistic(samples: Float64Array, cdf: (x: number) => number): number {
  const s = Float64Array.from(samples).sort();
  const n = s.length;
  let d = 0;
  for (let i = 0; i < n; i++) {
    const f = cdf(s[i]!);
    d = Math.max(d, f - i / n, (i + 1) / n - f);
  }
  return d;
}

describe('uniform attitudes follow the Haar measure', () => {
  const F = (th: number) => (th - Math.sin(th)) / Math.PI;
  const n = 100_000;

  for (const seed of [1, 2026]) {
    it(`KS test of the rotation angle passes (seed ${seed})`, () => {
      const rng = makeRng(seed);
      const q = new Float64Array(4);
      const angles = new Float64Array(n);
      for (let i = 0; i < n; i++) angles[i] = qAngle(qRandomUniform(q, rng));
      const D = ksStatistic(angles, F);
      expect(D).toBeLessThan(1.9495 / Math.sqrt(n));
    });
  }

  it('the test has power: a naive sampler (uniform angle, uniform axis) fails it', () => {
    const rng = makeRng(3);
    const angles = new Float64Array(n);
    for (let i = 0; i < n; i++) angles[i] = Math.PI * rng.next();
    expect(ksStatistic(angles, F)).toBeGreaterThan(1.9495 / Math.sqrt(n));
  });
});
