/** Loading the example scenario files for tests (Node side; the engine never reads files). */
import { readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { dirname, join } from 'node:path';

const assets = join(dirname(fileURLToPath(import.meta.url)), '..', '..', 'assets');

export const EXAMPLE_FILES = ['lumen6-imaging', 'tern12-reversal', 'kestrel60-momentum'] as const;
export type ExampleName = (typeof EXAMPLE_FILES)[number];

/** A fresh deep copy of an example file's JSON each call (tests mutate it). */
export function loadExample(name: ExampleName): any {
  return JSON.parse(readFileSync(join(assets, `${name}.scenario.json`), 'utf8'));
}

import { validateScenario } from '../../app/engine/scenario/validate';
import { resolveScenario } from '../../app/engine/scenario/resolve';
import { scenarioSummary } from '../../app/engine/pipeline/summarise';
import type { ScenarioSummary } from '../../app/engine/pipeline/types';

/** An example's scenario summary (what the exporters read), through the pipeline's first stages. */
export function exampleSummary(name: ExampleName): ScenarioSummary {
  const v = validateScenario(loadExample(name));
  if (!v.ok) throw new Error(`${name} is not valid`);
  return scenarioSummary(resolveScenario(v.value), v.value);
}
