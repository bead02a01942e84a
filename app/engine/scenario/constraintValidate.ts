/**
 * Cross-field rules of the `constraints` list (validate.ts calls checkConstraintList on the raw
 * file): non-zero body axes and fixed directions, a window that does not end before it starts,
 * and names unique within the scenario (the reports and the export columns are named after them).
 * Each entry is read on its own, so one broken entry does not hide problems in the others.
 */
import { issue, type Issue } from '../errors';
import { ConstraintSchema } from './constraintSchema';

function zeroVector(v: readonly number[]): boolean {
  return !(Math.hypot(v[0]!, v[1]!, v[2]!) > 0);
}

export function checkConstraintList(list: unknown, errors: Issue[]): void {
  if (!Array.isArray(list)) return;
  const seen = new Map<string, number>();
  list.forEach((raw, i) => {
    const r = ConstraintSchema.safeParse(raw);
    if (!r.success) return;
    const c = r.data;
    const p = `constraints[${i}]`;
    if (zeroVector(c.bodyAxis))
      errors.push(
        issue(`${p}.bodyAxis`, 'non-zero', `${p}.bodyAxis ("${c.name}") is the zero vector; a body axis needs a non-zero length`),
      );
    if (c.direction.kind === 'fixed' && zeroVector(c.direction.inertialDirection))
      errors.push(
        issue(
          `${p}.direction.inertialDirection`,
          'non-zero',
          `${p}.direction.inertialDirection ("${c.name}") is the zero vector; a direction needs a non-zero length`,
        ),
      );
    if (c.window && c.window.endS < c.window.startS)
      errors.push(
        issue(`${p}.window.endS`, 'order', `${p}.window.endS (${c.window.endS} s) is before ${p}.window.startS (${c.window.startS} s)`),
      );
    if (c.kind === 'keep-in' && (c.marginDeg ?? 0) >= c.halfAngleDeg)
      errors.push(
        issue(
          `${p}.marginDeg`,
          'range',
          `${p}.marginDeg (${c.marginDeg}°) leaves nothing of the keep-in cone "${c.name}" (half-angle ${c.halfAngleDeg}°): it must be smaller than the half-angle`,
        ),
      );
    const first = seen.get(c.name);
    if (first !== undefined)
      errors.push(issue(`${p}.name`, 'unique', `${p}.name "${c.name}" is already used by constraints[${first}]; names must be unique`));
    else seen.set(c.name, i);
  });
}
