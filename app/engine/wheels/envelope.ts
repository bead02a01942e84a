/**
 * Torque and momentum envelopes of a wheel array as 3D zonotopes.
 *
 * Markley, Reynolds, Liu & Lebsock, "Maximum torque and momentum envelopes for reaction-wheel
 * arrays", JGCD 33(5), 2010: the set of body torques (momenta) the array can produce is the
 * N-cube of wheel limits mapped through G, Z = {Σ λ_i v_i : |λ_i| ≤ 1} with generators
 * v_i = l_i g_i. (The torque envelope is symmetric, so the reaction sign τ_c = −Gτ_w does not
 * change it.)
 *
 * Construction (vertices, polygon faces, triangulation): zonotope.ts. Queries here: support
 * function, capacity along a direction, containment.
 */
import type { WheelArray } from './array';
import { makeZonotope } from './zonotope';
import type { Zonotope } from './zonotope';
import { hypot3 } from '../math/hypot';

export type { Zonotope } from './zonotope';
export { makeZonotope } from './zonotope';

/** Torque envelope: generators τ_max,i g_i (N·m). */
export function torqueEnvelope(arr: WheelArray): Zonotope {
  return makeZonotope(scaled(arr, arr.maxTorqueNm), arr.n, 'torque');
}

/** Momentum envelope: generators h_max,i g_i (N·m·s), the momentum the wheels can store in body axes. */
export function momentumEnvelope(arr: WheelArray): Zonotope {
  return makeZonotope(scaled(arr, arr.maxMomentumNms), arr.n, 'momentum');
}

function scaled(arr: WheelArray, lim: Float64Array): Float64Array {
  const g = new Float64Array(3 * arr.n);
  for (let i = 0; i < arr.n; i++) for (let c = 0; c < 3; c++) g[3 * i + c] = lim[i]! * arr.axes[3 * i + c]!;
  return g;
}

/** Support function h_Z(d) = max_{x∈Z} dᵀx = Σ_i |v_iᵀ d| (d need not be unit). */
export function envelopeSupport(z: Zonotope, d: ArrayLike<number>): number {
  const g = z.generators;
  const dx = d[0]!,
    dy = d[1]!,
    dz = d[2]!;
  let s = 0;
  for (let i = 0; i < z.n; i++) s += Math.abs(g[3 * i]! * dx + g[3 * i + 1]! * dy + g[3 * i + 2]! * dz);
  return s;
}

/** The facet planes of an envelope: all a capacity query needs (plain data, e.g. from a pipeline output). */
export type EnvelopeFaces = Pick<Zonotope, 'faceNormals' | 'faceOffsets'>;

/**
 * Largest r with r·d/|d| in the envelope: min over facets with nᵀd > 0 of offset / (nᵀd/|d|).
 * 0 for a zero or non-finite d, or a flat zonotope.
 */
export function envelopeCapacity(z: EnvelopeFaces, d: ArrayLike<number>): number {
  const f = envelopeBindingFace(z, d);
  if (f < 0) return 0;
  const dn = hypot3(d[0]!, d[1]!, d[2]!);
  const nd = (z.faceNormals[3 * f]! * d[0]! + z.faceNormals[3 * f + 1]! * d[1]! + z.faceNormals[3 * f + 2]! * d[2]!) / dn;
  return z.faceOffsets[f]! / nd;
}

/** Index of the facet the ray along d leaves through (−1 when undefined, see envelopeCapacity). */
export function envelopeBindingFace(z: EnvelopeFaces, d: ArrayLike<number>): number {
  const dn = hypot3(d[0]!, d[1]!, d[2]!);
  if (!(dn > 0) || !Number.isFinite(dn)) return -1;
  const ux = d[0]! / dn,
    uy = d[1]! / dn,
    uz = d[2]! / dn;
  const N = z.faceOffsets.length;
  let best = Infinity;
  let face = -1;
  for (let f = 0; f < N; f++) {
    const nd = z.faceNormals[3 * f]! * ux + z.faceNormals[3 * f + 1]! * uy + z.faceNormals[3 * f + 2]! * uz;
    if (nd <= 1e-15) continue;
    const r = z.faceOffsets[f]! / nd;
    if (r < best) {
      best = r;
      face = f;
    }
  }
  return face;
}

/** True when p is inside the envelope or within `tol` (absolute) outside every facet plane. */
export function envelopeContains(z: Zonotope, p: ArrayLike<number>, tol = 0): boolean {
  if (z.faceOffsets.length === 0) return false;
  for (let f = 0; f < z.faceOffsets.length; f++) {
    const d = z.faceNormals[3 * f]! * p[0]! + z.faceNormals[3 * f + 1]! * p[1]! + z.faceNormals[3 * f + 2]! * p[2]!;
    if (d > z.faceOffsets[f]! + tol) return false;
  }
  return true;
}
