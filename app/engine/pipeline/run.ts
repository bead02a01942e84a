/**
 * The pipeline (pass.ts) with the scenario validator bound: what the CLI, the studies, the export
 * worker and the tests call. The app's pipeline worker calls pass.ts itself, so that the bundled
 * demo's pass does not load the validator (app/ui/worker/answerPass.ts).
 */
import type { Result } from '../errors';
import { validateScenario } from '../scenario/validate';
import { passWith, prepareWith, runWith, type PassStep, type PipelineOptions, type Prepared } from './pass';
import type { PipelineOutput } from './types';

export { flyAndSummarise, prepareResolved } from './pass';
export type { FlyOptions, PassStep, PipelineOptions, Prepared, ScenarioValidator } from './pass';

/** Stages 1–4: validate, resolve, build (vehicle and controllers), plan. */
export function preparePipeline(json: unknown, only?: readonly string[]): Result<Prepared> {
  return prepareWith(validateScenario, json, only);
}

/** One pass: every controller in every mode, and the comparison. */
export function runPipeline(json: unknown, opts: PipelineOptions = {}): Result<PipelineOutput> {
  return runWith(validateScenario, json, opts);
}

/** runPipeline one run at a time (pass.ts passWith). */
export function pipelinePass(json: unknown, opts: PipelineOptions = {}): Generator<PassStep, Result<PipelineOutput>, void> {
  return passWith(validateScenario, json, opts);
}
