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
  /** What the metrics were computed with, the monitor's flags, how the run ended and its verdict (opaque, JSON-able). */
  metricInputs?: unknown;
  monitor?: unknown;
  outcome?: unknown;
  verdict?: unknown;
  plan?: unknown;
  /**
   * Set when the run did not reach its planned end or failed (pipeline/outcome.ts runEndNote): one
   * sentence, starting "RUN TRUNCATED" or "RUN FAILED", that every writer puts in its header.
   */
  incomplete?: string;
  /** The wheels the run flew: unit axes (3 per wheel, body) and per-wheel limits, SI. */
  wheels?: { axes: ArrayLike<number>; maxTorqueNm: ArrayLike<number>; maxMomentumNms: ArrayLike<number> };
  /** The run checked against the scenario's attitude constraints (constraintColumns.ts): margin columns and AEM comments. */
  constraints?: readonly ExportConstraint[];
}
