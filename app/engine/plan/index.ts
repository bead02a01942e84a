/** Slew planner: eigenaxis rest-to-rest references within wheel envelopes, sequences, evaluation. */
export type {
  BindingLimit,
  InfeasibleSegment,
  PlanLimits,
  ProfileKind,
  ReferenceTable,
  RestToRestProfile,
  SegmentPlan,
  SegmentVerdict,
  SequencePlan,
  TimelineEntry,
} from './types';
export { restToRestProfile, profileAt, profileStateAt, profileSwitchTimes } from './profile';
export { planSegment, planCheckedSegment, type SegmentInput } from './segment';
export { planSequence, buildReferenceTable, type SequenceInput, type SequenceTarget } from './sequence';
export { evaluateReference, evaluatePlannedLoads, referenceEntryAt } from './reference';
export { boxCapacity, cubeCapacity } from './limits';
