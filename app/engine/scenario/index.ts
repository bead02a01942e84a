/**
 * Public surface of the scenario module (file format v2): schema, migration of older files,
 * validation (pipeline stage 1), SI resolution (stage 2) and its inverse (toScenarioFile).
 */
export {
  SCENARIO_FORMAT,
  SCENARIO_VERSION,
  ScenarioSchema,
  AttitudeSchema,
  ControllerSchema,
  WheelsSchema,
  ATTITUDE_FORMS,
  scenarioJsonSchema,
} from './schema';
export type { Scenario, AttitudeSpec, AttitudeForm, ControllerSpec, KeepOutSpec, TargetSpec, WheelsSpec } from './schema';
export { migrateScenario } from './migrate';
export { validateScenario, wheelCount, capIssues, MAX_LISTED_ISSUES } from './validate';
export { resolveScenario, wheelSpecsOf } from './resolve';
export { loadScenario } from './load';
export type { ResolvedScenario, ResolvedController, ResolvedTarget, ResolvedVehicle, KeepOutCone } from './resolve';
export { QUATERNION_NORM_TOLERANCE } from './attitude';
export { parseIsoUtcMs, formatEpoch } from './utc';
