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
 * This file holds the API, the cache and step 1; steps 2–3 are in certificateCritical.ts, step 4 in
 * certificateVerdict.ts.
 */
import type { Issue } from '../errors';
import type { CriticalPointReport } from './certificateCritical';
import { completenessSearch, findCriticalPoints, fmt } from './certificateCritical';
import { certificateSummary, flowSetCheck, gapVerdict } from './certificateVerdict';
import type { FlowSetCheck } from './flowset';
import { diffeomorphismMargins } from './diffeomorphism';
import type { WarpFamily } from './potential';
import { makeFamilyWorkspace } from './potential';

export type { CriticalPointReport } from './certificateCritical';

export interface CertifyParams {
  family: WarpFamily;
  /** The jump threshold δ on the synergy gap the controller would use. */
  delta: number;
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

/**
 * The cached certificates as plain data (key, result), oldest first: a study's coordinator
 * computes them once and hands them to its workers, which plant them with
 * `plantCertificateCache` instead of computing the same certificates again.
 */
export function certificateCacheEntries(): [string, CertificateResult][] {
  return [...cache].map(([k, r]) => [k, structuredCloneResult(r)]);
}

/** Add entries made by `certificateCacheEntries` (of the same program) to this thread's cache. */
export function plantCertificateCache(entries: readonly (readonly [string, CertificateResult])[]): void {
  for (const [k, r] of entries) {
    cache.set(k, structuredCloneResult(r));
    if (cache.size > CACHE_SIZE) cache.delete(cache.keys().next().value as string);
  }
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
  const crit = findCriticalPoints(fam, ws, q, b, options.scanPoints, base, issues);
  const deltaTol = crit.deltaTol;

  // 3. Completeness: every zero of b_q found by a multi-start search must be a point of step 2.
  const starts = Math.max(0, Math.floor(options.completenessStarts ?? 150));
  const completeness = completenessSearch(fam, ws, b, crit.points, starts, seed, base, issues);

  // 4. Gap and verdict.
  const verdict = gapVerdict(Number.isFinite(crit.deltaStar) ? crit.deltaStar : 0, deltaTol, delta, base, issues, warnings);
  const { certified, admissible, deltaStar } = verdict;
  const flowSet = flowSetCheck(fam, delta, verdict, options.flowSetSamples, seed, base, warnings);
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
    criticalPoints: crit.points,
    completeness,
    flowSet,
    issues,
    warnings,
    summary: certificateSummary(verdict, deltaTol, delta, diffeo, issues),
  };
}
