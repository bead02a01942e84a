/**
 * Sampled flow-set check for a synergistic family (methods §5 step 5): over uniformly random
 * attitudes (Shoemake, "Uniform random rotations", Graphics Gems III, 1992, via qRandomUniform),
 * on the samples that lie in the flow set of member q (μ(R, q) ≤ δ) and are at least
 * `minAngleRad` from the identity, the smallest ‖b_q‖ seen. Theory (Mayhew & Teel, IEEE TAC
 * 58(11), 2013): with δ below the synergy gap the only critical point of V_q in its flow set is
 * the identity, so this minimum stays bounded away from zero. A sampling check, not a proof.
 *
 * The sample loop allocates nothing (one workspace and a few scratch arrays per call).
 */
import { makeRng } from '../math/prng';
import { qAngle, qRandomUniform } from '../math/rotation';
import type { WarpFamily } from './potential';
import { evaluateFamily, makeFamilyWorkspace, memberGradient } from './potential';

export interface FlowSetMemberStats {
  /** 1-based member index. */
  member: number;
  /** Samples in this member's flow set (and beyond the angle cut). */
  inFlowSet: number;
  /** Smallest ‖b_q‖ over those samples (Infinity when none). */
  minGradientNorm: number;
  /** Attitude [x, y, z, w] where the minimum was seen. */
  worstAttitude: [number, number, number, number];
}

export interface FlowSetCheck {
  samples: number;
  seed: number;
  delta: number;
  minAngleRad: number;
  /** Samples beyond the angle cut. */
  beyondAngle: number;
  perMember: FlowSetMemberStats[];
  /** Smallest over all members. */
  minGradientNorm: number;
}

export interface FlowSetOptions {
  samples?: number;
  seed?: number;
  minAngleRad?: number;
}

export function flowSetGradientCheck(fam: WarpFamily, delta: number, options: FlowSetOptions = {}): FlowSetCheck {
  const samples = Math.max(0, Math.floor(options.samples ?? 1_000_000));
  const seed = options.seed ?? 1;
  const minAngle = options.minAngleRad ?? 0.2;
  const rng = makeRng(seed, 7);
  const ws = makeFamilyWorkspace(fam);
  const n = fam.members;
  const q = new Float64Array(4);
  const b = new Float64Array(3);
  const count = new Float64Array(n);
  const minB = new Float64Array(n).fill(Infinity);
  const worst = new Float64Array(4 * n);
  let beyond = 0;
  for (let s = 0; s < samples; s++) {
    qRandomUniform(q, rng);
    if (qAngle(q) < minAngle) continue;
    beyond++;
    evaluateFamily(ws, fam, q);
    const vmin = ws.minValue;
    for (let p = 0; p < n; p++) {
      if (ws.V[p] - vmin > delta) continue;
      count[p]++;
      memberGradient(b, fam, ws, p);
      const nb = Math.hypot(b[0], b[1], b[2]);
      if (nb < minB[p]) {
        minB[p] = nb;
        worst[4 * p] = q[0];
        worst[4 * p + 1] = q[1];
        worst[4 * p + 2] = q[2];
        worst[4 * p + 3] = q[3];
      }
    }
  }
  const perMember: FlowSetMemberStats[] = [];
  let overall = Infinity;
  for (let p = 0; p < n; p++) {
    perMember.push({
      member: p + 1,
      inFlowSet: count[p],
      minGradientNorm: minB[p],
      worstAttitude: [worst[4 * p], worst[4 * p + 1], worst[4 * p + 2], worst[4 * p + 3]],
    });
    overall = Math.min(overall, minB[p]);
  }
  return { samples, seed, delta, minAngleRad: minAngle, beyondAngle: beyond, perMember, minGradientNorm: overall };
}
