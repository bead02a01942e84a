/**
 * Pointing-only (reduced-attitude) control on S²: one body axis on one inertial direction, roll
 * free. Smooth PD against a synergistic hybrid law with its certificate, a worst-case noise model
 * that stalls the smooth law near the antipode, and the reduced slew for the planner.
 * Not registered in ../index.ts or the scenario schema (the law registry does that).
 */
export type { SphereFamily, SphereWorkspace } from './potential';
export {
  evaluateSphereFamily,
  evenWarpDirections,
  makeSphereFamily,
  makeSphereWorkspace,
  pointingAngle,
  pointingGradient,
  pointingPotential,
  sphereMemberGradient,
  sphereWarpJacobianDet,
  sphereWarpMarginClosedForm,
} from './potential';
export type { SphereCertificateResult, SphereCertifyOptions, SphereCertifyParams } from './certificate';
export { certifySphereFamily, clearSphereCertificateCache, sphereFamilyInputIssues } from './certificate';
export type { SphereCriticalPoint, SphereSamplingCheck } from './critical';
export { ReducedPd, ReducedSynergistic, reducedGainsFromBandwidth } from './laws';
export type { ReducedBandwidthGains } from './laws';
export { makeReducedPd, makeReducedSynergistic } from './build';
export type { ReducedPdSpec, ReducedSynergisticSpec } from './build';
export { applyAntipodalStall } from './noise';
export { reducedSlewSaving, reducedTargetAttitude } from './slew';
export type { PlannedSlew, ReducedSlew, ReducedSlewSaving, SlewPlanner } from './slew';
