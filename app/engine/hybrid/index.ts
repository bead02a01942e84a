/** Hybrid-system simulator: public surface (see simulate.ts for the semantics). */
export * from './types';
export * from './options';
export { simulateHybrid } from './simulate';
export { rk4Step, makeRk4Work, hermiteInterpolate, equalStepCount, Rk4Stepper } from './rk4';
export type { Rk4Work } from './rk4';
export { DormandPrince, makeDormandPrince, validateDp54Options } from './dp54';
export type { Dp54Options } from './dp54';
export { locateCrossing, locateExit } from './roots';
export type { RootResult } from './roots';
export { ArcBuffer } from './arc';
