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
import { qFromRotationVector, qMultiply, qRandomUniform } from '../math/rotation';
import { nelderMead } from './numeric';
import type { FamilyWorkspace, WarpFamily } from './potential';
import { evaluateFamily, makeFamilyWorkspace, memberGradient } from './potential';

export interface FlowSetMemberStats {
  /** 1-based member index. */
  member: number;
  /** Samples in this member's flow set (and beyond the angle cut). */
  inFlowSet: number;
  /** Smallest ‖b_q‖ over those samples (Infinity when none fell in the set). */
  minGradientNorm: number;
  /** Attitude [x, y, z, w] where the minimum was seen. */
  worstAttitude: [number, number, number, number];
  /**
   * The minimum after a local constrained search (Nelder–Mead with an extreme barrier on the flow
   * set and the angle cut) started from the worst sample: an estimate of the true infimum, which
   * sampling alone only bounds from above. null when not refined (or no sample in the set).
   */
  refinedMinGradientNorm: number | null;
}

export interface FlowSetCheck {
  samples: number;
  seed: number;
  delta: number;
  minAngleRad: number;
  /** Samples beyond the angle cut. */
  beyondAngle: number;
  perMember: FlowSetMemberStats[];
  /** Smallest over all members (sampled or refined). */
  minGradientNorm: number;
}

export interface FlowSetOptions {
  samples?: number;
  seed?: number;
  minAngleRad?: number;
  /** Refine each member's minimum by a local constrained search (default true). */
  refine?: boolean;
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
  // angle ≥ a ⇔ |η| ≤ cos(a/2) (angle = 2 acos|η|), cheaper than computing the angle
  const etaMax = Math.cos(0.5 * minAngle);
  for (let s = 0; s < samples; s++) {
    qRandomUniform(q, rng);
    if (Math.abs(q[3]!) > etaMax) continue;
    beyond++;
    evaluateFamily(ws, fam, q);
    const vmin = ws.minValue;
    for (let p = 0; p < n; p++) {
      if (ws.V[p]! - vmin > delta) continue;
      count[p]!++;
      memberGradient(b, fam, ws, p);
      const nb = Math.sqrt(b[0]! * b[0]! + b[1]! * b[1]! + b[2]! * b[2]!);
      if (nb < minB[p]!) {
        minB[p] = nb;
        worst[4 * p] = q[0]!;
        worst[4 * p + 1] = q[1]!;
        worst[4 * p + 2] = q[2]!;
        worst[4 * p + 3] = q[3]!;
      }
    }
  }
  const perMember: FlowSetMemberStats[] = [];
  let overall = Infinity;
  const refine = options.refine ?? true;
  for (let p = 0; p < n; p++) {
    const w0 = worst.subarray(4 * p, 4 * p + 4);
    const refined = refine && count[p]! > 0 ? refineMinimum(fam, ws, p, w0, delta, etaMax) : null;
    perMember.push({
      member: p + 1,
      inFlowSet: count[p]!,
      minGradientNorm: minB[p]!,
      worstAttitude: [w0[0]!, w0[1]!, w0[2]!, w0[3]!],
      refinedMinGradientNorm: refined,
    });
    overall = Math.min(overall, minB[p]!, refined ?? Infinity);
  }
  return { samples, seed, delta, minAngleRad: minAngle, beyondAngle: beyond, perMember, minGradientNorm: overall };
}

/**
 * Local search for min ‖b_p‖ on {μ ≤ δ, |η| ≤ etaMax} from a feasible start: Nelder–Mead on ‖b_p‖
 * plus a steep linear penalty outside the set; the answer is the best FEASIBLE point evaluated.
 */
function refineMinimum(fam: WarpFamily, ws: FamilyWorkspace, p: number, start: Float64Array, delta: number, etaMax: number): number {
  const q0 = Float64Array.from(start),
    dq = new Float64Array(4),
    qt = new Float64Array(4),
    xv = new Float64Array(3),
    b = new Float64Array(3);
  let bestFeasible = Infinity;
  const f = (x: number[]) => {
    xv[0] = x[0]!;
    xv[1] = x[1]!;
    xv[2] = x[2]!;
    qMultiply(qt, q0, qFromRotationVector(dq, xv));
    evaluateFamily(ws, fam, qt);
    memberGradient(b, fam, ws, p);
    const nb = Math.hypot(b[0]!, b[1]!, b[2]!);
    const over = Math.max(0, ws.V[p]! - ws.minValue - delta) + Math.max(0, Math.abs(qt[3]!) - etaMax);
    if (over === 0 && nb < bestFeasible) bestFeasible = nb;
    return nb + 1e3 * over;
  };
  let x0 = [0, 0, 0];
  // Restarts with shrinking simplices refine a minimum that sits on the boundary of the set.
  for (const step of [0.05, 0.01, 0.002]) x0 = nelderMead(f, x0, step, 1e-12, 1500).x;
  return bestFeasible;
}
