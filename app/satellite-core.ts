/**
 * The parts of satellite.js the engine uses, for the renderer build only (vite.config.ts aliases
 * `satellite.js` here). The package's root entry also re-exports its WebAssembly build, whose
 * top-level await cannot go into the app's classic (iife) Web Workers; the engine never uses it.
 * Node (the CLI, the tests) keeps importing the package itself.
 */
export * as constants from '../node_modules/satellite.js/dist/constants.js';
export { twoline2satrec, json2satrec } from '../node_modules/satellite.js/dist/io.js';
export { propagate, sgp4, gstime } from '../node_modules/satellite.js/dist/propagation.js';
export * from '../node_modules/satellite.js/dist/common-types.js';
