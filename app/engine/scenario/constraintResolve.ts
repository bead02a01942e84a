/**
 * The `constraints` list between the file (degrees, constraintSchema.ts) and the engine (SI,
 * constraints/directions.ts ConstraintSpec): resolve (resolve.ts) and its inverse (toFile.ts).
 * Vectors are normalised on resolve (validate.ts has refused zero ones), so a round trip keeps
 * their directions, not their lengths. `keepOutSpecs` reads the older `keepOut` list as keep-out
 * constraints against fixed directions with no margin and no window.
 */
import type { ConstraintSpec, DirectionSpec } from '../constraints/directions';
import type { Vec3 } from '../math/mat3';
import { DEG_PER_RAD, RAD_PER_DEG } from '../units';
import type { ConstraintDirectionFile, ConstraintSpecFile } from './constraintSchema';

/** Unit copy of a non-zero vector (validated before resolve). */
function unit(v: ArrayLike<number>): Float64Array {
  const n = Math.hypot(v[0]!, v[1]!, v[2]!);
  return Float64Array.of(v[0]! / n, v[1]! / n, v[2]! / n);
}

function directionSpec(d: ConstraintDirectionFile): DirectionSpec {
  switch (d.kind) {
    case 'fixed':
      return { kind: 'fixed', direction: unit(d.inertialDirection) };
    case 'ground-station':
      return {
        kind: 'ground-station',
        latitudeRad: d.latitudeDeg * RAD_PER_DEG,
        longitudeRad: d.longitudeDeg * RAD_PER_DEG,
        altitudeM: d.altitudeM,
      };
    default:
      return { kind: d.kind };
  }
}

export function resolveConstraints(list: readonly ConstraintSpecFile[] | undefined): ConstraintSpec[] {
  return (list ?? []).map((c, i) => ({
    path: `constraints[${i}]`,
    name: c.name,
    kind: c.kind,
    bodyAxis: unit(c.bodyAxis),
    halfAngleRad: c.halfAngleDeg * RAD_PER_DEG,
    marginRad: (c.marginDeg ?? 0) * RAD_PER_DEG,
    window: c.window ? { startS: c.window.startS, endS: c.window.endS } : null,
    direction: directionSpec(c.direction),
  }));
}

function directionFile(d: DirectionSpec): ConstraintDirectionFile {
  switch (d.kind) {
    case 'fixed':
      return { kind: 'fixed', inertialDirection: Array.from(d.direction) };
    case 'ground-station':
      return {
        kind: 'ground-station',
        latitudeDeg: d.latitudeRad * DEG_PER_RAD,
        longitudeDeg: d.longitudeRad * DEG_PER_RAD,
        altitudeM: d.altitudeM,
      };
    default:
      return { kind: d.kind };
  }
}

/** The inverse of resolveConstraints (margin 0 and no window are written as absent). */
export function constraintsToFile(list: readonly ConstraintSpec[]): ConstraintSpecFile[] {
  return list.map((c) => ({
    name: c.name,
    kind: c.kind,
    bodyAxis: Array.from(c.bodyAxis),
    halfAngleDeg: c.halfAngleRad * DEG_PER_RAD,
    ...(c.marginRad > 0 ? { marginDeg: c.marginRad * DEG_PER_RAD } : {}),
    ...(c.window ? { window: { startS: c.window.startS, endS: c.window.endS } } : {}),
    direction: directionFile(c.direction),
  }));
}

/** The older `keepOut` cones as keep-out constraints against fixed directions (margin 0, always). */
export function keepOutSpecs(
  cones: readonly { label: string; bodyAxis: Vec3; inertialDirection: Vec3; halfAngleRad: number }[],
): ConstraintSpec[] {
  return cones.map((k, i) => ({
    path: `keepOut[${i}]`,
    name: k.label,
    kind: 'keep-out',
    bodyAxis: Float64Array.from(k.bodyAxis),
    halfAngleRad: k.halfAngleRad,
    marginRad: 0,
    window: null,
    direction: { kind: 'fixed', direction: Float64Array.from(k.inertialDirection) },
  }));
}
