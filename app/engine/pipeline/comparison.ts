/**
 * The comparison table: one row per run, the same columns in the app, the CLI, the CSV/JSON of the
 * table and the study, each column with its unit, its definition and where the definition comes
 * from (shown one click away in the app and listed by `slewsmith compare --help`).
 */
import { monitorViolations } from '../metrics/monitor';
import { DEG_PER_RAD } from '../units';
import type { BestMarks, ComparisonRow, ControllerRun } from './types';

export interface ComparisonColumn {
  key: keyof ComparisonRow;
  label: string;
  /** Unit as displayed ('' for counts and words). */
  unit: string;
  /** One or two sentences: what the number means. */
  definition: string;
  /** Where the definition comes from. */
  source: string;
  /** Whether a best mark applies (lowest wins, settled runs only). */
  marked: boolean;
}

const METRICS_SRC = 'app/engine/metrics (definitions stated in the code; common practice, no single source)';
/** Appended to every error-angle column: what the angle is on a pointing-only (roll-free) segment. */
const POINTING_ANGLE =
  ' On a pointing-only (roll-free) segment the angle is the POINTING error of the body axis b, ∠(R(q)b, R(q_ref)b), for every law: the roll about b is not an error there.';

export const COMPARISON_COLUMNS: readonly ComparisonColumn[] = [
  {
    key: 'status',
    label: 'Outcome',
    unit: '',
    definition:
      'Settled: every segment stayed within the settle thresholds to its end. Not settled: the run reached its end without that. Failed: the simulation stopped early (non-finite state, too many jumps at one instant).',
    source: METRICS_SRC,
    marked: false,
  },
  {
    key: 'settleTimeS',
    label: 'Settle time',
    unit: 's',
    definition:
      "Longest over the segments of: the time from the segment's slew start until the error to its TARGET and the body rate stay below the scenario's settle thresholds through the segment's end." +
      POINTING_ANGLE,
    source: METRICS_SRC,
    marked: true,
  },
  {
    key: 'trackingErrorPeakDeg',
    label: 'Tracking error, peak',
    unit: 'deg',
    definition:
      'Largest angle between the attitude and the reference (the planned profile when following the plan, the target when stepping to it).' +
      POINTING_ANGLE,
    source: METRICS_SRC,
    marked: true,
  },
  {
    key: 'trackingErrorRmsDeg',
    label: 'Tracking error, RMS',
    unit: 'deg',
    definition: 'Root mean square over the run of the angle between the attitude and the reference.' + POINTING_ANGLE,
    source: METRICS_SRC,
    marked: true,
  },
  {
    key: 'rotationTravelledDeg',
    label: 'Rotation travelled',
    unit: 'deg',
    definition: 'Integral of the body rate magnitude over the run (sum over segments).',
    source: METRICS_SRC,
    marked: true,
  },
  {
    key: 'shortestRotationDeg',
    label: 'Shortest rotation',
    unit: 'deg',
    definition: "Sum over segments of the rotation angle from the segment's starting attitude to its target." + POINTING_ANGLE,
    source: METRICS_SRC,
    marked: false,
  },
  {
    key: 'unwound',
    label: 'Unwound',
    unit: '',
    definition:
      'Some segment went the long way round (through the 180° error attitude) although that was at least 2° longer than the short way, from a start outside the worst-case noise band.',
    source: 'Bhat & Bernstein, Systems & Control Letters 39(1), 2000 (unwinding); threshold: common practice, no source',
    marked: false,
  },
  { key: 'jumps', label: 'Jumps', unit: '', definition: 'Logic jumps of a hybrid law over the run.', source: METRICS_SRC, marked: true },
  {
    key: 'chatterPerS',
    label: 'Chatter',
    unit: '1/s',
    definition:
      "Reversals of the commanded torque direction above 2 % of the wheels' torque limit, per second in the busiest 10 s window; reversals at the plan's own switches are not counted.",
    source: METRICS_SRC,
    marked: true,
  },
  {
    key: 'peakWheelTorqueFraction',
    label: 'Peak wheel torque',
    unit: '%',
    definition: 'Largest delivered wheel torque as a fraction of that wheel’s limit.',
    source: METRICS_SRC,
    marked: true,
  },
  {
    key: 'peakWheelMomentumFraction',
    label: 'Peak wheel momentum',
    unit: '%',
    definition: 'Largest wheel momentum as a fraction of that wheel’s limit.',
    source: METRICS_SRC,
    marked: true,
  },
  {
    key: 'controlEffortNms',
    label: 'Effort ∫|τ| dt',
    unit: 'mN·m·s',
    definition: 'Integral of the delivered body torque magnitude over the run.',
    source: METRICS_SRC,
    marked: true,
  },
  {
    key: 'finalErrorDeg',
    label: 'Final error',
    unit: 'deg',
    definition: "Angle to the last segment's target at the end of the run." + POINTING_ANGLE,
    source: METRICS_SRC,
    marked: true,
  },
  {
    key: 'monitorViolations',
    label: 'Lyapunov violations',
    unit: '',
    definition:
      "Flow intervals where the law's Lyapunov value W rose by more than its tolerance, and jumps that lowered W by less than promised; rises across the plan's own acceleration steps are listed apart, not counted.",
    source:
      'Mayhew, Sanfelice & Teel, IEEE TAC 56(11), 2011; Mayhew & Teel, IEEE TAC 58(11), 2013 (the promised decrease); tolerance: app/engine/metrics/monitor.ts',
    marked: true,
  },
];

export function comparisonRow(r: ControllerRun): ComparisonRow {
  const m = r.metrics;
  return {
    key: r.key,
    controllerId: r.controllerId,
    label: r.label,
    mode: r.mode,
    verdict: r.verdict.kind,
    status: r.verdict.text,
    settleTimeS: m.settleTimeS,
    trackingErrorPeakDeg: m.trackingErrorPeakRad * DEG_PER_RAD,
    trackingErrorRmsDeg: m.trackingErrorRmsRad * DEG_PER_RAD,
    rotationTravelledDeg: m.rotationTravelledRad * DEG_PER_RAD,
    shortestRotationDeg: m.shortestRotationRad * DEG_PER_RAD,
    unwound: m.unwound,
    jumps: m.jumps,
    chatterPerS: m.chatterPerS,
    peakWheelTorqueFraction: m.peakWheelTorqueFraction,
    peakWheelMomentumFraction: m.peakWheelMomentumFraction,
    controlEffortNms: m.controlEffortNms,
    finalErrorDeg: m.finalErrorRad * DEG_PER_RAD,
    monitorViolations: monitorViolations(r.monitor).length,
  };
}

/** Columns that get a best mark (lowest wins). */
export const MARKED_COLUMNS: readonly (keyof ComparisonRow)[] = COMPARISON_COLUMNS.filter((c) => c.marked).map((c) => c.key);

/** Two values this close (relative, or both below 1e-12) count as a tie. */
const TIE_RELATIVE = 1e-9;

/**
 * Lowest value wins in each column, among SETTLED runs only (an unsettled or failed run never gets
 * a mark), and only when one run is strictly best: a tie at the best value marks nobody.
 */
export function bestMarks(rows: readonly ComparisonRow[]): BestMarks {
  const best: BestMarks = {};
  const eligible = rows.filter((r) => r.verdict === 'settled');
  for (const col of MARKED_COLUMNS) {
    const vals = eligible
      .map((r) => ({ key: r.key, v: r[col] }))
      .filter((x): x is { key: string; v: number } => typeof x.v === 'number' && Number.isFinite(x.v))
      .sort((a, b) => a.v - b.v);
    const first = vals[0];
    const second = vals[1];
    const tied = (a: number, b: number) =>
      Math.abs(a - b) <= TIE_RELATIVE * Math.max(Math.abs(a), Math.abs(b)) || Math.max(Math.abs(a), Math.abs(b)) < 1e-12;
    best[col] = first && second && !tied(first.v, second.v) ? first.key : null;
  }
  return best;
}
