/**
 * The settings a run's metrics and Lyapunov monitor were computed with, in SI, kept with the run
 * and written into its JSON export: together with the exported samples (every sample, no
 * decimation) they are all an engineer needs to recompute each comparison column by hand
 * (test/reference/comparison-recompute.test.ts does exactly that). The values are the ones the
 * metrics used, not copies of the defaults: summarise.ts passes the same numbers to both.
 */
import { DETOUR_MIN_EXTRA_RAD, LIFT_DECIDED_ETA, UNWIND_MIN_EXTRA_RAD } from '../metrics/segments';

export interface MetricInputs {
  /** Settle thresholds: error angle to the segment's target, rad; body rate magnitude, rad/s. */
  settleAngleRad: number;
  settleRateRadPerS: number;
  /** Chatter: sliding window length, s, and the floor a commanded torque must exceed, N·m. */
  chatterWindowS: number;
  chatterFloorNm: number;
  /**
   * The reference's planned switch instants, ascending, s: every slew's start, end of acceleration,
   * start of deceleration and end when following the plan; only the slew starts when stepping to
   * each target. Chatter and the monitor do not count what happens across them.
   */
  plannedSwitchTimesS: number[];
  /** Worst-case bounded noise ē of the run: a segment starting with |η₀| < ē cannot unwind. */
  boundedNoiseEta: number;
  /** The law acts on the quaternion and picks a lift (true), or is defined on SO(3) (false). */
  liftDependent: boolean;
  /** How much longer than the short way the long way must be to count as unwinding, rad (this law's). */
  unwindMinExtraRad: number;
  /** |η| at a segment's end from which the way it went is decided. */
  liftDecidedEta: number;
  /** Lyapunov monitor: a flow rise counts above relTol·max|W| + noiseEnergy + absTol (J); jumps promise jumpDecrease. */
  monitor: { relTol: number; absTol: number; noiseEnergy: number; jumpDecrease: number };
}

export interface MetricInputSources {
  settleAngleRad: number;
  settleRateRadPerS: number;
  chatterWindowS: number;
  chatterFloorNm: number;
  plannedSwitchTimes: ArrayLike<number>;
  boundedNoiseEta: number;
  liftDependent: boolean;
  monitor: MetricInputs['monitor'];
}

export function metricInputsOf(s: MetricInputSources): MetricInputs {
  return {
    settleAngleRad: s.settleAngleRad,
    settleRateRadPerS: s.settleRateRadPerS,
    chatterWindowS: s.chatterWindowS,
    chatterFloorNm: s.chatterFloorNm,
    plannedSwitchTimesS: Array.from(s.plannedSwitchTimes),
    boundedNoiseEta: s.boundedNoiseEta,
    liftDependent: s.liftDependent,
    unwindMinExtraRad: s.liftDependent ? UNWIND_MIN_EXTRA_RAD : DETOUR_MIN_EXTRA_RAD,
    liftDecidedEta: LIFT_DECIDED_ETA,
    monitor: { ...s.monitor },
  };
}
