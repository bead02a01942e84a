/**
 * Two-vector attitudes by the TRIAD construction (Black, AIAA Journal 2(7), 1964): primary pair
 * exact, secondary pair as close as possible. Attitudes are qInertialFromBody (rotation.ts).
 */
import { m3Create } from './mat3';
import type { Quat } from './quaternion';
import { qFromMat3 } from './quaternion';

/**
 * The attitude that points body axis `bodyPrimary` exactly at inertial `inertialPrimary` and
 * keeps `bodySecondary` as close as possible to `inertialSecondary`. Returns false when either
 * pair is parallel (the secondary constraint is then undefined) or a vector is zero.
 */
export function qFromTwoVectors(
  out: Quat,
  bodyPrimary: ArrayLike<number>,
  inertialPrimary: ArrayLike<number>,
  bodySecondary: ArrayLike<number>,
  inertialSecondary: ArrayLike<number>,
  parallelTol = 1e-9,
): boolean {
  const tb = triad(bodyPrimary, bodySecondary, parallelTol);
  const ti = triad(inertialPrimary, inertialSecondary, parallelTol);
  if (!tb || !ti) return false;
  // R = [s1 s2 s3][t1 t2 t3]ᵀ, column-major.
  const m = m3Create();
  for (let r = 0; r < 3; r++)
    for (let c = 0; c < 3; c++) m[3 * c + r] = ti[0]![r]! * tb[0]![c]! + ti[1]![r]! * tb[1]![c]! + ti[2]![r]! * tb[2]![c]!;
  qFromMat3(out, m);
  return true;
}

function triad(p: ArrayLike<number>, s: ArrayLike<number>, tol: number): number[][] | null {
  const np = Math.hypot(p[0]!, p[1]!, p[2]!);
  const ns = Math.hypot(s[0]!, s[1]!, s[2]!);
  if (!(np > 0) || !(ns > 0)) return null;
  const t1 = [p[0]! / np, p[1]! / np, p[2]! / np];
  const sx = s[0]! / ns,
    sy = s[1]! / ns,
    sz = s[2]! / ns;
  const c = [t1[1]! * sz - t1[2]! * sy, t1[2]! * sx - t1[0]! * sz, t1[0]! * sy - t1[1]! * sx];
  const nc = Math.hypot(c[0]!, c[1]!, c[2]!);
  if (nc < tol) return null;
  const t2 = [c[0]! / nc, c[1]! / nc, c[2]! / nc];
  const t3 = [t1[1]! * t2[2]! - t1[2]! * t2[1]!, t1[2]! * t2[0]! - t1[0]! * t2[2]!, t1[0]! * t2[1]! - t1[1]! * t2[0]!];
  return [t1, t2, t3];
}
