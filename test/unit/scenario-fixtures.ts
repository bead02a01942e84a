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
