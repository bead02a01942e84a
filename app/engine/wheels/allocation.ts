/**
 * Torque allocation: wheel motor torques τ_w that produce a requested body torque τ_c = −G τ_w.
 *
 * - allocateMinNorm: τ_w = −G⁺ τ_c, the minimum 2-norm solution (Markley & Crassidis,
 *   Fundamentals of Spacecraft Attitude Determination and Control, Springer 2014, ch. 7).
 * - allocateMinMax: the solution minimising max_i |τ_w,i| / τ_max,i over the null space
 *   τ_w = −G⁺τ_c + B α (B the orthonormal null basis). It delivers the same body torque with the
 *   most headroom on the busiest wheel; by LP duality its optimum ratio equals |τ_c| divided by the
 *   torque-envelope capacity along τ_c (Markley, Reynolds, Liu & Lebsock, JGCD 33(5), 2010), so a
 *   ratio ≤ 1 exactly when τ_c lies in the envelope.
 *   One-dimensional null space (four wheels, the pyramid): closed form, see minMaxOneDim; the
 *   equal-limit case is the minimum-∞-norm pyramid solution of Yoon, Seo & Choi, Aerospace Science
 *   and Technology 39:109–119, 2014. Larger null spaces: the exact LP of lp.ts.
 *
 * All functions write `out` (length n) and return it. A non-finite request gives zero torques
 * (never NaN out of the engine).
 */
import type { WheelArray } from './array';
import { MAX_WHEELS } from './array';
import { lpMinimize } from './lp';

const xs = new Float64Array(MAX_WHEELS);
const K_MAX = MAX_WHEELS - 3;
const lpA = new Float64Array(2 * MAX_WHEELS * (2 * K_MAX + 1));
const lpB = new Float64Array(2 * MAX_WHEELS);
const lpC = new Float64Array(2 * K_MAX + 1);
const lpZ = new Float64Array(2 * K_MAX + 1);
/** One-null-vector scratch: weight w_i, centre c_i, and 1 when wheel i has a null component. */
const oneW = new Float64Array(MAX_WHEELS);
const oneC = new Float64Array(MAX_WHEELS);
const oneFree = new Uint8Array(MAX_WHEELS);

function finite3(v: ArrayLike<number>): boolean {
  return Number.isFinite(v[0]) && Number.isFinite(v[1]) && Number.isFinite(v[2]);
}

/** τ_w = −G⁺ τ_c (minimum 2-norm). */
export function allocateMinNorm(out: Float64Array, arr: WheelArray, bodyTorque: ArrayLike<number>): Float64Array {
  const n = arr.n;
  if (!finite3(bodyTorque)) return out.fill(0, 0, n);
  const x = bodyTorque[0]!,
    y = bodyTorque[1]!,
    z = bodyTorque[2]!;
  const p = arr.pinv;
  for (let i = 0; i < n; i++) out[i] = -(p[3 * i]! * x + p[3 * i + 1]! * y + p[3 * i + 2]! * z);
  return out;
}

/** Minimum of max_i |τ_w,i|/τ_max,i with −Gτ_w = τ_c (closed form for n = 4, exact LP beyond). */
export function allocateMinMax(out: Float64Array, arr: WheelArray, bodyTorque: ArrayLike<number>): Float64Array {
  allocateMinNorm(out, arr, bodyTorque);
  const k = arr.n - 3;
  if (k === 0) return out;
  if (k === 1) return minMaxOneDim(out, arr);
  return minMaxLp(out, arr);
}

/**
 * Same optimum as allocateMinMax but always through the LP (also for n = 4). Kept public as an
 * independent cross-check of the closed form.
 */
export function allocateMinMaxLp(out: Float64Array, arr: WheelArray, bodyTorque: ArrayLike<number>): Float64Array {
  allocateMinNorm(out, arr, bodyTorque);
  return arr.n > 3 ? minMaxLp(out, arr) : out;
}

/**
 * One null vector ν: minimise f(α) = max_i |x_i + ν_i α| / l_i = max_i w_i |α − c_i| with
 * w_i = |ν_i|/l_i, c_i = −x_i/ν_i (wheels with ν_i = 0 add a constant floor). This is the
 * weighted 1-centre problem on a line: the optimum is set by the pair (i, j) maximising
 * w_i w_j |c_i − c_j| / (w_i + w_j), at α = (w_i c_i + w_j c_j)/(w_i + w_j) (the two active
 * constraints of the two-variable LP in (α, t)). Since f(α_ij) ≥ f* for every pair, taking the
 * candidate α_ij with the smallest actual f is the optimum too, and stays right when pair values
 * tie to rounding. With equal w this is α = (min c + max c)/2,
 * which for ν_i = ±1 (c_i = −ν_i x_i) is the form in the project's methods note:
 * α = −(min_i ν_i x_i + max_i ν_i x_i)/2. Exact; O(n³) as each pair's α is checked (n = 4 here;
 * a check stops as soon as its candidate cannot beat the best so far).
 */
function minMaxOneDim(out: Float64Array, arr: WheelArray): Float64Array {
  const n = arr.n;
  const nu = arr.nullBasis;
  const l = arr.maxTorqueNm;
  // Each wheel's weight and centre once (the pair loop used to form w_j, c_j again for every i).
  let firstFree = -1;
  for (let i = 0; i < n; i++) {
    const free = !(Math.abs(nu[i]!) <= 1e-14);
    oneFree[i] = free ? 1 : 0;
    if (!free) continue;
    if (firstFree < 0) firstFree = i;
    oneW[i] = Math.abs(nu[i]!) / l[i]!;
    oneC[i] = -out[i]! / nu[i]!;
  }
  let bestPeak = Infinity;
  let alpha = 0;
  for (let i = 0; i < n; i++) {
    if (oneFree[i] === 0) continue;
    const wi = oneW[i]!;
    const ci = oneC[i]!;
    for (let j = i + 1; j < n; j++) {
      if (oneFree[j] === 0) continue;
      const wj = oneW[j]!;
      const cj = oneC[j]!;
      const a = (wi * ci + wj * cj) / (wi + wj);
      // Judge each candidate by its actual peak rather than by the pair value: when two pair
      // values tie to rounding (a wheel with a tiny null component), the argmax pair is ill-defined.
      const peak = peakWith(out, nu, l, n, a, bestPeak);
      if (peak < bestPeak) {
        bestPeak = peak;
        alpha = a;
      }
    }
  }
  if (bestPeak === Infinity && firstFree >= 0) alpha = -out[firstFree]! / nu[firstFree]!;
  for (let i = 0; i < n; i++) out[i]! += nu[i]! * alpha;
  return out;
}

/**
 * max_i |x_i + ν_i a| / l_i, or any value ≥ `bound` as soon as the running maximum reaches it
 * (the candidate then cannot beat the best so far; the choice is the same as with the full max).
 */
function peakWith(x: Float64Array, nu: Float64Array, l: Float64Array, n: number, a: number, bound: number): number {
  let p = 0;
  for (let i = 0; i < n; i++) {
    p = Math.max(p, Math.abs(x[i]! + nu[i]! * a) / l[i]!);
    if (p >= bound) return p;
  }
  return p;
}

/**
 * k ≥ 1 null vectors: min t s.t. |x_i + B_i α| ≤ t l_i. Normalised by T0 = max|x_i|/l_i and
 * shifted t = T0(1 − u) so the origin is feasible (no phase 1): maximise u subject to
 * ±(L/l_i) B_i α'' + u ≤ 1 ∓ a_i, a_i = x_i/(l_i T0), α = L T0 α'', L = max l. Free α'' is split
 * into α⁺ − α⁻.
 */
function minMaxLp(out: Float64Array, arr: WheelArray): Float64Array {
  const n = arr.n;
  const k = n - 3;
  const l = arr.maxTorqueNm;
  const B = arr.nullBasis;
  let t0 = 0;
  let lMax = 0;
  for (let i = 0; i < n; i++) {
    t0 = Math.max(t0, Math.abs(out[i]!) / l[i]!);
    lMax = Math.max(lMax, l[i]!);
  }
  if (t0 === 0) return out;
  const nv = 2 * k + 1;
  const m = 2 * n;
  for (let i = 0; i < n; i++) {
    const ai = out[i]! / (l[i]! * t0);
    const rUp = 2 * i * nv;
    const rDn = (2 * i + 1) * nv;
    for (let j = 0; j < k; j++) {
      const bij = (B[j * n + i]! * lMax) / l[i]!;
      lpA[rUp + j] = bij;
      lpA[rUp + k + j] = -bij;
      lpA[rDn + j] = -bij;
      lpA[rDn + k + j] = bij;
    }
    lpA[rUp + 2 * k] = 1;
    lpA[rDn + 2 * k] = 1;
    lpB[2 * i] = Math.max(0, 1 - ai);
    lpB[2 * i + 1] = Math.max(0, 1 + ai);
  }
  lpC.fill(0, 0, nv);
  lpC[2 * k] = -1;
  if (lpMinimize(lpZ, m, nv, lpA, lpB, lpC) !== 'optimal') return out; // min-norm stays valid
  for (let i = 0; i < n; i++) xs[i] = out[i]!;
  for (let j = 0; j < k; j++) {
    const a = (lpZ[j]! - lpZ[k + j]!) * lMax * t0;
    if (a === 0) continue;
    for (let i = 0; i < n; i++) xs[i]! += B[j * n + i]! * a;
  }
  for (let i = 0; i < n; i++) out[i] = xs[i]!;
  return out;
}
