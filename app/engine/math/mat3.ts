/**
 * 3×3 matrix helpers over Float64Array(9).
 *
 * Storage: COLUMN-MAJOR, as gl-matrix: element (row r, column c) is m[3*c + r]. The attitude
 * matrix built from a quaternion here equals gl-matrix `mat3.fromQuat`.
 * Operations follow the gl-matrix habit `fn(out, a, b)`: inputs are read into locals first so
 * `out` may alias an input; only `m3Create`/`m3FromRows` allocate.
 */

export type Mat3 = Float64Array;
export type Vec3 = Float64Array;

export function m3Create(): Mat3 {
  return new Float64Array(9);
}

export function v3Create(x = 0, y = 0, z = 0): Vec3 {
  const v = new Float64Array(3);
  v[0] = x;
  v[1] = y;
  v[2] = z;
  return v;
}

/** Element (r, c) of a column-major 3×3. */
export function m3Get(m: ArrayLike<number>, r: number, c: number): number {
  return m[3 * c + r]!;
}

/** Build from row-major nested rows (the way people write matrices). */
export function m3FromRows(rows: ArrayLike<ArrayLike<number>>, out: Mat3 = m3Create()): Mat3 {
  for (let r = 0; r < 3; r++) for (let c = 0; c < 3; c++) out[3 * c + r] = rows[r]![c]!;
  return out;
}

/** Row-major nested arrays (for display and files). */
export function m3ToRows(m: ArrayLike<number>): number[][] {
  return [0, 1, 2].map((r) => [0, 1, 2].map((c) => m[3 * c + r]!));
}

export function m3Identity(out: Mat3): Mat3 {
  out.fill(0);
  out[0] = out[4] = out[8] = 1;
  return out;
}

export function m3Diag(d0: number, d1: number, d2: number, out: Mat3 = m3Create()): Mat3 {
  out.fill(0);
  out[0] = d0;
  out[4] = d1;
  out[8] = d2;
  return out;
}

export function m3Transpose(out: Mat3, a: ArrayLike<number>): Mat3 {
  const a01 = a[1]!,
    a02 = a[2]!,
    a12 = a[5]!;
  const a10 = a[3]!,
    a20 = a[6]!,
    a21 = a[7]!;
  out[0] = a[0]!;
  out[4] = a[4]!;
  out[8] = a[8]!;
  out[1] = a10;
  out[2] = a20;
  out[3] = a01;
  out[5] = a21;
  out[6] = a02;
  out[7] = a12;
  return out;
}

export function m3Multiply(out: Mat3, a: ArrayLike<number>, b: ArrayLike<number>): Mat3 {
  const a00 = a[0]!,
    a10 = a[1]!,
    a20 = a[2]!,
    a01 = a[3]!,
    a11 = a[4]!,
    a21 = a[5]!,
    a02 = a[6]!,
    a12 = a[7]!,
    a22 = a[8]!;
  const b00 = b[0]!,
    b10 = b[1]!,
    b20 = b[2]!,
    b01 = b[3]!,
    b11 = b[4]!,
    b21 = b[5]!,
    b02 = b[6]!,
    b12 = b[7]!,
    b22 = b[8]!;
  out[0] = a00 * b00 + a01 * b10 + a02 * b20;
  out[1] = a10 * b00 + a11 * b10 + a12 * b20;
  out[2] = a20 * b00 + a21 * b10 + a22 * b20;
  out[3] = a00 * b01 + a01 * b11 + a02 * b21;
  out[4] = a10 * b01 + a11 * b11 + a12 * b21;
  out[5] = a20 * b01 + a21 * b11 + a22 * b21;
  out[6] = a00 * b02 + a01 * b12 + a02 * b22;
  out[7] = a10 * b02 + a11 * b12 + a12 * b22;
  out[8] = a20 * b02 + a21 * b12 + a22 * b22;
  return out;
}

/** out = M v. */
export function m3MulVec(out: Vec3, m: ArrayLike<number>, v: ArrayLike<number>): Vec3 {
  const x = v[0]!,
    y = v[1]!,
    z = v[2]!;
  out[0] = m[0]! * x + m[3]! * y + m[6]! * z;
  out[1] = m[1]! * x + m[4]! * y + m[7]! * z;
  out[2] = m[2]! * x + m[5]! * y + m[8]! * z;
  return out;
}

export function m3Determinant(a: ArrayLike<number>): number {
  const a00 = a[0]!,
    a10 = a[1]!,
    a20 = a[2]!,
    a01 = a[3]!,
    a11 = a[4]!,
    a21 = a[5]!,
    a02 = a[6]!,
    a12 = a[7]!,
    a22 = a[8]!;
  return a00 * (a11 * a22 - a12 * a21) - a01 * (a10 * a22 - a12 * a20) + a02 * (a10 * a21 - a11 * a20);
}

/**
 * Inverse by the adjugate. Returns false (and leaves `out` untouched) when |det| is below
 * `tiny` times the cube of the largest entry — never a silent null or Infinity.
 */
export function m3Invert(out: Mat3, a: ArrayLike<number>, tiny = 1e-14): boolean {
  const a00 = a[0]!,
    a10 = a[1]!,
    a20 = a[2]!,
    a01 = a[3]!,
    a11 = a[4]!,
    a21 = a[5]!,
    a02 = a[6]!,
    a12 = a[7]!,
    a22 = a[8]!;
  const c00 = a11 * a22 - a12 * a21;
  const c01 = -(a10 * a22 - a12 * a20);
  const c02 = a10 * a21 - a11 * a20;
  const det = a00 * c00 + a01 * c01 + a02 * c02;
  let scale = 0;
  for (let i = 0; i < 9; i++) scale = Math.max(scale, Math.abs(a[i]!));
  if (!Number.isFinite(det) || Math.abs(det) <= tiny * scale * scale * scale || scale === 0) return false;
  const id = 1 / det;
  // inverse = adj / det, adj = cofactor transpose. Column-major: out[3c + r] = inv(r, c) = C(c, r) / det.
  out[0] = c00 * id;
  out[1] = c01 * id;
  out[2] = c02 * id;
  out[3] = -(a01 * a22 - a02 * a21) * id;
  out[4] = (a00 * a22 - a02 * a20) * id;
  out[5] = -(a00 * a21 - a01 * a20) * id;
  out[6] = (a01 * a12 - a02 * a11) * id;
  out[7] = -(a00 * a12 - a02 * a10) * id;
  out[8] = (a00 * a11 - a01 * a10) * id;
  return true;
}

export function v3Cross(out: Vec3, a: ArrayLike<number>, b: ArrayLike<number>): Vec3 {
  const ax = a[0]!,
    ay = a[1]!,
    az = a[2]!,
    bx = b[0]!,
    by = b[1]!,
    bz = b[2]!;
  out[0] = ay * bz - az * by;
  out[1] = az * bx - ax * bz;
  out[2] = ax * by - ay * bx;
  return out;
}

export function v3Dot(a: ArrayLike<number>, b: ArrayLike<number>): number {
  return a[0]! * b[0]! + a[1]! * b[1]! + a[2]! * b[2]!;
}

export function v3Norm(a: ArrayLike<number>): number {
  return Math.hypot(a[0]!, a[1]!, a[2]!);
}

/**
 * Eigen-decomposition of a symmetric 3×3 by cyclic Jacobi rotations (Golub & Van Loan,
 * Matrix Computations, §8.5). Eigenvalues ascending in `values`; `vectors` holds the matching
 * unit eigenvectors as COLUMNS (column-major), forming a right-handed rotation matrix.
 */
export function symmetricEigen3(
  a: ArrayLike<number>,
  values: Vec3 = v3Create(),
  vectors: Mat3 = m3Create(),
): { values: Vec3; vectors: Mat3 } {
  // Work in row-major plain numbers for clarity; symmetric anyway.
  const A = [
    [a[0], 0.5 * (a[3]! + a[1]!), 0.5 * (a[6]! + a[2]!)],
    [0, a[4], 0.5 * (a[7]! + a[5]!)],
    [0, 0, a[8]],
  ];
  A[1]![0] = A[0]![1];
  A[2]![0] = A[0]![2];
  A[2]![1] = A[1]![2];
  const V = [
    [1, 0, 0],
    [0, 1, 0],
    [0, 0, 1],
  ];
  for (let sweep = 0; sweep < 60; sweep++) {
    const off = A[0]![1]! * A[0]![1]! + A[0]![2]! * A[0]![2]! + A[1]![2]! * A[1]![2]!;
    const diag = A[0]![0]! * A[0]![0]! + A[1]![1]! * A[1]![1]! + A[2]![2]! * A[2]![2]!;
    if (off <= 1e-34 * diag || off === 0) break;
    for (let p = 0; p < 2; p++) {
      for (let q = p + 1; q < 3; q++) {
        const apq = A[p]![q]!;
        if (apq === 0) continue;
        const theta = (A[q]![q]! - A[p]![p]!) / (2 * apq);
        const t = Math.sign(theta || 1) / (Math.abs(theta) + Math.sqrt(theta * theta + 1));
        const c = 1 / Math.sqrt(t * t + 1);
        const s = t * c;
        for (let k = 0; k < 3; k++) {
          const akp = A[k]![p]!,
            akq = A[k]![q]!;
          A[k]![p] = c * akp - s * akq;
          A[k]![q] = s * akp + c * akq;
        }
        for (let k = 0; k < 3; k++) {
          const apk = A[p]![k]!,
            aqk = A[q]![k]!;
          A[p]![k] = c * apk - s * aqk;
          A[q]![k] = s * apk + c * aqk;
        }
        for (let k = 0; k < 3; k++) {
          const vkp = V[k]![p]!,
            vkq = V[k]![q]!;
          V[k]![p] = c * vkp - s * vkq;
          V[k]![q] = s * vkp + c * vkq;
        }
      }
    }
  }
  const order = [0, 1, 2].sort((i, j) => A[i]![i]! - A[j]![j]!);
  for (let c = 0; c < 3; c++) {
    const src = order[c]!;
    values[c] = A[src]![src]!;
    for (let r = 0; r < 3; r++) vectors[3 * c + r] = V[r]![src]!;
  }
  // Make the eigenvector matrix a proper rotation (det +1).
  if (m3Determinant(vectors) < 0) for (let r = 0; r < 3; r++) vectors[6 + r] = -vectors[6 + r]!;
  return { values, vectors };
}
