/**
 * The bundled demo's validation, made at build time for the renderer's threads (vite.config.ts
 * turns it into `virtual:slewsmith-demo-validation`): the page and the pipeline worker plant it
 * (engine/scenario/knownValidation.ts), so neither validates the demo at start. The module holds
 * the demo's JSON value itself beside the result: only an input equal to it in every value and
 * key takes the result; every other scenario is validated as before, with the same messages.
 *
 * Run directly, it prints the module source: `node --import tsx main/demo-validation.ts <scenario>`.
 */
import fs from 'node:fs';
import { pathToFileURL } from 'node:url';
import type { Result } from '../app/engine/errors';
import type { Scenario } from '../app/engine/scenario/schema';
import { validateScenario } from '../app/engine/scenario/validate';
import { literal } from './demo-certificates';

/** `export default [json, validation]`, every number read back exactly (literal()). */
export function validationModuleSource(json: unknown): string {
  const result: Result<Scenario> = validateScenario(json);
  return `export default [${literal(json)},${literal(result)}];\n`;
}

if (process.argv[1] && pathToFileURL(process.argv[1]).href === import.meta.url) {
  const file = process.argv[2];
  if (!file) throw new Error('usage: node --import tsx main/demo-validation.ts <scenario.json>');
  process.stdout.write(validationModuleSource(JSON.parse(fs.readFileSync(file, 'utf8'))));
}
