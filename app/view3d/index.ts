/**
 * The 3D attitude view. The UI needs only `createAttitudeView` and the types; the renderer-free
 * `AttitudeScene` is exported for tests, benchmarks and headless use.
 */
export { createAttitudeView } from './view';
export type { AttitudeViewHandle, AttitudeViewOptions } from './view';
export { AttitudeScene, defaultViewOptions } from './attitudeScene';
export type { AttitudeSceneOptions } from './attitudeScene';
export { parseBusModel, buildBusGroup, BUS_MODEL_FORMAT } from './busModel';
export type { BusModel, BusPart } from './busModel';
export { DEFAULT_BUS_MODEL } from './defaultBus';
export { MOMENTUM_AMBER_FRACTION, MOMENTUM_RED_FRACTION, momentumLevel } from './style';
export type { MomentumLevel } from './style';
export type {
  AttitudeView,
  KeepOutCone,
  LogicKind,
  MomentumEnvelopeMesh,
  ViewJump,
  ViewLayout,
  ViewOptions,
  ViewRun,
  ViewStats,
  ViewTarget,
} from './types';
