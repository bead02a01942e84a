/**
 * Synergy-gap certificate for an angular-warping family (methods §4–§5).
 *
 * Theory: a family {V_q} is synergistic with gap exceeding δ when μ(R, q) = V_q(R) − min_p V_p(R)
 * > δ at every critical point R ≠ I of every V_q (Mayhew & Teel, "Synergistic hybrid feedback for
 * global rigid-body attitude tracking on SO(3)", IEEE TAC 58(11):2730–2742, 2013). For warped
 * potentials V_q = Φ ∘ Γ_q whose warp Γ_q is a diffeomorphism, crit(V_q) = Γ_q⁻¹(crit Φ)
 * (Berkane & Tayebi, IEEE TAC 62(1):495–501, 2017), and Γ_q(R) = P with R = P R_a(−θ, u_q) reduces
 * to the scalar equation θ = kΦ(P R_a(−θ, u_q)).
 *
 * Procedure (methods §5):
 *  1. diffeomorphism: min over SO(3) of 1 + g_qᵀu_q by dense sampling plus Nelder–Mead refinement;
 *  2. critical points: for each q and each P ∈ {I, R_a(π, v_i)} a 2000-point bracketing scan of
 *     the scalar equation on [0, kΦ_max] and Brent's method, then ‖b_q‖ confirmed tiny;
 *  3. completeness: Levenberg–Marquardt on b_q(R) = 0 from many random starts must land only on
 *     the points of step 2;
 *  4. δ* = min μ over the undesired critical points; δ is admissible when 0 < δ < δ*.
 * Any failure REFUSES the family: a zero gap or a broken diffeomorphism condition is reported as
 * an issue naming the field to change.
 */
import type { Issue } from '../errors';
import { makeRng } from '../math/prng';
import { qAngleBetween, qFromRotationVector, qMultiply, qRandomUniform } from '../math/rotation';
import type { FlowSetCheck } from './flowset';
import { flowSetGradientCheck } from './flowset';
import { diffeomorphismMargins } from './diffeomorphism';
import { scalarRoots, solve3 } from './numeric';
import type { WarpFamily } from './potential';
import { evaluateFamily, makeFamilyWorkspace, memberGradient, phiMax, phiQuat } from './potential';

export interface CertifyParams {
  family: WarpFamily;
  /** The jump threshold δ on the synergy gap the controller would use. */
  delta: number;
}

/** True for an issue the certificate raised as a refusal of the family or of δ (not an input error). */
export function isCertificateRefusal(i: { rule: string }): boolean {
  return i.rule.startsWith('certificate-');
}

export interface CertifyOptions {
  /** Path prefix for issues (the controller spec's path), e.g. `controllers[2]`. */
  path?: string;
  /** Random attitudes for the diffeomorphism minimum (default 20 000). */
  diffeoSamples?: number;
  /** Scan points of the scalar critical-point equation (default 2000). */
  scanPoints?: number;
  /** Random starts per member for the completeness search (default 150). */
  completenessStarts?: number;
  /** Samples for the flow-set gradient check (default 20 000; 0 skips it). */
  flowSetSamples?: number;
  seed?: number;
}

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

export interface CertificateResult {
  /** The family is synergistic (diffeomorphism holds, all critical points found, δ* > 0). */
  certified: boolean;
  /** certified and 0 < δ < δ*. */
  admissible: boolean;
  /** Certified gap δ*; 0 when the family is refused (its critical-point set is then not trusted). */
  deltaStar: number;
  /** Numerical uncertainty of δ* (root-solver tolerance propagated through μ). */
  deltaStarTolerance: number;
  delta: number;
  /** δ* − δ (negative when δ is too large). */
  margin: number;
  /** 0.8 δ* (methods §5 step 6). */
  recommendedDelta: number;
  /** min over q and SO(3) of 1 + g_qᵀu_q, and per member. */
  diffeomorphismMargin: number;
  diffeomorphismMargins: number[];
  /** Every critical point found (identity ones included), member by member. */
  criticalPoints: CriticalPointReport[];
  completeness: { starts: number; converged: number; unmatched: number };
  flowSet: FlowSetCheck | null;
  /** Why the family is refused or δ is not admissible (empty when admissible). */
  issues: Issue[];
  /** Cautions that do not refuse (e.g. δ close to δ*). */
  warnings: Issue[];
  /** One plain sentence for the certificate badge. */
  summary: string;
}

const TARGET_NAMES = ['I', 'R_a(π, v₁)', 'R_a(π, v₂)', 'R_a(π, v₃)'];

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

/**
 * Certificates are pure functions of (family, δ, options) and cost ~0.2–1 s; the app re-plans on
 * every edit, so the last few results are kept (keyed on every number that enters).
 */
const CACHE_SIZE = 16;
const cache = new Map<string, CertificateResult>();

/** Forget cached certificates (benchmarks time the computation, not the cache). */
export function clearCertificateCache(): void {
  cache.clear();
}

function cacheKey(params: CertifyParams, options: CertifyOptions): string {
  const f = params.family;
  return JSON.stringify([Array.from(f.A), f.k, Array.from(f.directions), params.delta, options]);
}

export function certifySynergistic(params: CertifyParams, options: CertifyOptions = {}): CertificateResult {
  const key = cacheKey(params, options);
  const hit = cache.get(key);
  if (hit) return structuredCloneResult(hit);
  const result = certifyUncached(params, options);
  cache.set(key, structuredCloneResult(result));
  if (cache.size > CACHE_SIZE) cache.delete(cache.keys().next().value as string);
  return result;
}

/** Deep copy so callers may not alter the cached value (plain data: arrays, numbers incl. Infinity, strings). */
function structuredCloneResult(r: CertificateResult): CertificateResult {
  return deepCopy(r) as CertificateResult;
}

function deepCopy(v: unknown): unknown {
  if (Array.isArray(v)) return v.map(deepCopy);
  if (v instanceof Float64Array) return Float64Array.from(v);
  if (v !== null && typeof v === 'object') {
    const o: Record<string, unknown> = {};
    for (const [k, x] of Object.entries(v)) o[k] = deepCopy(x);
    return o;
  }
  return v;
}

function certifyUncached(params: CertifyParams, options: CertifyOptions): CertificateResult {
  const fam = params.family;
  const delta = params.delta;
  const base = options.path ? options.path + '.' : '';
  const seed = options.seed ?? 1;
  const issues: Issue[] = [];
  const warnings: Issue[] = [];
  const scale = 1 + fam.traceA;
  const n = fam.members;
  const ws = makeFamilyWorkspace(fam);
  const q = new Float64Array(4);
  const b = new Float64Array(3);

  if (n < 2)
    issues.push({
      path: base + 'warpDirections',
      rule: 'certificate-min-members',
      message: `a synergistic family needs at least 2 members (got ${n}); with one member the gap is zero everywhere`,
    });

  // 1. Diffeomorphism condition.
  const margins = diffeomorphismMargins(fam, options.diffeoSamples ?? 20_000, seed);
  const diffeo = n > 0 ? Math.min(...margins) : 0;
  margins.forEach((m, p) => {
    if (!(m > 0))
      issues.push({
        path: base + 'warpGain',
        rule: 'certificate-diffeomorphism',
        message: `warp of member ${p + 1} is not a diffeomorphism: min over SO(3) of 1 + g·u = ${fmt(m)} ≤ 0; lower the warp gain k = ${fam.k} (methods §4.2)`,
      });
  });

  // 2. Critical points from the scalar equation.
  const thetaMax = fam.k * phiMax(fam) * (1 + 1e-9) + 1e-12;
  const scanN = Math.max(50, Math.floor(options.scanPoints ?? 2000));
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
          // Propagate the θ tolerance: |dμ/dθ| along the preimage curve times the bracket size.
          const h = 1e-6;
          const mu = (t: number) => {
            evaluateFamily(ws, fam, preimage(q, fam, target, p, t));
            return ws.V[p]! - ws.minValue;
          };
          const slope = Math.abs(mu(th + h) - mu(th - h)) / (2 * h);
          deltaTol = Math.max(deltaTol, slope * (xtol + 4 * Number.EPSILON * th) + 8 * Number.EPSILON * scale);
        }
      }
    }
  }
  if (!Number.isFinite(deltaStar)) deltaStar = 0;

  // 3. Completeness: every zero of b_q found by a multi-start search must be a point of step 2.
  const starts = Math.max(0, Math.floor(options.completenessStarts ?? 150));
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

  // 4. Gap and verdict.
  if (!(deltaStar > deltaTol))
    issues.push({
      path: base + 'warpDirections',
      rule: 'certificate-zero-gap',
      message: `the family has no synergy gap (δ* = ${fmt(deltaStar)} at or below the tolerance ${fmt(deltaTol)}): some undesired critical point is also a minimiser of the family; choose other warp directions (e.g. the eigenvectors of A) or another warp gain`,
    });
  const certified = issues.length === 0;
  if (!certified) deltaStar = 0;
  let admissible = false;
  if (certified) {
    if (!Number.isFinite(delta))
      issues.push({ path: base + 'gapThreshold', rule: 'finite', message: `the jump threshold δ must be a finite number (got ${delta})` });
    else if (!(delta > 0))
      issues.push({
        path: base + 'gapThreshold',
        rule: 'positive',
        message: `the jump threshold δ must be greater than zero (got ${delta})`,
      });
    else if (!(delta < deltaStar - deltaTol))
      issues.push({
        path: base + 'gapThreshold',
        rule: 'certificate-gap',
        message: `the jump threshold δ = ${delta} is not below the certified gap δ* = ${fmt(deltaStar)}: an undesired critical point would lie in the flow set; use δ < ${fmt(deltaStar)} (recommended ${fmt(0.8 * deltaStar)})`,
      });
    else {
      admissible = true;
      if (delta > 0.9 * deltaStar)
        warnings.push({
          path: base + 'gapThreshold',
          rule: 'gap-margin',
          message: `the jump threshold δ = ${delta} leaves only ${fmt(deltaStar - delta)} to the gap δ* = ${fmt(deltaStar)}; measurement noise could reach it (recommended ${fmt(0.8 * deltaStar)})`,
        });
    }
  }

  const flowSamples = Math.max(0, Math.floor(options.flowSetSamples ?? 20_000));
  const flowSet =
    certified && flowSamples > 0 && delta > 0 && Number.isFinite(delta)
      ? flowSetGradientCheck(fam, delta, { samples: flowSamples, seed })
      : null;
  // With δ < δ* the flow set holds no critical point but I: a vanishing sampled/refined gradient
  // there would contradict the certificate (a numerical failure worth a loud warning).
  if (flowSet && admissible && !(flowSet.minGradientNorm > 1e-9 * scale))
    warnings.push({
      path: base + 'gapThreshold',
      rule: 'flow-set-gradient',
      message: `sampled flow-set check found ‖b_q‖ = ${fmt(flowSet.minGradientNorm)} away from the identity inside the flow set, which contradicts the certificate; treat it as unreliable`,
    });

  const summary = certified
    ? admissible
      ? `Certified: synergy gap δ* = ${fmt(deltaStar)} (±${deltaTol.toExponential(1)}); δ = ${delta} is admissible with margin ${fmt(deltaStar - delta)} (${Math.round((100 * (deltaStar - delta)) / deltaStar)}% of δ*). Diffeomorphism margin ${fmt(diffeo)}.`
      : `Family certified with synergy gap δ* = ${fmt(deltaStar)}, but δ = ${delta} is NOT admissible (need 0 < δ < δ*; recommended ${fmt(0.8 * deltaStar)}).`
    : `Refused: ${issues
        .map((i) => i.rule)
        .filter((r, k, a) => a.indexOf(r) === k)
        .join(', ')} — ${issues[0]!.message}.`;
  return {
    certified,
    admissible,
    deltaStar,
    deltaStarTolerance: deltaTol,
    delta,
    margin: Number.isFinite(delta) ? deltaStar - delta : 0,
    recommendedDelta: certified ? 0.8 * deltaStar : 0,
    diffeomorphismMargin: diffeo,
    diffeomorphismMargins: margins,
    criticalPoints: points,
    completeness,
    flowSet,
    issues,
    warnings,
    summary,
  };
}

function reportAt(
  fam: WarpFamily,
  ws: ReturnType<typeof makeFamilyWorkspace>,
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

function fmt(v: number): string {
  if (!Number.isFinite(v)) return String(v);
  return Math.abs(v) >= 1e-3 || v === 0 ? v.toFixed(6) : v.toExponential(3);
}
