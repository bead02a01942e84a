/** Public surface of the scenario module (file format v1): schema, validation, SI resolution. */
export {
  SCENARIO_FORMAT,
  SCENARIO_VERSION,
  ScenarioSchema,
  AttitudeSchema,
  ControllerSchema,
  WheelsSchema,
  ATTITUDE_FORMS,
  CONTROL_LAWS,
  scenarioJsonSchema,
} from './schema';
export type {
  Scenario,
  AttitudeSpec,
  AttitudeForm,
  ControllerSpec,
  ControlLaw,
  GainsSpec,
  KeepOutSpec,
  TargetSpec,
  WheelsSpec,
} from './schema';
export { validateScenario, wheelCount } from './validate';
export { resolveScenario, loadScenario } from './resolve';
export type { ResolvedScenario, ResolvedController, ResolvedGains, ResolvedTarget, ResolvedWheels } from './resolve';
export { QUATERNION_NORM_TOLERANCE } from './attitude';
export { parseIsoUtcMs, formatEpoch } from './utc';
