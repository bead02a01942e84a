/**
 * A small dense linear-program solver for the wheel allocation and limiting problems
 * (a few to a few dozen rows).
 *
 *   minimise cᵀz  subject to  A z ≤ b,  z ≥ 0   (b of either sign)
 *
 * Two-phase tableau simplex (Dantzig; as in Chvátal, Linear Programming, Freeman 1983, ch. 2–3
 * and 8): Bland's smallest-index entering rule with Harris' stable ratio test, and, should that
 * ever hit the iteration limit, a re-solve with Bland's rule for the leaving variable too, which
 * rules out cycling on the degenerate vertices that symmetric wheel layouts produce. Phase 1
 * runs only when some b_i < 0. The result is an exact vertex optimum up to floating-point
 * rounding, not an iterative approximation.
 *
 * The tableau lives in a module-level buffer that grows to the largest problem seen and is then
 * reused, so repeated solves (one per control step) do not allocate. Not re-entrant.
 * Entries below 1e-13 × their column's largest entry are treated as zero (rounding noise), and
 * rows are then equilibrated (divided by their largest coefficient); tolerances below are
 * absolute on the equilibrated rows, so columns should still be of comparable scale.
 */

export type LpStatus = 'optimal' | 'infeasible' | 'unbounded' | 'iteration-limit';

const EPS_PIVOT = 1e-11;
const EPS_COST = 1e-11;
const EPS_FEAS = 1e-9;
const HARRIS_TOL = 1e-12;
const PIVOT_REL = 1e-9;

const COLUMN_NOISE = 1e-13;

let tab = new Float64Array(0);
let colMax = new Float64Array(0);
let basis = new Int32Array(0);

/**
 * Solve the LP; on 'optimal' `z` (length nv) holds a minimiser. `a` is m×nv row-major.
 * On any other status `z` is filled with zeros.
 */
export function lpMinimize(
  z: Float64Array,
  m: number,
  nv: number,
  a: ArrayLike<number>,
  b: ArrayLike<number>,
  c: ArrayLike<number>,
): LpStatus {
  const status = solveOnce(z, m, nv, a, b, c, true);
  // Harris' test does not carry Bland's termination proof; the strict rule does.
  return status === 'iteration-limit' ? solveOnce(z, m, nv, a, b, c, false) : status;
}

function solveOnce(
  z: Float64Array,
  m: number,
  nv: number,
  a: ArrayLike<number>,
  b: ArrayLike<number>,
  c: ArrayLike<number>,
  harris: boolean,
): LpStatus {
  let nArt = 0;
  for (let i = 0; i < m; i++) if (b[i]! < 0) nArt++;
  const width = nv + m + nArt; // columns before the right-hand side
  const stride = width + 1;
  const need = (m + 1) * stride;
  if (tab.length < need) tab = new Float64Array(need);
  if (basis.length < m) basis = new Int32Array(m);
  const t = tab;
  t.fill(0, 0, need);
  if (colMax.length < nv) colMax = new Float64Array(nv);
  colMax.fill(0, 0, nv);
  for (let i = 0; i < m; i++) for (let j = 0; j < nv; j++) colMax[j] = Math.max(colMax[j]!, Math.abs(a[i * nv + j]!));
  let art = nv + m;
  for (let i = 0; i < m; i++) {
    const row = i * stride;
    // Equilibrate: each row divided by its largest coefficient, so the absolute tolerances
    // mean the same for a row of 1e-12 N·m commands as for a row of O(1) entries.
    // An entry below COLUMN_NOISE × its column's largest entry is rounding noise (e.g. a
    // 1e-150 null-vector component) and is read as 0, else equilibration would promote it to a
    // binding constraint. A row left with no entries reads 0 ≤ b_i.
    let big = 0;
    for (let j = 0; j < nv; j++) {
      const v = Math.abs(a[i * nv + j]!);
      if (v >= COLUMN_NOISE * colMax[j]!) big = Math.max(big, v);
    }
    const f = (b[i]! < 0 ? -1 : 1) / (big > 0 ? big : 1);
    const sign = b[i]! < 0 ? -1 : 1;
    for (let j = 0; j < nv; j++) {
      const v = a[i * nv + j]!;
      t[row + j] = Math.abs(v) >= COLUMN_NOISE * colMax[j]! && big > 0 ? f * v : 0;
    }
    t[row + nv + i] = sign;
    t[row + width] = f * b[i]!;
    if (sign < 0) {
      t[row + art] = 1;
      basis[i] = art++;
    } else {
      basis[i] = nv + i;
    }
  }
  const obj = m * stride;
  let iterLeft = 50 * (m + width) + 100;
  if (nArt > 0) {
    // Phase 1: minimise the sum of artificials; reduced costs = 1 − Σ(rows whose basis is artificial).
    for (let j = nv + m; j < width; j++) t[obj + j] = 1;
    for (let i = 0; i < m; i++) {
      if (basis[i]! < nv + m) continue;
      for (let j = 0; j <= width; j++) t[obj + j]! -= t[i * stride + j]!;
    }
    const s1 = runSimplex(t, m, stride, width, width, iterLeft, harris);
    if (s1 < 0) return fillZero(z, nv, 'iteration-limit');
    iterLeft -= s1;
    if (-t[obj + width]! > EPS_FEAS) return fillZero(z, nv, 'infeasible');
    // Drive zero-level artificials out of the basis where a real column allows it.
    for (let i = 0; i < m; i++) {
      if (basis[i]! < nv + m) continue;
      for (let j = 0; j < nv + m; j++) {
        if (Math.abs(t[i * stride + j]!) > 1e-9) {
          pivot(t, m, stride, width, i, j);
          break;
        }
      }
    }
  }
  // Phase 2: reduced costs of the real objective; artificial columns may no longer enter.
  for (let j = 0; j <= width; j++) t[obj + j] = j < nv ? c[j]! : 0;
  for (let i = 0; i < m; i++) {
    const bi = basis[i]!;
    const cb = bi < nv ? c[bi]! : 0;
    if (cb === 0) continue;
    for (let j = 0; j <= width; j++) t[obj + j]! -= cb * t[i * stride + j]!;
  }
  const s2 = runSimplex(t, m, stride, width, nv + m, iterLeft, harris);
  if (s2 === -2) return fillZero(z, nv, 'unbounded');
  if (s2 < 0) return fillZero(z, nv, 'iteration-limit');
  z.fill(0, 0, nv);
  for (let i = 0; i < m; i++) if (basis[i]! < nv) z[basis[i]!] = Math.max(0, t[i * stride + width]!);
  return 'optimal';
}

function fillZero(z: Float64Array, nv: number, s: LpStatus): LpStatus {
  z.fill(0, 0, nv);
  return s;
}

/**
 * Simplex iterations on the tableau; columns ≥ `enterLimit` never enter. The entering column is
 * always the lowest-numbered one with a negative reduced cost (Bland). The leaving row:
 * - harris: Harris' two-pass ratio test (P. M. J. Harris, "Pivot selection methods of the Devex
 *   LP code", Math. Programming 5, 1973): the largest step allowed when every row may go
 *   HARRIS_TOL infeasible, then among the rows blocking within it the largest pivot — avoids
 *   dividing by tiny pivots, which otherwise wrecks the tableau on degenerate wheel layouts;
 * - otherwise Bland's smallest-index rule, which guarantees termination.
 * Returns the number of pivots made, −1 on the iteration limit, −2 when unbounded.
 */
function runSimplex(
  t: Float64Array,
  m: number,
  stride: number,
  width: number,
  enterLimit: number,
  maxIter: number,
  harris: boolean,
): number {
  const obj = m * stride;
  for (let it = 0; it < maxIter; it++) {
    let q = -1;
    for (let j = 0; j < enterLimit; j++) {
      if (t[obj + j]! < -EPS_COST) {
        q = j;
        break;
      }
    }
    if (q < 0) return it;
    let r = -1;
    if (harris) {
      // Pivots below PIVOT_REL × the column's largest entry are not trusted (rows equilibrated).
      let colBig = 0;
      for (let i = 0; i < m; i++) colBig = Math.max(colBig, Math.abs(t[i * stride + q]!));
      const minPivot = Math.max(EPS_PIVOT, PIVOT_REL * colBig);
      let thetaMax = Infinity;
      for (let i = 0; i < m; i++) {
        const aiq = t[i * stride + q]!;
        if (aiq > minPivot) thetaMax = Math.min(thetaMax, (t[i * stride + width]! + HARRIS_TOL) / aiq);
      }
      if (thetaMax === Infinity) return -2;
      let bestCoef = 0;
      for (let i = 0; i < m; i++) {
        const aiq = t[i * stride + q]!;
        if (aiq <= minPivot || t[i * stride + width]! / aiq > thetaMax) continue;
        if (aiq > bestCoef * (1 + 1e-12) || (aiq >= bestCoef * (1 - 1e-12) && basis[i]! < basis[r]!)) {
          bestCoef = aiq;
          r = i;
        }
      }
    } else {
      let best = Infinity;
      for (let i = 0; i < m; i++) {
        const aiq = t[i * stride + q]!;
        if (aiq <= EPS_PIVOT) continue;
        const ratio = t[i * stride + width]! / aiq;
        const tie = 1e-14 * (1 + Math.abs(best));
        if (r < 0 || ratio < best - tie || (ratio <= best + tie && basis[i]! < basis[r]!)) {
          best = ratio;
          r = i;
        }
      }
    }
    if (r < 0) return -2;
    // Harris may pick a row a hair infeasible; step from zero there, never backwards.
    if (t[r * stride + width]! < 0) t[r * stride + width] = 0;
    pivot(t, m, stride, width, r, q);
  }
  return -1;
}

function pivot(t: Float64Array, m: number, stride: number, width: number, r: number, q: number): void {
  const pr = r * stride;
  const inv = 1 / t[pr + q]!;
  for (let j = 0; j <= width; j++) t[pr + j]! *= inv;
  t[pr + q] = 1;
  for (let i = 0; i <= m; i++) {
    if (i === r) continue;
    const row = i * stride;
    const f = t[row + q]!;
    if (f === 0) continue;
    for (let j = 0; j <= width; j++) t[row + j]! -= f * t[pr + j]!;
    t[row + q] = 0;
    // Rounding (and Harris' tolerance) can push a basic value a hair below zero; it is zero.
    if (i < m && t[row + width]! < 0 && t[row + width]! > -1e-11) t[row + width] = 0;
  }
  basis[r] = q;
}
