/**
 * Steps 2 and 3 of the SO(3) synergy-gap certificate (certificate.ts, methods §5).
 *
 * Step 2, critical points: Γ_q(R) = P with R = P R_a(−θ, u_q) reduces crit(V_q) = Γ_q⁻¹(crit Φ) to
 * the scalar equation θ = kΦ(P R_a(−θ, u_q)) (Berkane & Tayebi, IEEE TAC 62(1):495–501, 2017), for
 * each member q and each P ∈ {I, R_a(π, v_i)}: a bracketing scan on [0, kΦ_max] and Brent's
 * method, then ‖b_q‖ confirmed tiny at each root; δ* is the least gap μ over the undesired points,
 * with the root tolerance propagated through μ.
 * Step 3, completeness: Levenberg–Marquardt on b_q(R) = 0 from many random starts must land only
 * on the points of step 2.
 */
import { decimalsBelow } from '../math/below';
import type { Issue } from '../errors';
import { makeRng } from '../math/prng';
import { qAngleBetween, qFromRotationVector, qMultiply, qRandomUniform } from '../math/rotation';
import { scalarRoots, solve3 } from './numeric';
import type { FamilyWorkspace, WarpFamily } from './potential';
import { evaluateFamily, memberGradient, phiMax, phiQuat } from './potential';

export interface CriticalPointReport {
  /** 1-based member q whose critical point this is. */
  member: number;
  /** Which critical point of Φ it maps to: 0 = identity, i = R_a(π, v_i) (eigenvalue i ascending). */
  target: number;
  /** Warp angle θ* = kΦ(R) at the point. */
  warpAngle: number;
  /** The attitude [x, y, z, w]. */
  attitude: [number, number, number, number];
  /** V_p at the point, all members in order. */
  potentials: number[];
  /** μ(R, q). */
  gap: number;
  /** 1-based argmin member (lowest index among ties): where a jump from here goes. */
  jumpTo: number;
  gradientNorm: number;
}

const TARGET_NAMES = ['I', 'R_a(π, v₁)', 'R_a(π, v₂)', 'R_a(π, v₃)'];

/** Certificate numbers in messages: 6 decimals, or 4 significant digits below 1e-3. */
export function fmt(v: number): string {
  if (!Number.isFinite(v)) return String(v);
  return Math.abs(v) >= 1e-3 || v === 0 ? v.toFixed(6) : v.toExponential(3);
}

/** An upper bound (δ*) printed strictly below its value, so that the printed number is admissible (math/below.ts). */
export function fmtBelow(v: number): string {
  if (!(v > 0) || !Number.isFinite(v)) return fmt(v);
  return decimalsBelow(v, v >= 1e-3 ? 6 : 3 - Math.floor(Math.log10(v)));
}

/** Quaternion of P_target ⊗ (−sin(θ/2) u, cos(θ/2)); P_0 = identity, P_i = (v_i, 0). */
function preimage(out: Float64Array, fam: WarpFamily, target: number, p: number, theta: number): Float64Array {
  const s = -Math.sin(0.5 * theta),
    c = Math.cos(0.5 * theta);
  const U = fam.directions;
  const wx = s * U[3 * p]!,
    wy = s * U[3 * p + 1]!,
    wz = s * U[3 * p + 2]!;
  if (target === 0) {
    out[0] = wx;
    out[1] = wy;
    out[2] = wz;
    out[3] = c;
    return out;
  }
  const E = fam.eigenvectors,
    i = target - 1;
  const px = E[3 * i]!,
    py = E[3 * i + 1]!,
    pz = E[3 * i + 2]!;
  // (p, 0) ⊗ (w, c) = (c p + p × w, −p·w)
  out[0] = c * px + (py * wz - pz * wy);
  out[1] = c * py + (pz * wx - px * wz);
  out[2] = c * pz + (px * wy - py * wx);
  out[3] = -(px * wx + py * wy + pz * wz);
  return out;
}

/** The critical points of step 2 and the gap they certify (δ* = ∞ when there is no undesired point). */
export interface CriticalPointScan {
  points: CriticalPointReport[];
  deltaStar: number;
  deltaTol: number;
}

/**
 * Step 2 for every member: the preimages of the critical points of Φ, each reported; a member with
 * other than one preimage per critical point, or a preimage whose gradient is not ~0, is an issue.
 * `q` and `b` are scratch (4 and 3).
 */
export function findCriticalPoints(
  fam: WarpFamily,
  ws: FamilyWorkspace,
  q: Float64Array,
  b: Float64Array,
  scanPoints: number | undefined,
  base: string,
  issues: Issue[],
): CriticalPointScan {
  const scale = 1 + fam.traceA;
  const n = fam.members;
  const thetaMax = fam.k * phiMax(fam) * (1 + 1e-9) + 1e-12;
  const scanN = Math.max(50, Math.floor(scanPoints ?? 2000));
  const xtol = 1e-15;
  const points: CriticalPointReport[] = [];
  let deltaStar = Infinity;
  let deltaTol = 0;
  for (let p = 0; p < n; p++) {
    for (let target = 0; target <= 3; target++) {
      const f = (t: number) => t - fam.k * phiQuat(fam, preimage(q, fam, target, p, t));
      const roots = scalarRoots(f, target === 0 ? thetaMax / scanN : 0, thetaMax, scanN, xtol);
      if (target === 0) roots.unshift(0);
      const expected = 1;
      if (roots.length !== expected)
        issues.push({
          path: base + 'warpGain',
          rule: 'certificate-critical-points',
          message: `member ${p + 1} has ${roots.length} preimages of ${TARGET_NAMES[target]} (expected ${expected}): the warp is not one-to-one, lower the warp gain k = ${fam.k}`,
        });
      for (const th of roots) {
        const rep = reportAt(fam, ws, q, b, target, p, th);
        points.push(rep);
        if (rep.gradientNorm > 1e-9 * scale)
          issues.push({
            path: base + 'warpGain',
            rule: 'certificate-critical-points',
            message: `member ${p + 1}: gradient at the solved preimage of ${TARGET_NAMES[target]} is ${fmt(rep.gradientNorm)}, not ~0 (numerical failure)`,
          });
        if (target > 0) {
          if (rep.gap < deltaStar) deltaStar = rep.gap;
          deltaTol = Math.max(deltaTol, gapTolerance(fam, ws, q, target, p, th, xtol, scale));
        }
      }
    }
  }
  return { points, deltaStar, deltaTol };
}

/** Propagate the θ tolerance: |dμ/dθ| along the preimage curve times the bracket size, plus rounding. */
function gapTolerance(
  fam: WarpFamily,
  ws: FamilyWorkspace,
  q: Float64Array,
  target: number,
  p: number,
  th: number,
  xtol: number,
  scale: number,
): number {
  const h = 1e-6;
  const mu = (t: number) => {
    evaluateFamily(ws, fam, preimage(q, fam, target, p, t));
    return ws.V[p]! - ws.minValue;
  };
  const slope = Math.abs(mu(th + h) - mu(th - h)) / (2 * h);
  return slope * (xtol + 4 * Number.EPSILON * th) + 8 * Number.EPSILON * scale;
}

/**
 * Step 3: every zero of b_q found from `starts` random attitudes per member must be a point of
 * step 2; each one that is not is an issue (and is remembered, so it is reported once).
 * `b` is scratch (3).
 */
export function completenessSearch(
  fam: WarpFamily,
  ws: FamilyWorkspace,
  b: Float64Array,
  points: readonly CriticalPointReport[],
  starts: number,
  seed: number,
  base: string,
  issues: Issue[],
): { starts: number; converged: number; unmatched: number } {
  const scale = 1 + fam.traceA;
  const n = fam.members;
  const completeness = { starts: starts * n, converged: 0, unmatched: 0 };
  const rng = makeRng(seed, 3);
  const qs = new Float64Array(4),
    dq = new Float64Array(4),
    qt = new Float64Array(4),
    xv = new Float64Array(3);
  for (let p = 0; p < n; p++) {
    const known = points.filter((c) => c.member === p + 1).map((c) => Float64Array.from(c.attitude));
    for (let s = 0; s < starts; s++) {
      qRandomUniform(qs, rng);
      const at = (x: number[]) => {
        xv[0] = x[0]!;
        xv[1] = x[1]!;
        xv[2] = x[2]!;
        qMultiply(qt, qs, qFromRotationVector(dq, xv));
        return qt;
      };
      const res = solve3(
        (x) => {
          evaluateFamily(ws, fam, at(x));
          memberGradient(b, fam, ws, p);
          return [b[0]!, b[1]!, b[2]!];
        },
        [0, 0, 0],
        1e-11 * scale,
        60,
      );
      if (!res.converged) continue;
      completeness.converged++;
      const qc = at(res.x);
      if (!known.some((k) => qAngleBetween(k, qc) < 1e-6)) {
        completeness.unmatched++;
        known.push(Float64Array.from(qc));
        issues.push({
          path: base + 'warpGain',
          rule: 'certificate-critical-points',
          message: `member ${p + 1} has a critical point at [${Array.from(qc, (v) => v.toFixed(6)).join(', ')}] that is not a preimage of a critical point of Φ: the warp is not a diffeomorphism`,
        });
      }
    }
  }
  return completeness;
}

function reportAt(
  fam: WarpFamily,
  ws: FamilyWorkspace,
  q: Float64Array,
  b: Float64Array,
  target: number,
  p: number,
  theta: number,
): CriticalPointReport {
  preimage(q, fam, target, p, theta);
  evaluateFamily(ws, fam, q);
  memberGradient(b, fam, ws, p);
  return {
    member: p + 1,
    target,
    warpAngle: theta,
    attitude: [q[0]!, q[1]!, q[2]!, q[3]!],
    potentials: Array.from(ws.V),
    gap: ws.V[p]! - ws.minValue,
    jumpTo: ws.minIndex + 1,
    gradientNorm: Math.hypot(b[0]!, b[1]!, b[2]!),
  };
}
