/**
 * The quantities a study summarises per controller, each with its fixed histogram bins (fixed, so
 * two studies — or two shards — can be compared and merged bin by bin):
 * - settle time: 20 equal bins over [0, durationS] s; runs that never settled count as +∞ (in
 *   the overflow, "did not settle in time", and left out of the moments);
 * - rotation travelled and extra rotation: 24 bins of 15° over [0°, 360°], overflow beyond one turn;
 * - jumps: one bin per count 0…9, overflow ≥ 10;
 * - chatter: edges 0, 0.1, 0.2, 0.5, 1, 2, 5 events/s, overflow ≥ 5 (log-like: most runs sit
 *   near 0.2, chattering ones spread over decades);
 * - peak wheel momentum / torque: 20 bins of 5 % over [0, 100 %] of the case's (degraded) limit
 *   (the limiter keeps a run at or below 100 %, which falls in the last bin);
 * - final error: edges 0, 0.01, 0.03, 0.1, 0.3, 1, 3, 10, 30, 90°, overflow up to 180°.
 * These are the DISPLAY bins. The summaries count into FINE bins — each display bin cut into
 * `sub` equal parts (integer quantities are not cut) — so that medians and 95th percentiles are
 * located to a tenth of a display bin; the display counts are sums of fine counts.
 */
import { uniformEdges } from '../math/stats';
import type { StudyDefinition } from '../scenario/study';
import type { CaseRun } from './runCase';

export type QuantityKey =
  | 'settleTimeS'
  | 'rotationTravelledDeg'
  | 'extraRotationDeg'
  | 'jumps'
  | 'chatterPerS'
  | 'peakWheelMomentumFraction'
  | 'peakWheelTorqueFraction'
  | 'finalErrorDeg';

export interface QuantityDef {
  key: QuantityKey;
  /** What it is, in words, and its unit (as the summary's histograms name them). */
  quantity: string;
  unit: string;
  /** Display bin edges. */
  edges: (def: StudyDefinition) => number[];
  /** Fine bins per display bin (1: whole-number quantity, quantiles are exact). */
  sub: number;
  /** The run's value; +∞ for "never" (settle time of a run that did not settle). */
  value: (r: CaseRun) => number;
}

const SUB = 10;

export const QUANTITIES: readonly QuantityDef[] = [
  {
    key: 'settleTimeS',
    quantity: 'settle time',
    unit: 's',
    edges: (d) => uniformEdges(0, d.durationS, 20),
    sub: SUB,
    value: (r) => (r.status === 'settled' && r.settleTimeS !== null ? r.settleTimeS : Infinity),
  },
  {
    key: 'rotationTravelledDeg',
    quantity: 'rotation travelled',
    unit: 'deg',
    edges: () => uniformEdges(0, 360, 24),
    sub: SUB,
    value: (r) => r.rotationTravelledDeg,
  },
  {
    key: 'extraRotationDeg',
    quantity: 'extra rotation (travelled minus shortest)',
    unit: 'deg',
    edges: () => uniformEdges(0, 360, 24),
    sub: SUB,
    value: (r) => r.extraRotationDeg,
  },
  { key: 'jumps', quantity: 'logic jumps', unit: 'count', edges: () => uniformEdges(0, 10, 10), sub: 1, value: (r) => r.jumps },
  {
    key: 'chatterPerS',
    quantity: 'chatter',
    unit: 'events/s',
    edges: () => [0, 0.1, 0.2, 0.5, 1, 2, 5],
    sub: SUB,
    value: (r) => r.chatterPerS,
  },
  {
    key: 'peakWheelMomentumFraction',
    quantity: 'peak wheel momentum',
    unit: 'fraction of limit',
    edges: () => uniformEdges(0, 1, 20),
    sub: SUB,
    value: (r) => r.peakWheelMomentumFraction,
  },
  {
    key: 'peakWheelTorqueFraction',
    quantity: 'peak wheel torque',
    unit: 'fraction of limit',
    edges: () => uniformEdges(0, 1, 20),
    sub: SUB,
    value: (r) => r.peakWheelTorqueFraction,
  },
  {
    key: 'finalErrorDeg',
    quantity: 'final error',
    unit: 'deg',
    edges: () => [0, 0.01, 0.03, 0.1, 0.3, 1, 3, 10, 30, 90],
    sub: SUB,
    value: (r) => r.finalErrorDeg,
  },
];

/** Each display bin [a, b] cut into `sub` equal parts; every display edge is kept exactly. */
export function fineEdges(display: readonly number[], sub: number): number[] {
  const out: number[] = [];
  for (let k = 0; k + 1 < display.length; k++) {
    const a = display[k]!,
      b = display[k + 1]!;
    for (let j = 0; j < sub; j++) out.push(j === 0 ? a : a + ((b - a) * j) / sub);
  }
  out.push(display[display.length - 1]!);
  return out;
}
