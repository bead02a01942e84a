/**
 * The scenario validator as the pipeline worker loads it (workerValidator.ts, a dynamic import):
 * zod and every schema live behind this module, so the worker's script builds none of them when it
 * only flies the bundled demo.
 */
// First, as in every worker entry: the CSP forbids eval, so zod must be jitless before any schema exists.
import '../../no-eval';

export { validateScenario, validateScenarioAfresh } from '../../engine/scenario/validate';
