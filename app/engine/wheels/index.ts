/**
 * Reaction-wheel arrays: geometry presets, validation, torque allocation, direction-preserving
 * limits and zonotope envelopes. See each file's header for the model and its sources.
 */
export type { WheelSpec, WheelArray } from './array';
export { MAX_WHEELS, makeWheelArray, applyPinv, applyAxes, bodyTorqueFromWheelTorque, peakTorqueRatio } from './array';
export type { WheelLimits, PyramidOptions } from './presets';
export { orthogonalTriad, pyramid } from './presets';
export { allocateMinNorm, allocateMinMax, allocateMinMaxLp } from './allocation';
export type { LimitInfo, LimitReason } from './limits';
export { createLimitInfo, limitWheelTorque, limitWheelTorqueStep, nullSpaceMomentumBleed } from './limits';
export type { Zonotope } from './envelope';
export {
  torqueEnvelope,
  momentumEnvelope,
  makeZonotope,
  envelopeSupport,
  envelopeCapacity,
  envelopeBindingFace,
  envelopeContains,
} from './envelope';
