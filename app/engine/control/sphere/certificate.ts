/**
 * Synergy-gap certificate for a warped pointing family on S² (potential.ts), computed the way the
 * SO(3) certificate is (../certificate.ts, methods §5).
 *
 * Theory: a family {V_p} is synergistic with gap exceeding δ when μ(y, p) = V_p(y) − min_q V_q(y)
 * > δ at every critical point y ≠ b of every V_p (Mayhew & Teel, synergistic hybrid feedback on
 * the 2-sphere, Automatica 2013 [venue from memory]; Casau et al., n-sphere, Automatica 2019
 * [from memory]). Then the hybrid law with 0 < δ < δ* has no undesired equilibrium in its flow set.
 *
 * Procedure:
 *  1. diffeomorphism: min over S² of det DΓ_p = 1 + k u_pᵀ(b × y) in closed form, 1 − k|u_p × b|,
 *     cross-checked on the sampled directions of step 3;
 *  2. critical points: the scalar equation of critical.ts for b and −b, one root each, ‖∇V_p‖ ≈ 0
 *     confirmed at every root;
 *  3. completeness: sampled ‖∇V_p‖ away from the located points, and zero searches from the
 *     lowest samples and random starts, which must land only on located points;
 *  4. δ* = min μ over the undesired points, with its tolerance; δ admissible when 0 < δ < δ* − tol.
 * Any failure REFUSES the family with issues naming the field to change; a zero gap (for example
 * two members with the same warp direction, which then share their undesired critical point) is
 * refused by name.
 */
import type { Issue } from '../../errors';
import type { SphereCriticalPoint, SphereSamplingCheck } from './critical';
import { locateCriticalPoints, samplingCheck } from './critical';
import type { SphereFamily } from './potential';
import { gapShownDown } from './shownGap';
import { pointingAngle, sphereWarpJacobianDet, sphereWarpMarginClosedForm } from './potential';

export interface SphereCertifyParams {
  family: SphereFamily;
  /** The hysteresis δ the controller would use (units of V, dimensionless). */
  delta: number;
}

export interface SphereCertifyOptions {
  /** Path prefix for issues, e.g. `controllers[3]`. */
  path?: string;
  /** Uniform directions for the gradient-norm sampling (default 100 000). */
  samples?: number;
  /** Scan points of the scalar critical-point equation (default 2000). */
  scanPoints?: number;
  /** Random starts per member for the zero searches (default 40). */
  randomStarts?: number;
  /** Exclusion radius around located points in the sampled minimum, rad (default 0.05). */
  exclusionRadiusRad?: number;
  /** Pointing error below which the flow-set check ignores samples, rad (default 0.05). */
  flowSetMinAngleRad?: number;
  seed?: number;
}

export interface SphereCertificateResult {
  /** Diffeomorphism holds, exactly the expected critical points, δ* > tolerance. */
  certified: boolean;
  /** certified and 0 < δ < δ* − tolerance. */
  admissible: boolean;
  /** Certified gap δ* (0 when refused). */
  deltaStar: number;
  deltaStarTolerance: number;
  delta: number;
  /** δ* − δ. */
  margin: number;
  /** 0.8 δ* (methods §5 step 6). */
  recommendedDelta: number;
  /** min over members and S² of det DΓ_p (closed form), and per member. */
  diffeomorphismMargin: number;
  diffeomorphismMargins: number[];
  /** The smallest sampled det DΓ_p per member (never below the closed form; a cross-check). */
  sampledDiffeomorphismMargins: number[];
  /** Every located critical point, desired and undesired, member by member. */
  criticalPoints: SphereCriticalPoint[];
  completeness: Omit<SphereSamplingCheck, 'flowSet'> | null;
  flowSet: SphereSamplingCheck['flowSet'];
  issues: Issue[];
  warnings: Issue[];
  /** One plain sentence for the certificate badge. */
  summary: string;
}

/** What is wrong with the raw family input (every problem, with its field). */
export function sphereFamilyInputIssues(axis: ArrayLike<number>, k: number, directions: ArrayLike<number>, path = ''): Issue[] {
  const base = path ? path + '.' : '';
  const out: Issue[] = [];
  const finite3 = (v: ArrayLike<number>, o: number) => [0, 1, 2].every((i) => Number.isFinite(v[o + i]));
  if (axis.length !== 3 || !finite3(axis, 0) || !(Math.hypot(axis[0]!, axis[1]!, axis[2]!) > 0))
    out.push({ path: base + 'axis', rule: 'unit-vector', message: 'the pointed body axis must be three finite numbers, not all zero' });
  if (!Number.isFinite(k) || k < 0)
    out.push({ path: base + 'warpGain', rule: 'finite', message: `warp gain k must be a finite number ≥ 0 (got ${k})` });
  if (directions.length % 3 !== 0)
    out.push({
      path: base + 'warpDirections',
      rule: 'triples',
      message: `warp directions come as 3 numbers per member (got ${directions.length} numbers)`,
    });
  for (let p = 0; 3 * p + 2 < directions.length; p++)
    if (!finite3(directions, 3 * p) || !(Math.hypot(directions[3 * p]!, directions[3 * p + 1]!, directions[3 * p + 2]!) > 0))
      out.push({
        path: `${base}warpDirections[${p}]`,
        rule: 'unit-vector',
        message: `warp direction ${p + 1} must be three finite numbers, not all zero`,
      });
  if (Math.floor(directions.length / 3) < 2)
    out.push({
      path: base + 'warpDirections',
      rule: 'min-members',
      message: `a synergistic family needs at least 2 members (got ${Math.floor(directions.length / 3)}); with one member the gap is zero everywhere`,
    });
  return out;
}

const CACHE_SIZE = 16;
const cache = new Map<string, SphereCertificateResult>();

/** Forget cached certificates (benchmarks time the computation, not the cache). */
export function clearSphereCertificateCache(): void {
  cache.clear();
}

/** The cached certificates as plain data, oldest first (see certificateCacheEntries in ../certificate.ts). */
export function sphereCertificateCacheEntries(): [string, SphereCertificateResult][] {
  return [...cache].map(([k, r]) => [k, deepCopy(r)]);
}

/** Add entries made by `sphereCertificateCacheEntries` (of the same program) to this thread's cache. */
export function plantSphereCertificateCache(entries: readonly (readonly [string, SphereCertificateResult])[]): void {
  for (const [k, r] of entries) {
    cache.set(k, deepCopy(r));
    if (cache.size > CACHE_SIZE) cache.delete(cache.keys().next().value as string);
  }
}

/** Certify, or return the cached result for the same parameters (a deep copy either way). */
export function certifySphereFamily(params: SphereCertifyParams, options: SphereCertifyOptions = {}): SphereCertificateResult {
  const f = params.family;
  const key = JSON.stringify([Array.from(f.axis), f.k, Array.from(f.directions), params.delta, options]);
  const hit = cache.get(key);
  if (hit) return deepCopy(hit);
  const result = certifyUncached(params, options);
  cache.set(key, deepCopy(result));
  if (cache.size > CACHE_SIZE) cache.delete(cache.keys().next().value as string);
  return result;
}

function deepCopy<T>(v: T): T {
  if (Array.isArray(v)) return v.map(deepCopy) as T;
  if (v !== null && typeof v === 'object') {
    const o: Record<string, unknown> = {};
    for (const [k, x] of Object.entries(v)) o[k] = deepCopy(x);
    return o as T;
  }
  return v;
}

function certifyUncached(params: SphereCertifyParams, options: SphereCertifyOptions): SphereCertificateResult {
  const fam = params.family;
  const delta = params.delta;
  const base = options.path ? options.path + '.' : '';
  const issues = sphereFamilyInputIssues(fam.axis, fam.k, fam.directions, options.path);
  const warnings: Issue[] = [];
  const n = fam.members;

  // 1. Diffeomorphism, closed form (cross-checked on the samples below).
  const margins = Array.from({ length: n }, (_, p) => sphereWarpMarginClosedForm(fam, p));
  const diffeo = n > 0 ? Math.min(...margins) : 0;
  margins.forEach((m, p) => {
    if (!(m > 0))
      issues.push({
        path: base + 'warpGain',
        rule: 'diffeomorphism',
        message: `warp of member ${p + 1} is not a diffeomorphism of S²: min of 1 + k·uᵀ(b × y) = ${fmt(m)} ≤ 0; use k < 1/|u × b| = ${fmt(fam.k / (1 - m))}`,
      });
  });
  if (issues.length > 0) return refused(params, issues, warnings, margins, [], null);

  // 2. Critical points.
  const loc = locateCriticalPoints(fam, options.scanPoints ?? 2000);
  for (const rc of loc.rootCounts)
    if (rc.roots !== 1)
      issues.push({
        path: base + 'warpGain',
        rule: 'critical-points',
        message: `member ${rc.member} has ${rc.roots} preimages of ${rc.kind === 'desired' ? 'b' : '−b'} (expected 1): the warp is not one-to-one, lower the warp gain k = ${fam.k}`,
      });
  for (const cp of loc.points)
    if (cp.gradientNorm > 1e-10)
      issues.push({
        path: base + 'warpGain',
        rule: 'critical-points',
        message: `member ${cp.member}: gradient at the solved ${cp.kind} critical point is ${fmt(cp.gradientNorm)}, not ~0 (numerical failure)`,
      });

  // 3. Completeness and flow set by sampling.
  const check = samplingCheck(fam, loc.points, {
    samples: Math.max(0, Math.floor(options.samples ?? 100_000)),
    exclusionRadiusRad: options.exclusionRadiusRad ?? 0.05,
    randomStarts: Math.max(0, Math.floor(options.randomStarts ?? 40)),
    seed: options.seed ?? 1,
    delta: Number.isFinite(delta) && delta > 0 ? delta : null,
    flowSetMinAngleRad: options.flowSetMinAngleRad ?? 0.05,
  });
  for (const s of check.strays)
    issues.push({
      path: base + 'warpGain',
      rule: 'critical-points',
      message: `member ${s.member} has a critical point at [${s.direction.map((v) => v.toFixed(6)).join(', ')}] that is not a preimage of ±b: the warp is not a diffeomorphism`,
    });
  const sampledMargins = sampledJacobianMinimum(fam, check.samples, options.seed ?? 1);

  // 4. Gap.
  const undesired = loc.points.filter((c) => c.kind === 'undesired');
  let deltaStar = undesired.length ? Math.min(...undesired.map((c) => c.gap)) : 0;
  const tol = loc.gapTolerance;
  if (!(deltaStar > tol)) issues.push(zeroGapIssue(base, undesired, deltaStar, tol));
  const certified = issues.length === 0;
  const { completeness, flowSet } = splitCheck(check);
  if (!certified) return refused(params, issues, warnings, margins, loc.points, completeness, flowSet, sampledMargins);
  deltaStar = Math.max(0, deltaStar);
  const admissible = checkDelta(base, delta, deltaStar, tol, issues, warnings);
  const summary = admissible
    ? `Certified: pointing synergy gap δ* ≥ ${gapShownDown(deltaStar, tol, 6)} (rounded down; bound ±${tol.toExponential(1)}); δ = ${delta} is admissible with margin ${gapShownDown(deltaStar - delta, tol, 6)} (${Math.floor((100 * (deltaStar - delta)) / deltaStar)}% of δ*). Diffeomorphism margin ${fmt(diffeo)}.`
    : `Family certified with pointing synergy gap δ* ≥ ${gapShownDown(deltaStar, tol, 6)} (rounded down), but δ = ${delta} is NOT admissible (need 0 < δ < δ*; recommended ${gapShownDown(0.8 * deltaStar, 0, 6)}).`;
  return {
    certified,
    admissible,
    deltaStar,
    deltaStarTolerance: tol,
    delta,
    margin: Number.isFinite(delta) ? deltaStar - delta : 0,
    recommendedDelta: 0.8 * deltaStar,
    diffeomorphismMargin: diffeo,
    diffeomorphismMargins: margins,
    sampledDiffeomorphismMargins: sampledMargins,
    criticalPoints: loc.points,
    completeness,
    flowSet,
    issues,
    warnings,
    summary,
  };
}

function splitCheck(check: SphereSamplingCheck) {
  const { flowSet, ...completeness } = check;
  return { completeness, flowSet };
}

function refused(
  params: SphereCertifyParams,
  issues: Issue[],
  warnings: Issue[],
  margins: number[],
  points: SphereCriticalPoint[],
  completeness: SphereCertificateResult['completeness'],
  flowSet: SphereCertificateResult['flowSet'] = null,
  sampledMargins: number[] = [],
): SphereCertificateResult {
  const rules = issues.map((i) => i.rule).filter((r, k, a) => a.indexOf(r) === k);
  return {
    certified: false,
    admissible: false,
    deltaStar: 0,
    deltaStarTolerance: 0,
    delta: params.delta,
    margin: 0,
    recommendedDelta: 0,
    diffeomorphismMargin: margins.length ? Math.min(...margins) : 0,
    diffeomorphismMargins: margins,
    sampledDiffeomorphismMargins: sampledMargins,
    criticalPoints: points,
    completeness,
    flowSet,
    issues,
    warnings,
    summary: `Refused: ${rules.join(', ')} — ${issues[0]!.message}.`,
  };
}

/** The zero-gap refusal, naming members that share their undesired critical point. */
function zeroGapIssue(base: string, undesired: SphereCriticalPoint[], deltaStar: number, tol: number): Issue {
  const shared: string[] = [];
  for (let i = 0; i < undesired.length; i++)
    for (let j = i + 1; j < undesired.length; j++)
      if (pointingAngle(undesired[i]!.direction, undesired[j]!.direction) < 1e-9)
        shared.push(`members ${undesired[i]!.member} and ${undesired[j]!.member} share their undesired critical point`);
  return {
    path: base + 'warpDirections',
    rule: 'zero-gap',
    message:
      `the family has no synergy gap (δ* = ${fmt(deltaStar)} at or below the tolerance ${fmt(tol)})` +
      (shared.length
        ? `: ${shared.join('; ')} (equal warp directions, warps about ±b, or k = 0)`
        : ': some undesired critical point is also a minimiser of the family') +
      '; choose distinct warp directions ⊥ b (e.g. u and −u) and a warp gain 0 < k < 1',
  };
}

/** Admissibility of δ against δ*; pushes issues or a margin warning; returns admissible. */
function checkDelta(base: string, delta: number, deltaStar: number, tol: number, issues: Issue[], warnings: Issue[]): boolean {
  const path = base + 'hysteresis';
  if (!Number.isFinite(delta)) issues.push({ path, rule: 'finite', message: `hysteresis δ must be a finite number (got ${delta})` });
  else if (!(delta > 0)) issues.push({ path, rule: 'synergy-gap', message: `hysteresis δ must be greater than zero (got ${delta})` });
  else if (!(delta < deltaStar - tol))
    issues.push({
      path,
      rule: 'synergy-gap',
      message: `hysteresis δ = ${delta} is not below the certified gap δ* = ${fmt(deltaStar)}: an undesired critical point would lie in the flow set; use δ < ${fmt(deltaStar)} (recommended ${fmt(0.8 * deltaStar)})`,
    });
  else {
    if (delta > 0.9 * deltaStar)
      warnings.push({
        path,
        rule: 'gap-margin',
        message: `hysteresis δ = ${delta} leaves only ${fmt(deltaStar - delta)} to the gap δ* = ${fmt(deltaStar)}; measurement noise could reach it (recommended ${fmt(0.8 * deltaStar)})`,
      });
    return true;
  }
  return false;
}

/** min det DΓ_p over a deterministic Fibonacci lattice of `count` directions (a cross-check of the closed form). */
function sampledJacobianMinimum(fam: SphereFamily, count: number, seed: number): number[] {
  const N = Math.max(1000, count);
  const y = new Float64Array(3);
  const out = new Array<number>(fam.members).fill(Infinity);
  const golden = Math.PI * (3 - Math.sqrt(5));
  const phase = (seed % 997) * 0.001;
  for (let i = 0; i < N; i++) {
    const z = 1 - (2 * (i + 0.5)) / N;
    const r = Math.sqrt(1 - z * z);
    const t = golden * i + phase;
    y[0] = r * Math.cos(t);
    y[1] = r * Math.sin(t);
    y[2] = z;
    for (let p = 0; p < fam.members; p++) out[p] = Math.min(out[p]!, sphereWarpJacobianDet(fam, y, p));
  }
  return out;
}

function fmt(v: number): string {
  if (!Number.isFinite(v)) return String(v);
  return Math.abs(v) >= 1e-3 || v === 0 ? v.toFixed(6) : v.toExponential(3);
}
