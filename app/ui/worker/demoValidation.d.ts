/**
 * The bundled demo's JSON value and its validation, made at build time (vite.config.ts,
 * main/demo-validation.ts) for the page and the pipeline worker to plant
 * (engine/scenario/knownValidation.ts).
 */
declare module 'virtual:slewsmith-demo-validation' {
  import type { Result } from '../../engine/errors';
  import type { Scenario } from '../../engine/scenario/schema';
  const entry: [unknown, Result<Scenario>];
  export default entry;
}
