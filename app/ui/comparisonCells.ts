/**
 * What each cell of the comparison table says (the columns, units, definitions and best marks
 * are the engine's: pipeline/comparison.ts). The wheel peaks name the wheel and the time, from the
 * run's metrics (metrics/wheels.ts WheelPeak): "100 % (wheel 2, 45.1 s)".
 */
import type { ComparisonRow, ControllerRun } from '../engine/pipeline/types';
import type { WheelPeak } from '../engine/metrics/metrics';
import { MILLI_PER_SI } from '../engine/units';
import { fmt, pct } from './format';

/** "83 % (wheel 2, 45.1 s)"; just the percentage when no wheel is named. */
export function peakText(p: WheelPeak): string {
  if (!(p.wheel > 0)) return pct(p.fraction);
  return `${pct(p.fraction)} (wheel ${p.wheel}, ${fmt(p.atS, 4)} s)`;
}

type Show = (r: ComparisonRow, run: ControllerRun | undefined) => string;

const SHOW: Partial<Record<keyof ComparisonRow, Show>> = {
  status: (r) => r.status,
  settleTimeS: (r) => (r.settleTimeS === null ? 'never' : fmt(r.settleTimeS, 4)),
  trackingErrorPeakDeg: (r) => fmt(r.trackingErrorPeakDeg, 3),
  trackingErrorRmsDeg: (r) => fmt(r.trackingErrorRmsDeg, 3),
  rotationTravelledDeg: (r) => fmt(r.rotationTravelledDeg, 4),
  shortestRotationDeg: (r) => fmt(r.shortestRotationDeg, 4),
  unwound: (r) => (r.unwound ? 'yes' : 'no'),
  jumps: (r) => String(r.jumps),
  chatterPerS: (r) => fmt(r.chatterPerS, 3),
  peakWheelTorqueFraction: (r, run) => (run ? peakText(run.metrics.peakTorque) : pct(r.peakWheelTorqueFraction)),
  peakWheelMomentumFraction: (r, run) => (run ? peakText(run.metrics.peakMomentum) : pct(r.peakWheelMomentumFraction)),
  controlEffortNms: (r) => fmt(r.controlEffortNms * MILLI_PER_SI, 4),
  finalErrorDeg: (r) => fmt(r.finalErrorDeg, 3),
  monitorViolations: (r) => String(r.monitorViolations),
  constraintMarginDeg: (r) => (r.constraintMarginDeg === null ? '–' : fmt(r.constraintMarginDeg, 3)),
};

/** The text of one cell. */
export function cellText(key: keyof ComparisonRow, row: ComparisonRow, run: ControllerRun | undefined): string {
  const f = SHOW[key];
  return f ? f(row, run) : String(row[key]);
}
