/**
 * Theory lines for the robustness maps: where a published result says where a law's boundary
 * lies, the line in the sweep's parameter plane, with its citation. The map view draws them over
 * the measured boundary; sweep.json carries them.
 *
 * Hysteretic quaternion feedback: the measured sign of η can only be flipped by noise of worst-case
 * size ē while |η| < ē, and the hysteresis keeps the logic variable from jumping while |η| ≥ −δ on
 * its side, so convergence from every start survives when ē < δ (Mayhew, Sanfelice & Teel 2011,
 * "Quaternion-based hybrid control for robust global attitude tracking", IEEE TAC 56(11)). On an
 * (ē, δ) sweep that is the line ē = δ.
 */
import type { SweepParameter } from './sweep';
import type { SweepInfo } from './sweepRun';

/** One theory line: a polyline in axis units (two-axis sweep) or one value on the single axis (a1 = null). */
export interface SweepTheoryLine {
  controllerId: string;
  /** What the line says, in the map's words (shown beside the line). */
  label: string;
  /** The published source. */
  source: string;
  /** Points in parameter space: a0 on axis 0, a1 on axis 1 (null on a one-axis sweep). */
  points: { a0: number; a1: number | null }[];
}

const MST_2011 = 'Mayhew, Sanfelice & Teel 2011, IEEE TAC 56(11): convergence is robust to noise smaller than the hysteresis';

const axisIndex = (info: Pick<SweepInfo, 'def'>, p: SweepParameter) => info.def.axes.findIndex((a) => a.parameter === p);

/** The line ē = δ for every hysteretic controller on a sweep whose two axes are ē and δ, clipped to the grid. */
function noiseBelowHysteresis(info: Pick<SweepInfo, 'def' | 'controllers'>): SweepTheoryLine[] {
  const ie = axisIndex(info, 'worst-case-eta');
  const id = axisIndex(info, 'hysteresis');
  if (info.def.axes.length !== 2 || ie < 0 || id < 0) return [];
  const range = (k: number) => {
    const v = info.def.axes[k]!.values;
    return [Math.min(...v), Math.max(...v)] as const;
  };
  const [e0, e1] = range(ie);
  const [d0, d1] = range(id);
  const lo = Math.max(e0, d0);
  const hi = Math.min(e1, d1);
  if (!(hi > lo)) return [];
  // The line is its own mirror image, so the axis order does not matter.
  const at = (x: number) => ({ a0: x, a1: x });
  return info.controllers
    .filter((c) => c.law === 'hysteretic')
    .map((c) => ({ controllerId: c.id, label: 'ē = δ', source: MST_2011, points: [at(lo), at(hi)] }));
}

/** Every theory line that applies to this sweep (empty when none applies). */
export function sweepTheoryLines(info: Pick<SweepInfo, 'def' | 'controllers'>): SweepTheoryLine[] {
  return noiseBelowHysteresis(info);
}
