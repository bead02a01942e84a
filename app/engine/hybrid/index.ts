/**
 * Hybrid-system simulator (methods §7; Goebel, Sanfelice & Teel, IEEE CSM 29(2), 2009, and
 * their 2012 Princeton book). Semantics in simulate.ts; types in types.ts; options in options.ts.
 *
 *   const sys: HybridSystem = {
 *     dim, flow(t, x, dxdt),                  // F on C
 *     jumpGuard?(t, x),                       // D = {g ≥ 0}; C = {g ≤ 0} unless inFlowSet
 *     inFlowSet?(t, x), both?: 'jump' | 'flow',
 *     jump(t, x, xPlus, cause) → {what, from, to, why} | null,   // null: silent (timer) jump
 *     nextScheduledJump?(t, x),               // timers: landed on exactly, no root finding
 *     project?(x) → changed?, stop?() → boolean,
 *   };
 *   const r = simulateHybrid(sys, x0, { tEnd, integrator: { kind: 'rk4', dt } | { kind: 'dp54', rtol, atol },
 *                                       jMax?, maxJumpsPerInstant?, eventTimeTol?, record? });
 *   if (r.ok) r.value → { t, j, x, count, events, outcome: {status, message, t, j}, finalState, stats }
 *
 * The plain integrators (rk4Step, Rk4Stepper, DormandPrince) and the root finders are exported
 * for reuse and testing.
 */
export * from './types';
export * from './options';
export { simulateHybrid } from './simulate';
export { rk4Step, makeRk4Work, hermiteInterpolate, equalStepCount, Rk4Stepper } from './rk4';
export type { Rk4Work } from './rk4';
export { DormandPrince, makeDormandPrince } from './dp54';
export { validateDp54Options } from './dp54Options';
export type { Dp54Options } from './dp54Options';
export { locateCrossing, locateExit } from './roots';
export type { RootResult } from './roots';
export { ArcBuffer } from './arc';
