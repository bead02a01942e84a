/**
 * Critical points of the warped pointing potentials V_p = V ∘ Γ_p on S² (potential.ts), and the
 * sampled completeness check of the certificate (certificate.ts).
 *
 * Location (Berkane & Tayebi's reduction for SO(3), IEEE TAC 62(1), 2017, carried to S² here):
 * when Γ_p is a diffeomorphism, crit V_p = Γ_p⁻¹{b, −b}; the preimage of σb (σ = ±1) is
 * y = R_a(−θ, u_p)(σb) with θ the root of the scalar equation θ = k V(R_a(−θ, u_p)(σb)) on
 * [0, 2k] (V ≤ 2). It is found by an n-point bracketing scan and Brent's method (numeric.ts).
 *
 * Completeness: ‖∇V_p‖ over uniformly sampled directions (normalised 3-D Gaussian: Muller, "A note
 * on a method for generating points uniformly on n-dimensional spheres", CACM 2(4), 1959) away
 * from the located points, and Levenberg–Marquardt searches for zeros of ∇V_p from the lowest
 * samples and from random starts: every zero found must be a located point.
 */
import { makeRng, type Rng } from '../../math/prng';
import { scalarRoots, solve3 } from '../numeric';
import type { SphereFamily, SphereWorkspace } from './potential';
import {
  evaluateSphereFamily,
  makeSphereWorkspace,
  pointingAngle,
  pointingPotential,
  spherePreimage,
  sphereMemberGradient,
} from './potential';

export interface SphereCriticalPoint {
  /** 1-based member p whose critical point this is. */
  member: number;
  /** 'desired': the preimage of b (the minimum, y = b); 'undesired': the preimage of −b. */
  kind: 'desired' | 'undesired';
  /** Warp angle θ* = kV(y) at the point, rad. */
  warpAngle: number;
  /** The direction y (target direction in body axes) at the point. */
  direction: [number, number, number];
  /** Pointing error angle of that direction, rad. */
  pointingAngleRad: number;
  /** V_p at the point for every member, in order. */
  potentials: number[];
  /** μ(y, p) = V_p(y) − min V. */
  gap: number;
  /** 1-based argmin member (lowest index among ties): where a jump from here goes. */
  jumpTo: number;
  gradientNorm: number;
}

export interface Located {
  points: SphereCriticalPoint[];
  /** Members whose scalar equation did not give exactly one root, with the root counts. */
  rootCounts: { member: number; kind: 'desired' | 'undesired'; roots: number }[];
  /** Numerical uncertainty of min μ over the undesired points (θ tolerance through dμ/dθ). */
  gapTolerance: number;
}

const XTOL = 1e-15;

/** Every preimage of ±b under every Γ_p, with the family's values there. */
export function locateCriticalPoints(fam: SphereFamily, scanPoints: number): Located {
  const ws = makeSphereWorkspace(fam);
  const y = new Float64Array(3);
  const thetaMax = 2 * fam.k * (1 + 1e-9) + 1e-12;
  const n = Math.max(50, Math.floor(scanPoints));
  const points: SphereCriticalPoint[] = [];
  const rootCounts: Located['rootCounts'] = [];
  let tol = 0;
  for (let p = 0; p < fam.members; p++) {
    for (const sigma of [1, -1]) {
      const kind = sigma > 0 ? 'desired' : 'undesired';
      const f = (t: number) => t - fam.k * pointingPotential(fam.axis, spherePreimage(y, fam, p, sigma, t));
      let roots: number[];
      if (fam.k === 0) roots = [0];
      else {
        // θ = 0 always solves the desired equation (V(b) = 0); scan after it for any other root.
        roots = scalarRoots(f, sigma > 0 ? thetaMax / n : 0, thetaMax, n, XTOL);
        if (sigma > 0) roots.unshift(0);
      }
      rootCounts.push({ member: p + 1, kind, roots: roots.length });
      for (const th of roots) {
        const cp = reportAt(fam, ws, y, p, sigma, th);
        points.push(cp);
        if (sigma < 0) {
          // dμ/dθ along the preimage curve, times the root bracket, plus rounding of μ itself
          const h = 1e-6;
          const mu = (t: number) => {
            evaluateSphereFamily(ws, fam, spherePreimage(y, fam, p, sigma, t));
            return ws.V[p]! - ws.minValue;
          };
          const slope = Math.abs(mu(th + h) - mu(th - h)) / (2 * h);
          tol = Math.max(tol, slope * (XTOL + 4 * Number.EPSILON * th) + 16 * Number.EPSILON);
        }
      }
    }
  }
  return { points, rootCounts, gapTolerance: tol };
}

function reportAt(fam: SphereFamily, ws: SphereWorkspace, y: Float64Array, p: number, sigma: number, theta: number): SphereCriticalPoint {
  spherePreimage(y, fam, p, sigma, theta);
  evaluateSphereFamily(ws, fam, y);
  const g = sphereMemberGradient(new Float64Array(3), fam, ws, p);
  return {
    member: p + 1,
    kind: sigma > 0 ? 'desired' : 'undesired',
    warpAngle: theta,
    direction: [y[0]!, y[1]!, y[2]!],
    pointingAngleRad: pointingAngle(fam.axis, y),
    potentials: Array.from(ws.V),
    gap: ws.V[p]! - ws.minValue,
    jumpTo: ws.minIndex + 1,
    gradientNorm: Math.hypot(g[0]!, g[1]!, g[2]!),
  };
}

export interface SphereSamplingCheck {
  samples: number;
  /** Samples closer than this (rad) to a located critical point are left out of the minimum. */
  exclusionRadiusRad: number;
  /** Per member: the smallest sampled ‖∇V_p‖ farther than the radius from every located point. */
  minGradientNormAway: number[];
  /** Zero searches run (from the lowest samples and from random starts), converged, and unmatched. */
  starts: number;
  converged: number;
  unmatched: number;
  /** Zeros of ∇V_p that are not located points (direction, member): each one refuses the family. */
  strays: { member: number; direction: [number, number, number] }[];
  /** Flow-set check (methods §5 step 5 on S²): per member, the smallest ‖∇V_p‖ on samples with
   *  μ ≤ δ and a pointing error ≥ flowSetMinAngleRad; Infinity when none fell in the set. */
  flowSet: { delta: number; minAngleRad: number; inFlowSet: number[]; minGradientNorm: number[] } | null;
}

export interface SamplingOptions {
  samples: number;
  exclusionRadiusRad: number;
  randomStarts: number;
  seed: number;
  /** δ for the flow-set check (null skips it). */
  delta: number | null;
  flowSetMinAngleRad: number;
}

/** Uniform unit vector on S² (normalised Gaussian). */
function randomDirection(out: Float64Array, rng: Rng): Float64Array {
  for (;;) {
    const x = rng.normal(),
      y = rng.normal(),
      z = rng.normal();
    const n = Math.hypot(x, y, z);
    if (n > 1e-12) {
      out[0] = x / n;
      out[1] = y / n;
      out[2] = z / n;
      return out;
    }
  }
}

/** Sampled completeness and flow-set check against the located points. */
export function samplingCheck(fam: SphereFamily, located: readonly SphereCriticalPoint[], o: SamplingOptions): SphereSamplingCheck {
  const rng = makeRng(o.seed, 5);
  const ws = makeSphereWorkspace(fam);
  const n = fam.members;
  const y = new Float64Array(3),
    g = new Float64Array(3);
  const known = located.map((c) => ({ member: c.member - 1, y: c.direction }));
  const cosRho = Math.cos(o.exclusionRadiusRad);
  const minAway = new Array<number>(n).fill(Infinity);
  // the few lowest samples per member (well separated) seed the zero searches
  const seeds: { v: number; y: number[] }[][] = Array.from({ length: n }, () => []);
  const flow = o.delta === null ? null : { inFlowSet: new Array<number>(n).fill(0), minGradientNorm: new Array<number>(n).fill(Infinity) };
  const cosFlow = Math.cos(o.flowSetMinAngleRad);
  const b = fam.axis;
  for (let s = 0; s < o.samples; s++) {
    randomDirection(y, rng);
    evaluateSphereFamily(ws, fam, y);
    const farFromB = b[0]! * y[0]! + b[1]! * y[1]! + b[2]! * y[2]! <= cosFlow;
    for (let p = 0; p < n; p++) {
      sphereMemberGradient(g, fam, ws, p);
      const gn = Math.hypot(g[0]!, g[1]!, g[2]!);
      if (flow && farFromB && ws.V[p]! - ws.minValue <= o.delta!) {
        flow.inFlowSet[p]!++;
        if (gn < flow.minGradientNorm[p]!) flow.minGradientNorm[p] = gn;
      }
      if (known.some((k) => k.member === p && k.y[0] * y[0]! + k.y[1] * y[1]! + k.y[2] * y[2]! >= cosRho)) continue;
      if (gn < minAway[p]!) minAway[p] = gn;
      keepLowest(seeds[p]!, gn, y);
    }
  }
  let starts = 0,
    converged = 0;
  const strays: SphereSamplingCheck['strays'] = [];
  for (let p = 0; p < n; p++) {
    const from = seeds[p]!.map((z) => z.y);
    for (let r = 0; r < o.randomStarts; r++) from.push(Array.from(randomDirection(y, rng)));
    for (const y0 of from) {
      starts++;
      const z = findZero(fam, ws, p, y0);
      if (!z) continue;
      converged++;
      const matched = located.some((c) => c.member === p + 1 && angleBetween(c.direction, z) < 1e-6);
      if (!matched && !strays.some((t) => t.member === p + 1 && angleBetween(t.direction, z) < 1e-6))
        strays.push({ member: p + 1, direction: [z[0]!, z[1]!, z[2]!] });
    }
  }
  return {
    samples: o.samples,
    exclusionRadiusRad: o.exclusionRadiusRad,
    minGradientNormAway: minAway,
    starts,
    converged,
    unmatched: strays.length,
    strays,
    flowSet: flow && { delta: o.delta!, minAngleRad: o.flowSetMinAngleRad, ...flow },
  };
}

const SEEDS_PER_MEMBER = 8;

function keepLowest(list: { v: number; y: number[] }[], v: number, y: Float64Array): void {
  // seeds stay at least 0.2 rad apart: a cluster of low samples is one candidate
  const near = list.findIndex((z) => z.y[0]! * y[0]! + z.y[1]! * y[1]! + z.y[2]! * y[2]! > Math.cos(0.2));
  if (near >= 0) {
    if (!(v < list[near]!.v)) return;
    list[near] = { v, y: Array.from(y) };
  } else if (list.length < SEEDS_PER_MEMBER) list.push({ v, y: Array.from(y) });
  else if (v < list[list.length - 1]!.v) list[list.length - 1] = { v, y: Array.from(y) };
  else return;
  list.sort((a, c) => a.v - c.v);
}

/**
 * A zero of ∇V_p near y0 by Levenberg–Marquardt on r(x) = ∇V_p(ŷ) + (|y0 + x| − 1) ŷ,
 * ŷ = (y0 + x)/|y0 + x|: the second term pins the radial direction (∇V_p ⊥ ŷ), so r = 0 exactly at
 * a critical point on the unit sphere. Returns the point, or null when the search does not converge.
 */
function findZero(fam: SphereFamily, ws: SphereWorkspace, p: number, y0: ArrayLike<number>): Float64Array | null {
  const yt = new Float64Array(3),
    g = new Float64Array(3);
  const at = (x: number[]) => {
    const a = y0[0]! + x[0]!,
      b = y0[1]! + x[1]!,
      c = y0[2]! + x[2]!;
    const m = Math.hypot(a, b, c);
    yt[0] = a / m;
    yt[1] = b / m;
    yt[2] = c / m;
    return m;
  };
  const res = solve3(
    (x) => {
      const m = at(x);
      evaluateSphereFamily(ws, fam, yt);
      sphereMemberGradient(g, fam, ws, p);
      return [g[0]! + (m - 1) * yt[0]!, g[1]! + (m - 1) * yt[1]!, g[2]! + (m - 1) * yt[2]!];
    },
    [0, 0, 0],
    1e-12,
    80,
  );
  if (!res.converged) return null;
  at(res.x);
  return Float64Array.from(yt);
}

function angleBetween(a: ArrayLike<number>, b: ArrayLike<number>): number {
  return pointingAngle(a, b);
}
