/**
 * Attitude constraints: keep-out / keep-in cones on body axes (types.ts), their validation,
 * the history and reference check (check.ts), and the constrained slew planner (slew.ts).
 */
export type {
  AttitudeConstraint,
  AttitudeHistory,
  ConstraintCheck,
  ConstraintKind,
  ConstraintWindow,
  DirectionSource,
  FixedDirectionSource,
  HistoryCheck,
  PreparedConstraint,
  PreparedSource,
  SampledDirectionSource,
  ViolationInterval,
} from './types';
export { attitudeViolations, prepareConstraints, targetKeepInViolations } from './validate';
export { attitudeMargin, sourceAt } from './source';
export { checkAttitudeHistory, checkPreparedHistory, checkReference, type CheckOptions } from './check';
export {
  planConstrainedSlew,
  PLAN_CLEARANCE_RAD,
  type ConstrainedSlewInput,
  type ConstrainedSlewPlan,
  type ConstrainedSlewVerdict,
} from './slew';
export type { TimedLeg } from './legs';
export { DEFAULT_GRID_LEVEL, geodesicGrid, type GeodesicGrid } from './geodesic';
export { DEFAULT_LATTICE_LEVEL, DEFAULT_ROLL_BINS } from './lattice';
