/**
 * Random gyrostat mass properties for the fast-path property tests (loopfriction-path,
 * studyfast-paths): n unit wheel axes, rotor inertias and a symmetric body inertia near diagonal,
 * drawn from `rng` in a fixed order. Test data only (common practice, no source).
 */
import type { Rng } from '../../app/engine/math/prng';

export function randomMassProperties(rng: Rng, n: number): { J: Float64Array; axes: Float64Array; js: Float64Array } {
  const axes = new Float64Array(3 * n);
  for (let i = 0; i < n; i++) {
    const x = rng.normal(),
      y = rng.normal(),
      z = rng.normal();
    const r = Math.hypot(x, y, z);
    axes[3 * i] = x / r;
    axes[3 * i + 1] = y / r;
    axes[3 * i + 2] = z / r;
  }
  const js = Float64Array.from({ length: n }, () => 1e-5 * (0.5 + rng.next()));
  const d = [0.05 + 0.2 * rng.next(), 0.05 + 0.2 * rng.next(), 0.05 + 0.2 * rng.next()];
  const o = () => 0.01 * rng.normal();
  const a = o(),
    b = o(),
    c = o();
  const J = new Float64Array([d[0]!, a, b, a, d[1]!, c, b, c, d[2]!]);
  return { J, axes, js };
}
