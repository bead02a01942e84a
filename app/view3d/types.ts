/**
 * Public types of the 3D attitude view. The React UI builds `ViewRun`s from engine results and
 * drives the view imperatively (`createAttitudeView` in view.ts); nothing here goes through React.
 */
import type { RunTrace } from '../engine/sim/types';

export type ViewLayout = 'single' | 'overlay' | 'side-by-side';

export type LogicKind = 'none' | 'sign' | 'index';

export interface ViewJump {
  t: number;
  /** Jump counter after the jump. */
  j: number;
  from: number;
  to: number;
}

export interface ViewTarget {
  tStart: number;
  tEnd: number;
  /** Target attitude qInertialFromBody, [x, y, z, w]. */
  q: Float64Array;
  label: string;
}

export interface MomentumEnvelopeMesh {
  /** 3V, body frame, N·m·s. */
  vertices: Float64Array;
  /** 3T vertex indices, counter-clockwise seen from outside (outward normals). */
  triangles: Uint32Array;
}

export interface ViewRun {
  label: string;
  trace: RunTrace;
  /** Logic jumps, sorted by time. */
  jumps: ViewJump[];
  /** Maneuver segments' targets, sorted by tStart. */
  targets: ViewTarget[];
  /** Profiled mode: trace.qRef is a moving reference, drawn as a second ghost. */
  hasReference: boolean;
  /** Unit spin axes in body axes, 3 per wheel. */
  wheelAxes: Float64Array;
  /** Per-wheel momentum limit, N·m·s. */
  maxMomentumNms: Float64Array;
  momentumEnvelope: MomentumEnvelopeMesh;
  /** Envelope capacity (N·m·s) along a unit body direction; the engine's function. */
  momentumCapacity: (dirBody: Float64Array) => number;
  logicKind: LogicKind;
}

/** A named inertial direction the boresight must stay away from. */
export interface KeepOutCone {
  label: string;
  /** Inertial direction (need not be unit; zero vectors are ignored). */
  dirInertial: ArrayLike<number>;
  /** Half angle, rad, in (0, π/2]. */
  halfAngleRad: number;
  /** Whether the shown run's margin to this cone is negative at the current time (colours the cone); absent: not known. */
  violated?: boolean;
  /** The direction moves with time (Sun, Moon, Earth, ground station): the UI re-aims the cone as the time moves. */
  moving?: boolean;
}

/** The empty cone list, one shared instance (option changes are detected by identity). */
export const NO_KEEP_OUT: readonly KeepOutCone[] = Object.freeze([]);

export interface ViewOptions {
  /** Body axis whose path the trail draws (need not be unit). Default: the bus model's boresight. */
  boresightBody: ArrayLike<number>;
  showInertialTriad: boolean;
  showBody: boolean;
  showBodyTriad: boolean;
  showTarget: boolean;
  showReference: boolean;
  showSphere: boolean;
  showTrail: boolean;
  showGreatCircle: boolean;
  showJumpMarkers: boolean;
  showMomentum: boolean;
  showEnvelope: boolean;
  showKeepOut: boolean;
  keepOut: KeepOutCone[];
  /** Opacity of the second and later bodies in the overlay layout. */
  overlayOpacity: number;
  /** Momentum inset camera: a fixed oblique view of the body frame, or the main camera's view carried into body axes. */
  momentumCamera: 'fixed' | 'match-main';
}

export interface ViewStats {
  /** Script time of the last setTime (ms, performance.now()). */
  lastUpdateMs: number;
}

export interface AttitudeView {
  setRuns(runs: ViewRun[], layout: ViewLayout): void;
  setTime(t: number): void;
  setOptions(o: Partial<ViewOptions>): void;
  resetCamera(): void;
  resize(width: number, height: number): void;
  render(): void;
  dispose(): void;
  readonly stats: ViewStats;
}
