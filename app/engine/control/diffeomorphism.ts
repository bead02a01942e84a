/**
 * Diffeomorphism condition of an angular warp (methods §4.2, §5 step 1): Γ_q(R) = R R_a(kΦ(R), u_q)
 * has Jacobian determinant det Θ_q = 1 + g_qᵀu_q = 1 + 2k u_qᵀψ(AR); when it stays positive on all
 * of SO(3), Γ_q is a local diffeomorphism homotopic to the identity, hence a diffeomorphism
 * (Berkane & Tayebi, IEEE TAC 62(1), 2017). Its minimum is found by dense uniform sampling
 * (Shoemake, Graphics Gems III, 1992) and Nelder–Mead refinement of the lowest samples.
 */
import { makeRng } from '../math/prng';
import { qAngleBetween, qFromRotationVector, qMultiply, qRandomUniform } from '../math/rotation';
import { nelderMead } from './numeric';
import type { WarpFamily } from './potential';
import { warpJacobianDet } from './potential';

/** Per member: min over SO(3) of 1 + 2k u_pᵀψ(AR), sampled then refined. */
export function diffeomorphismMargins(fam: WarpFamily, samples: number, seed: number): number[] {
  const rng = makeRng(seed, 2);
  const n = fam.members;
  const N = Math.max(100, Math.floor(samples));
  const pts = new Float64Array(4 * N);
  const q = new Float64Array(4);
  for (let s = 0; s < N; s++) {
    qRandomUniform(q, rng);
    pts.set(q, 4 * s);
  }
  const out: number[] = [];
  const qs = new Float64Array(4),
    dq = new Float64Array(4),
    qt = new Float64Array(4),
    xv = new Float64Array(3);
  const vals = new Float64Array(N);
  const order = new Uint32Array(N);
  for (let p = 0; p < n; p++) {
    for (let s = 0; s < N; s++) {
      q[0] = pts[4 * s]!;
      q[1] = pts[4 * s + 1]!;
      q[2] = pts[4 * s + 2]!;
      q[3] = pts[4 * s + 3]!;
      vals[s] = warpJacobianDet(fam, q, p);
      order[s] = s;
    }
    order.sort((a, b) => vals[a]! - vals[b]!);
    let best = vals[order[0]!]!;
    // Refine the few lowest, well-separated samples (the minimum may be attained at ± pairs).
    const seeds: Float64Array[] = [];
    for (let r = 0; r < N && seeds.length < 6; r++) {
      const c = order[r]!;
      const cand = pts.subarray(4 * c, 4 * c + 4);
      if (seeds.some((z) => qAngleBetween(z, cand) < 0.3)) continue;
      seeds.push(Float64Array.from(cand));
    }
    for (const z of seeds) {
      qs.set(z);
      const m = nelderMead(
        (x) => {
          xv[0] = x[0]!;
          xv[1] = x[1]!;
          xv[2] = x[2]!;
          qMultiply(qt, qs, qFromRotationVector(dq, xv));
          return warpJacobianDet(fam, qt, p);
        },
        [0, 0, 0],
        0.05,
        1e-13,
        1000,
      );
      best = Math.min(best, m.fx);
    }
    out.push(best);
  }
  return out;
}
