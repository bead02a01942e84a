/**
 * Stages 5–6 for a run whose history nobody reads (a study case): the same flight as
 * run.ts flyAndSummarise, with the metrics computed as the run goes (metrics/online.ts) instead of
 * from a stored trace, so no trace is allocated. Same metrics and verdict, bit for bit
 * (test/property/metrics-online.test.ts). Only for scenarios whose summary needs nothing but the
 * metrics: no attitude constraints (their check reads the attitude history) and no orbit tracking
 * (its window errors do); `onlineFlightPossible` says so, and the caller flies the trace path
 * otherwise.
 */
import { OnlineMetrics, type ErrorGrid, type OnlineParts } from '../metrics/online';
import type { RunMetrics } from '../metrics/metrics';
import type { JumpEvent, RunMode, RunOutcome } from '../sim/types';
import { fly, scenarioFlight } from './fly';
import type { Prepared } from './run';
import { metricContext, metricOptionsOf, verdictOf } from './summarise';
import type { BuiltController, RunVerdict } from './types';
import type { SensorNoiseTape } from '../sim/noiseTape';

export interface OnlineRun {
  controllerId: string;
  outcome: RunOutcome;
  jumps: JumpEvent[];
  metrics: RunMetrics;
  verdict: RunVerdict;
  /** The recorder after the run: samples taken, last time and attitude, the error-angle grid. */
  recorder: OnlineMetrics;
}

/** True when a run of this prepared scenario can be summarised without its trace. */
export function onlineFlightPossible(p: Prepared): boolean {
  return p.constraints.constraints.length === 0 && !p.plan.tracking;
}

/**
 * Fly controller c in `mode` and summarise it online; `grid`: the error-angle samples to keep;
 * `noiseTape`: the sensor noise read from this tape (sim/noiseTape.ts; the same values as drawn);
 * `parts`: 'study-row' leaves out the metrics no study row reads (metrics/online.ts OnlineParts).
 */
export function flyOnline(
  p: Prepared,
  c: BuiltController,
  mode: RunMode,
  grid: ErrorGrid | null,
  shouldStop?: () => boolean,
  noiseTape?: SensorNoiseTape,
  parts: OnlineParts = 'all',
): OnlineRun {
  const flight = scenarioFlight(p.scenario, p.vehicle, p.plan, p.targets, c, mode, shouldStop);
  const m = metricContext(p.scenario, p.vehicle, p.targets, p.plan, mode, flight.sensors);
  const recorder = new OnlineMetrics(p.vehicle.wheels.n, metricOptionsOf(m, c.liftDependent), grid, parts);
  const res = fly({ ...flight, sink: recorder, ...(noiseTape ? { noiseTape } : {}) });
  const metrics = recorder.metrics(res.jumps);
  return { controllerId: c.id, outcome: res.outcome, jumps: res.jumps, metrics, verdict: verdictOf(res.outcome, metrics), recorder };
}
