/**
 * The layer rules, in one place for the lint config (eslint.config.js) and the layer test
 * (test/unit/layers.test.ts).
 *
 * Engine folders have a rank; a file in app/engine/<folder> imports only from folders of lower
 * rank and from its own folder. Files at the engine root (errors.ts, units.ts, caution.ts) are
 * rank 0 and import nothing from the folders.
 */
export const ENGINE_RANKS = [
  ['math', 'time'],
  ['wheels'],
  ['body', 'orbit'],
  ['hybrid'],
  ['control', 'plan'],
  ['constraints'],
  ['sim'],
  ['metrics'],
  ['scenario'],
  ['pipeline'],
  ['study', 'export'],
];

/** The only packages the engine may import (pure computation, no DOM, Node, React, three or Electron). */
export const ENGINE_PACKAGES = ['gl-matrix', 'zod', 'satellite.js', 'astronomy-engine'];
