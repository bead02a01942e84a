/**
 * Inertia-matrix validation: shape, finiteness, symmetry, positive definiteness and the
 * triangle inequality of the principal moments.
 *
 * Every problem is reported together, each with its field path (`inertia[0][2]`) and rule.
 * Input is row-major nested arrays, the way people write matrices; the result is the engine's
 * column-major Float64Array(9) (mat3.ts) plus the principal moments (ascending) and axes.
 */
import type { Issue, Result } from '../errors';
import { describe, fail, issue, ok } from '../errors';
import type { Mat3, Vec3 } from '../math/mat3';
import { m3Create, symmetricEigen3, v3Create } from '../math/mat3';

export interface InertiaInfo {
  /** Inertia about the centre of mass in body axes, kg·m², column-major, exactly symmetric. */
  J: Mat3;
  /** Principal moments J1 ≤ J2 ≤ J3, kg·m². */
  moments: Vec3;
  /** Principal axes as columns (column i goes with moments[i]); a proper rotation (det +1). */
  axes: Mat3;
}

/** Off-diagonal pairs may differ by this fraction of the largest entry (rounding in exported files). */
const INERTIA_SYMMETRY_TOL = 1e-6;
/** J1 + J2 ≥ J3 may fail by this fraction of J3 (rounding of moments computed elsewhere). */
const INERTIA_TRIANGLE_TOL = 1e-9;
/** Smallest eigenvalue must exceed this fraction of the largest to count as positive definite. */
const INERTIA_PD_TOL = 1e-12;

function isArrayLike(v: unknown): v is ArrayLike<unknown> {
  return Array.isArray(v) || (ArrayBuffer.isView(v) && !(v instanceof DataView));
}

/**
 * Validate a 3×3 inertia matrix given as rows. Rules (each an Issue with its path):
 * `shape` (3 rows of 3), `finite`, `symmetric` (|J_rc − J_cr| ≤ 1e-6·max|J|, the offending pair
 * named), `positive-definite` (message names the smallest eigenvalue), `triangle-inequality`
 * (J1 + J2 ≥ J3 for the principal moments; any rigid mass distribution satisfies it since
 * J1 + J2 − J3 = 2∫z² dm ≥ 0 in principal axes), `range` (entries so large the moments overflow).
 * Symmetry, definiteness and the triangle inequality are all checked on the symmetric part, so
 * an asymmetric matrix that is also indefinite gets both issues.
 */
export function validateInertia(rows: unknown, path = 'inertia'): Result<InertiaInfo> {
  const errors: Issue[] = [];
  if (!isArrayLike(rows)) {
    errors.push(issue(path, 'shape', `${path} must be a 3×3 array of rows (got ${describe(rows)})`));
    return fail(errors);
  }
  if (rows.length !== 3) {
    errors.push(issue(path, 'shape', `${path} must have exactly 3 rows (got ${rows.length})`));
  }
  const a = [NaN, NaN, NaN, NaN, NaN, NaN, NaN, NaN, NaN]; // row-major working copy
  let complete = rows.length === 3;
  for (let r = 0; r < Math.min(rows.length, 3); r++) {
    const row = rows[r];
    const rp = `${path}[${r}]`;
    if (!isArrayLike(row)) {
      errors.push(issue(rp, 'shape', `${rp} must be a row of 3 numbers (got ${describe(row)})`));
      complete = false;
      continue;
    }
    if (row.length !== 3) {
      errors.push(issue(rp, 'shape', `${rp} must have exactly 3 entries (got ${row.length})`));
      complete = false;
    }
    for (let c = 0; c < Math.min(row.length, 3); c++) {
      const v = row[c];
      const ep = `${rp}[${c}]`;
      if (typeof v !== 'number' || !Number.isFinite(v)) {
        errors.push(issue(ep, 'finite', `${ep} must be a finite number (got ${describe(v)})`));
        complete = false;
      } else {
        a[3 * r + c] = v;
      }
    }
  }
  if (!complete) return fail(errors);

  let scale = 0;
  for (let i = 0; i < 9; i++) scale = Math.max(scale, Math.abs(a[i]!));
  const symTol = INERTIA_SYMMETRY_TOL * scale;
  for (const [r, c] of [
    [0, 1],
    [0, 2],
    [1, 2],
  ] as const) {
    const x = a[3 * r + c]!,
      y = a[3 * c + r]!;
    // Compare halves to avoid overflow of x − y near the largest doubles.
    if (Math.abs(0.5 * x - 0.5 * y) > 0.5 * symTol) {
      const ep = `${path}[${r}][${c}]`;
      errors.push(
        issue(
          ep,
          'symmetric',
          `${ep} = ${x} but ${path}[${c}][${r}] = ${y}; an inertia matrix must be symmetric ` +
            `(entries may differ by at most ${INERTIA_SYMMETRY_TOL} of the largest entry)`,
        ),
      );
    }
  }

  // Symmetric part, column-major; eigen-decomposition on the matrix scaled to unit size so that
  // neither huge nor subnormal entries overflow inside the Jacobi sweeps.
  const J = m3Create();
  const s = scale > 0 ? scale : 1;
  const Js = m3Create();
  for (let r = 0; r < 3; r++)
    for (let c = 0; c < 3; c++) {
      const v = 0.5 * a[3 * r + c]! + 0.5 * a[3 * c + r]!;
      J[3 * c + r] = v;
      Js[3 * c + r] = v / s;
    }
  const moments = v3Create();
  const axes = m3Create();
  symmetricEigen3(Js, moments, axes);
  for (let i = 0; i < 3; i++) moments[i]! *= s;
  if (!(Number.isFinite(moments[0]) && Number.isFinite(moments[1]) && Number.isFinite(moments[2]))) {
    errors.push(issue(path, 'range', `${path} has entries too large to analyse (largest |entry| ${scale})`));
    return fail(errors);
  }
  const m1 = moments[0]!,
    m2 = moments[1]!,
    m3 = moments[2]!;
  // Six significant digits in messages: enough to see the problem, short enough to read.
  const f = (x: number) => String(Number(x.toPrecision(6)));
  const big = Math.max(Math.abs(m1), Math.abs(m3));
  if (!(m1 > INERTIA_PD_TOL * big)) {
    errors.push(
      issue(
        path,
        'positive-definite',
        `${path} must be positive definite; its smallest eigenvalue is ${f(m1)} kg·m² ` +
          `(principal moments ${f(m1)}, ${f(m2)}, ${f(m3)})`,
      ),
    );
  }
  if (m1 + m2 - m3 < -INERTIA_TRIANGLE_TOL * big) {
    errors.push(
      issue(
        path,
        'triangle-inequality',
        `${path}: principal moments ${f(m1)}, ${f(m2)}, ${f(m3)} break the triangle inequality ` +
          `(J1 + J2 = ${f(m1 + m2)} < J3 = ${f(m3)}); no rigid mass distribution has them`,
      ),
    );
  }
  if (errors.length) return fail(errors);
  return ok({ J, moments, axes });
}
