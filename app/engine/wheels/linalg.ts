/**
 * Small dense linear algebra for a 3×N wheel-axis matrix G = [g₁ … g_N] (body frame).
 *
 * Only what the wheel array needs, done once per array (construction time), never per step:
 * - singular values of G by one-sided Jacobi on its three rows (Hestenes 1958; Golub & Van Loan,
 *   Matrix Computations, 4th ed., §8.6.4). Unlike the eigenvalues of GGᵀ, this keeps small
 *   singular values accurate to working precision, so the rank test and the reported smallest
 *   singular value mean what they say;
 * - the pseudo-inverse G⁺ = Gᵀ(GGᵀ)⁻¹ from that factorisation;
 * - an orthonormal null-space basis from a Householder QR of Gᵀ (Golub & Van Loan §5.2).
 *
 * Storage: `axes` is 3N with g_i at [3i .. 3i+2]; G⁺ is N×3 row-major (row i at [3i .. 3i+2]).
 */

export interface AxisSvd {
  /** Singular values of G, descending (σ₀ ≥ σ₁ ≥ σ₂ ≥ 0). */
  sigma: Float64Array;
  /** Q (3×3, row-major): Q G has orthogonal rows whose norms are the σ (unsorted order). */
  q: Float64Array;
  /** Q G, 3×N row-major, rows orthogonal. */
  rows: Float64Array;
  /** Row norms of `rows` in row order (σ before sorting). */
  rowNorm: Float64Array;
}

/** One-sided Jacobi on the rows of G. Allocates its result (construction time only). */
export function axisSvd(axes: ArrayLike<number>, n: number): AxisSvd {
  const rows = new Float64Array(3 * n);
  for (let i = 0; i < n; i++) for (let r = 0; r < 3; r++) rows[r * n + i] = axes[3 * i + r]!;
  const q = new Float64Array([1, 0, 0, 0, 1, 0, 0, 0, 1]);
  for (let sweep = 0; sweep < 40; sweep++) {
    let rotated = false;
    for (let p = 0; p < 2; p++) {
      for (let r = p + 1; r < 3; r++) {
        let a = 0,
          b = 0,
          g = 0;
        for (let i = 0; i < n; i++) {
          const x = rows[p * n + i]!,
            y = rows[r * n + i]!;
          a += x * x;
          b += y * y;
          g += x * y;
        }
        if (g === 0 || Math.abs(g) <= 1e-15 * Math.sqrt(a * b)) continue;
        rotated = true;
        const zeta = (b - a) / (2 * g);
        const t = (zeta >= 0 ? 1 : -1) / (Math.abs(zeta) + Math.sqrt(1 + zeta * zeta));
        const c = 1 / Math.sqrt(1 + t * t);
        const s = c * t;
        for (let i = 0; i < n; i++) {
          const x = rows[p * n + i]!,
            y = rows[r * n + i]!;
          rows[p * n + i] = c * x - s * y;
          rows[r * n + i] = s * x + c * y;
        }
        for (let j = 0; j < 3; j++) {
          const x = q[3 * p + j]!,
            y = q[3 * r + j]!;
          q[3 * p + j] = c * x - s * y;
          q[3 * r + j] = s * x + c * y;
        }
      }
    }
    if (!rotated) break;
  }
  const rowNorm = new Float64Array(3);
  for (let r = 0; r < 3; r++) {
    let s = 0;
    for (let i = 0; i < n; i++) s += rows[r * n + i]! * rows[r * n + i]!;
    rowNorm[r] = Math.sqrt(s);
  }
  const sigma = Float64Array.from(rowNorm).sort().reverse();
  return { sigma, q, rows, rowNorm };
}

/**
 * G⁺ = Gᵀ(GGᵀ)⁻¹ written into `out` (N×3 row-major). With QG = R̂ (orthogonal rows, norms σ_k),
 * GGᵀ = Qᵀ Σ² Q, hence G⁺ = R̂ᵀ Σ⁻² Q. Requires rank 3 (checked by the caller).
 */
export function pseudoInverseFromSvd(out: Float64Array, svd: AxisSvd, n: number): Float64Array {
  const { rows, q, rowNorm } = svd;
  for (let i = 0; i < n; i++) {
    for (let c = 0; c < 3; c++) {
      let s = 0;
      for (let k = 0; k < 3; k++) s += (rows[k * n + i]! * q[3 * k + c]!) / (rowNorm[k]! * rowNorm[k]!);
      out[3 * i + c] = s;
    }
  }
  return out;
}

/**
 * Orthonormal basis of null(G), (N−3) vectors of length N concatenated, from the last N−3
 * columns of Q in Gᵀ = QR (Householder). Each vector's sign is fixed so that its first entry
 * of magnitude > 1e-12 is positive, which makes the basis reproducible.
 */
export function nullSpaceBasis(axes: ArrayLike<number>, n: number): Float64Array {
  const k = n - 3;
  const out = new Float64Array(Math.max(0, k) * n);
  if (k <= 0) return out;
  // A = Gᵀ, N×3, column-major by column c at [c*n .. c*n+n-1].
  const a = new Float64Array(3 * n);
  for (let i = 0; i < n; i++) for (let c = 0; c < 3; c++) a[c * n + i] = axes[3 * i + c]!;
  const v = new Float64Array(3 * n); // Householder vectors, v_c zero above row c
  const vv = new Float64Array(3);
  for (let c = 0; c < 3; c++) {
    let norm = 0;
    for (let i = c; i < n; i++) norm += a[c * n + i]! * a[c * n + i]!;
    norm = Math.sqrt(norm);
    if (norm === 0) continue; // rank-deficient column: identity reflector
    const x0 = a[c * n + c]!;
    const alpha = x0 >= 0 ? -norm : norm;
    for (let i = c; i < n; i++) v[c * n + i] = a[c * n + i]!;
    v[c * n + c] = x0 - alpha;
    let s = 0;
    for (let i = c; i < n; i++) s += v[c * n + i]! * v[c * n + i]!;
    vv[c] = s;
    if (s === 0) continue;
    for (let cc = c; cc < 3; cc++) {
      let d = 0;
      for (let i = c; i < n; i++) d += v[c * n + i]! * a[cc * n + i]!;
      const f = (2 * d) / s;
      for (let i = c; i < n; i++) a[cc * n + i]! -= f * v[c * n + i]!;
    }
  }
  for (let j = 0; j < k; j++) {
    const col = out.subarray(j * n, (j + 1) * n);
    col[3 + j] = 1;
    // Q e = H₀ H₁ H₂ e: apply the last reflector first.
    for (let c = 2; c >= 0; c--) {
      if (vv[c] === 0) continue;
      let d = 0;
      for (let i = c; i < n; i++) d += v[c * n + i]! * col[i]!;
      const f = (2 * d) / vv[c]!;
      for (let i = c; i < n; i++) col[i]! -= f * v[c * n + i]!;
    }
    let first = 0;
    while (first < n && Math.abs(col[first]!) <= 1e-12) first++;
    if (first < n && col[first]! < 0) for (let i = 0; i < n; i++) col[i] = -col[i]!;
  }
  return out;
}
