/**
 * The scenario file's format name, version and the orbit horizon's default, kept apart from the
 * zod schemas (schema.ts, orbitSchema.ts re-export them) so that code which only needs these
 * values — migration, resolution — does not build the schemas when it is loaded (issue 12: the
 * pipeline worker flies the bundled demo without loading the validator).
 */

export const SCENARIO_FORMAT = 'slewsmith-scenario';
export const SCENARIO_VERSION = 2;

/** Horizon when the file gives none, s (one day). */
export const DEFAULT_HORIZON_S = 86400;
