/**
 * The pipeline worker's scenario validator, loaded on first need (issue 12, cold start): the
 * bundled demo was validated when the app was built (main/demo-validation.ts) and that result is
 * planted in the worker (knownValidation.ts), so the demo's pass — the worker's first — validates
 * nothing and needs neither zod nor the schemas, whose construction at module evaluation cost the
 * worker some 50–80 ms of CPU at start. Any other input waits for the validator (validatorChunk.ts)
 * and is validated by it, with the same messages as everywhere else.
 */
import type { ScenarioValidator } from '../../engine/pipeline/pass';
import { knownValidation } from '../../engine/scenario/knownValidation';
import type { Scenario } from '../../engine/scenario/schema';
import type * as ValidatorChunk from './validatorChunk';

type ValidatorModule = typeof ValidatorChunk;

let loaded: ValidatorModule | null = null;
let loading: Promise<ValidatorModule> | null = null;

/** Loads the validator (once; later calls share the first load). */
export function loadValidator(): Promise<ValidatorModule> {
  loading ??= import('./validatorChunk').then((m) => (loaded = m));
  return loading;
}

/** Whether the validator has been loaded (tests). */
export function validatorLoaded(): boolean {
  return loaded !== null;
}

/**
 * A validator that answers for `json` without loading anything: the loaded validator, or, for an
 * input with a planted validation (the demo, equal in every value, key and key order), one that
 * gives that validation. Null when the validator must be loaded first (loadValidator).
 */
export function validatorNow(json: unknown): ScenarioValidator | null {
  if (loaded) return loaded.validateScenario;
  if (knownValidation(json) === null) return null;
  return (input) => {
    const known = knownValidation<Scenario>(input);
    // The pipeline validates only the input it was given; anything else is a caller's mistake.
    if (known === null) throw new Error('the scenario validator is not loaded for this input');
    return known;
  };
}
