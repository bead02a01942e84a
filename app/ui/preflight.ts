/**
 * Checks run on the UI thread as the user types, before anything is sent to the worker: the
 * scenario validator (structure, ranges, cross-field rules) and the inertia validator (symmetry,
 * positive definiteness, triangle inequality), both the engine's own. Both are fast; the worker's
 * pipeline run adds whatever deeper checks it makes (wheel-array rank, certificates) and the UI
 * merges those in when they arrive. Nothing here computes; it only asks the engine.
 */
import type { Issue } from '../engine/errors';
import { validateInertia } from '../engine/body/inertia';
import { validateScenario } from '../engine/scenario/validate';
import type { ValidationState } from './store/document';
import { dedupeIssues } from '../engine/errors';

export const INERTIA_PATH = 'vehicle.inertiaKgm2';

function isMatrix3(v: unknown): v is unknown[][] {
  return Array.isArray(v) && v.length === 3 && v.every((r) => Array.isArray(r) && r.length === 3);
}

export function preflight(json: unknown): ValidationState {
  const v = validateScenario(json);
  const errors: Issue[] = v.ok ? [] : [...v.errors];
  const warnings: Issue[] = [...v.warnings];
  const J = (json as { vehicle?: { inertiaKgm2?: unknown } } | null)?.vehicle?.inertiaKgm2;
  // Only a well-shaped matrix: shape and type problems are the scenario validator's to report.
  if (isMatrix3(J) && J.every((r) => r.every((x) => typeof x === 'number' && Number.isFinite(x)))) {
    const r = validateInertia(J, INERTIA_PATH);
    if (!r.ok) errors.push(...r.errors);
    warnings.push(...r.warnings);
  }
  const e = dedupeIssues(errors);
  return { ok: e.length === 0, errors: e, warnings: dedupeIssues(warnings) };
}
