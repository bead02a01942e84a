/**
 * Input checks shared by the segment and sequence planners. Every problem is collected with its
 * field path and rule; nothing throws.
 */
import { type IssueList, describe } from '../errors';
import type { Mat3, Vec3 } from '../math/mat3';
import { symmetricEigen3 } from '../math/mat3';
import type { Quat } from '../math/rotation';
import type { PlanLimits } from './types';

/** Allowed deviation of a quaternion's norm from 1 (inputs come from the target resolver). */
const UNIT_NORM_TOL = 1e-6;

function finiteArray(list: IssueList, path: string, v: unknown, n: number): Float64Array | null {
  if (v === null || typeof v !== 'object' || typeof (v as ArrayLike<number>).length !== 'number') {
    list.add(path, 'type', `${path} must be an array of ${n} numbers (got ${describe(v)})`);
    return null;
  }
  const a = v as ArrayLike<unknown>;
  if (a.length !== n) {
    list.add(path, 'length', `${path} must have ${n} entries (got ${a.length})`);
    return null;
  }
  const out = new Float64Array(n);
  let good = true;
  for (let i = 0; i < n; i++) {
    if (!list.finite(`${path}[${i}]`, a[i])) good = false;
    else out[i] = a[i] as number;
  }
  return good ? out : null;
}

/** A unit quaternion [x, y, z, w]; a copy, renormalised to remove rounding. */
export function readQuat(list: IssueList, path: string, v: unknown): Quat | null {
  const q = finiteArray(list, path, v, 4);
  if (!q) return null;
  const n = Math.hypot(q[0]!, q[1]!, q[2]!, q[3]!);
  if (!(Math.abs(n - 1) <= UNIT_NORM_TOL)) {
    list.add(path, 'unit-norm', `${path} must be a unit quaternion (norm ${n}, allowed 1 ± ${UNIT_NORM_TOL})`);
    return null;
  }
  for (let i = 0; i < 4; i++) q[i]! /= n;
  return q;
}

export function readVec3(list: IssueList, path: string, v: unknown): Vec3 | null {
  return finiteArray(list, path, v, 3);
}

/** Inertia: 9 numbers column-major, symmetric (to 1e-9 of its largest entry), positive definite. */
export function readInertia(list: IssueList, path: string, v: unknown): Mat3 | null {
  const J = finiteArray(list, path, v, 9);
  if (!J) return null;
  let scale = 0;
  for (let i = 0; i < 9; i++) scale = Math.max(scale, Math.abs(J[i]!));
  let good = true;
  for (const [r, c] of [
    [0, 1],
    [0, 2],
    [1, 2],
  ] as const) {
    if (Math.abs(J[3 * c + r]! - J[3 * r + c]!) > 1e-9 * scale) {
      list.add(
        `${path}[${r}][${c}]`,
        'symmetric',
        `${path} must be symmetric: entry (${r},${c}) = ${J[3 * c + r]} but (${c},${r}) = ${J[3 * r + c]}`,
      );
      good = false;
    }
  }
  if (!good) return null;
  const { values } = symmetricEigen3(J);
  if (!(values[0]! > 1e-12 * Math.max(scale, 1e-300))) {
    list.add(path, 'positive-definite', `${path} must be positive definite (smallest eigenvalue ${values[0]} kg·m²)`);
    return null;
  }
  return J;
}

export function checkLimits(list: IssueList, path: string, limits: unknown): limits is PlanLimits {
  if (limits === null || typeof limits !== 'object') {
    list.add(path, 'type', `${path} must be an object with capacity functions and margins (got ${describe(limits)})`);
    return false;
  }
  const l = limits as Record<string, unknown>;
  const before = list.items.length;
  for (const k of ['torqueCapacity', 'momentumCapacity']) {
    if (typeof l[k] !== 'function') list.add(`${path}.${k}`, 'function', `${path}.${k} must be a function of a unit body direction`);
  }
  for (const k of ['torqueMargin', 'momentumMargin']) {
    const m = l[k];
    if (list.finite(`${path}.${k}`, m) && !(m > 0 && m <= 1)) {
      list.add(`${path}.${k}`, 'range', `${path}.${k} must lie in (0, 1] (got ${m})`);
    }
  }
  if (l.slewRateLimitRadPerS !== undefined) list.positive(`${path}.slewRateLimitRadPerS`, l.slewRateLimitRadPerS);
  if (l.family !== undefined && l.family !== 'bang-bang' && l.family !== 'bang-coast-bang')
    list.add(`${path}.family`, 'enum', `${path}.family must be "bang-bang" or "bang-coast-bang" (got ${describe(l.family)})`);
  return list.items.length === before;
}
