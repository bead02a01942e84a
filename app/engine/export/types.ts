/**
 * What the exporters take besides the trace and the resolved scenario. Metrics and plan are
 * opaque JSON-able objects here (the JSON export copies them; other writers ignore them).
 */
import type { JumpEvent } from '../sim/types';
import type { ExportConstraint } from './constraintColumns';

export interface ExportSegment {
  /** Maneuver segment index (the trace's `segment` value). */
  index: number;
  label: string;
  /** Seconds from the scenario epoch. */
  startS: number;
  stopS: number;
}

export interface ExportMeta {
  toolName: string;
  toolVersion: string;
  controllerLabel: string;
  controllerId?: string;
  /** Segment boundaries; derived from the trace's `segment` channel when absent. */
  segments?: readonly ExportSegment[];
  jumpEvents?: readonly JumpEvent[];
  metrics?: unknown;
  plan?: unknown;
  /** The wheels the run flew: unit axes (3 per wheel, body) and per-wheel limits, SI. */
  wheels?: { axes: ArrayLike<number>; maxTorqueNm: ArrayLike<number>; maxMomentumNms: ArrayLike<number> };
  /** The run checked against the scenario's attitude constraints (constraintColumns.ts): margin columns and AEM comments. */
  constraints?: readonly ExportConstraint[];
}
