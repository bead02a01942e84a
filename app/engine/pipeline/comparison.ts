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
      "Longest over the segments of: the time from the segment's first sample (its slew start; a segment runs to the next slew start) to the first sample from which, through the segment's last sample, the angle to the segment's TARGET and the body rate magnitude are both below the scenario's settle thresholds." +
      POINTING_ANGLE,
    source: METRICS_SRC,
    marked: true,
  },
  {
    key: 'trackingErrorPeakDeg',
    label: 'Tracking error, peak',
    unit: 'deg',
    definition:
      'Largest angle over the samples between the attitude and the reference (the planned profile when following the plan, the target when stepping to it).' +
      POINTING_ANGLE,
    source: METRICS_SRC,
    marked: true,
  },
  {
    key: 'trackingErrorRmsDeg',
    label: 'Tracking error, RMS',
    unit: 'deg',
    definition:
      'Time-weighted root mean square over the run of the angle θ between the attitude and the reference: √(∫θ² dt / run length), trapezoidal over the samples.' +
      POINTING_ANGLE,
    source: METRICS_SRC,
    marked: true,
  },
  {
    key: 'rotationTravelledDeg',
    label: 'Rotation travelled',
    unit: 'deg',
    definition:
      "Integral of the body rate magnitude ∫‖ω‖ dt over the run, trapezoidal over the samples (the sum of the segments' shares, each from its first sample to the next segment's first).",
    source: METRICS_SRC,
    marked: true,
  },
  {
    key: 'shortestRotationDeg',
    label: 'Shortest rotation',
    unit: 'deg',
    definition: "Sum over segments of the rotation angle from the attitude at the segment's first sample to its target." + POINTING_ANGLE,
    source: METRICS_SRC,
    marked: false,
  },
  {
    key: 'unwound',
    label: 'Unwound',
    unit: '',
    definition:
      'Some segment went the long way round: the scalar part η of the error quaternion q_target* ⊗ q ended (|η| ≥ 0.5) with the opposite sign to its start, i.e. through the 180° error attitude, although the long way was at least 2° longer than the short way (at least 90° for a law defined on SO(3), which picks no sign of q), from a start outside the worst-case noise band (|η₀| ≥ ē).',
    source: 'Bhat & Bernstein, Systems & Control Letters 39(1), 2000 (unwinding); threshold: common practice, no source',
    marked: false,
  },
  {
    key: 'jumps',
    label: 'Jumps',
    unit: '',
    definition: 'Logic jumps of a hybrid law over the run (the rise of the jump counter j).',
    source: METRICS_SRC,
    marked: true,
  },
  {
    key: 'chatterPerS',
    label: 'Chatter',
    unit: '1/s',
    definition:
      "Reversals of the commanded body torque: a torque above 2 % of the smallest wheel torque limit pointing more than 90° from the previous such torque. Counted per second in the busiest 10 s window; a reversal whose span (from the previous such sample to this one, widened by one sample each side) holds a planned switch of the reference is the plan's own and not counted.",
    source: METRICS_SRC,
    marked: true,
  },
  {
    key: 'peakWheelTorqueFraction',
    label: 'Peak wheel torque',
    unit: '%',
    definition:
      'Largest delivered motor torque of a wheel (after the limits, before bearing friction) over the samples, as a fraction of that wheel’s torque limit.',
    source: METRICS_SRC,
    marked: true,
  },
  {
    key: 'peakWheelMomentumFraction',
    label: 'Peak wheel momentum',
    unit: '%',
    definition: 'Largest wheel momentum magnitude over the samples, as a fraction of that wheel’s momentum limit.',
    source: METRICS_SRC,
    marked: true,
  },
  {
    key: 'controlEffortNms',
    label: 'Effort ∫|τ| dt',
    unit: 'mN·m·s',
    definition: 'Integral of the delivered body torque magnitude ∫‖τ‖ dt over the run, trapezoidal over the samples.',
    source: METRICS_SRC,
    marked: true,
  },
  {
    key: 'finalErrorDeg',
    label: 'Final error',
    unit: 'deg',
    definition: "Angle from the attitude at the run's last sample to the last segment's target." + POINTING_ANGLE,
    source: METRICS_SRC,
    marked: true,
  },
  {
    key: 'monitorViolations',
    label: 'Lyapunov violations',
    unit: '',
    definition:
      "Rises of the law's Lyapunov value W during a flow (samples with the same jump counter and segment): each stretch over which W increases from every sample to the next counts once when its total rise exceeds the tolerance, 0.1 % of the run's largest |W| plus the energy sensor noise alone moves W by; plus each jump that lowered W by less than the law's promised decrease. Rises across the plan's own switches are listed apart, not counted.",
    source:
      'Mayhew, Sanfelice & Teel, IEEE TAC 56(11), 2011; Mayhew & Teel, IEEE TAC 58(11), 2013 (the promised decrease); tolerance: app/engine/metrics/monitor.ts',
    marked: true,
  },
  {
    key: 'constraintMarginDeg',
    label: 'Constraint margin',
    unit: 'deg',
    definition:
      "Smallest margin over the run of every attitude constraint of the scenario: for a keep-out cone the angle between the body axis and the direction less (half-angle + margin), for a keep-in cone (half-angle − margin) less that angle. Negative: violated (the outcome says which and when). Checked on the run's own samples, the margin interpolated linearly between them.",
    source:
      'Cone constraints as in Kjellberg & Lightsey, JGCD 36(5):1301–1309, 2013; margin convention: app/engine/constraints/types.ts (derived for this project)',
    marked: false,
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
    constraintMarginDeg:
      r.constraints && Number.isFinite(r.constraints.minimumMarginRad) ? r.constraints.minimumMarginRad * DEG_PER_RAD : null,
  };
}

/** Columns that get a best mark (lowest wins). */
export const MARKED_COLUMNS: readonly (keyof ComparisonRow)[] = COMPARISON_COLUMNS.filter((c) => c.marked).map((c) => c.key);

/** Two values this close (relative, or both below 1e-12) count as a tie. */
const TIE_RELATIVE = 1e-9;

/**
 * Lowest value wins in each column, among SETTLED runs only (an unsettled or failed run never gets
 * a mark, nor does one that violated an attitude constraint), and only when one run is strictly
 * best: a tie at the best value marks nobody.
 */
export function bestMarks(rows: readonly ComparisonRow[]): BestMarks {
  const best: BestMarks = {};
  // A run that violated an attitude constraint gets no mark either (its margin is negative).
  const eligible = rows.filter((r) => r.verdict === 'settled' && !(r.constraintMarginDeg !== null && r.constraintMarginDeg < 0));
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
