/**
 * Stages 1 and 2 together (validate.ts, then resolve.ts), apart from resolve.ts so that resolving
 * a scenario does not load the validator and its schemas (the app's pipeline worker resolves the
 * bundled demo without them: app/ui/worker/workerValidator.ts).
 */
import type { Result } from '../errors';
import { ok } from '../errors';
import { resolveScenario, type ResolvedScenario } from './resolve';
import { validateScenario } from './validate';

/** Stages 1 and 2: validate, then resolve; the validation's warnings come along. */
export function loadScenario(json: unknown): Result<ResolvedScenario> {
  const v = validateScenario(json);
  if (!v.ok) return v;
  return ok(resolveScenario(v.value), v.warnings);
}
