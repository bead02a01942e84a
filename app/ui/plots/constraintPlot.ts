/**
 * The constraint-margin overlay: for every ticked run, one series per constraint of the engine's
 * margin (pipeline/constraints.ts RunConstraintReport.marginRad, per trace sample, NaN outside the
 * constraint's window) in degrees, the zero line (the cone's edge with its margin), and the
 * stretches where a ticked run violates a constraint shaded in that run's colour. Runs keep their
 * colour (base.ts runColor); constraints are told apart by dash pattern. Pure data.
 */
import type { ControllerRun, PipelineOutput } from '../../engine/pipeline/types';
import { DEG_PER_RAD } from '../../engine/units';
import { runName } from '../modeNames';
import { LIMIT_COLOR, runColor, times, type Interval, type PlotSpec, type Series, type SeriesSpec } from './base';

/** Dash patterns by constraint index (solid first). */
export const CONSTRAINT_DASHES: (number[] | undefined)[] = [undefined, [8, 4], [2, 3], [10, 3, 2, 3], [4, 4]];

/** Margin in degrees per sample; samples outside the window (NaN) become gaps. */
export function marginDegrees(marginRad: ArrayLike<number>, n: number): (number | null)[] {
  const out = new Array<number | null>(n);
  for (let k = 0; k < n; k++) {
    const m = marginRad[k];
    out[k] = m === undefined || Number.isNaN(m) ? null : m * DEG_PER_RAD;
  }
  return out;
}

function tint(hex: string, alpha: number): string {
  const v = Number.parseInt(hex.slice(1), 16);
  return `rgba(${(v >> 16) & 255}, ${(v >> 8) & 255}, ${v & 255}, ${alpha})`;
}

function sameTimes(runs: readonly ControllerRun[]): boolean {
  const a = runs[0]!.trace;
  return runs.every((r) => r.trace.n === a.n && r.trace.t.subarray(0, a.n).every((t, k) => t === a.t[k]));
}

/** The margin plot, or null when the scenario declares no constraint. */
export function constraintMarginPlot(
  out: PipelineOutput,
  runs: readonly ControllerRun[],
  join: (t: Series[][]) => Series[],
): PlotSpec | null {
  const info = out.constraints ?? [];
  if (info.length === 0) return null;
  const base = {
    id: 'constraint-margin',
    title: 'Constraint margin (angle to the cone edge beyond its margin; below zero: violated)',
    yLabel: 'margin (deg)',
  };
  const series: SeriesSpec[] = [];
  for (const r of runs)
    info.forEach((c, j) =>
      series.push({
        label: `${runName(r)} · ${c.name}`,
        color: runColor(out, r.key),
        dash: CONSTRAINT_DASHES[j % CONSTRAINT_DASHES.length],
      }),
    );
  if (runs.length === 0) return { ...base, series, data: [], empty: 'Tick a run in the comparison table to plot it.' };
  const tables: Series[][] = runs.map((r) => {
    const m = r.constraints?.marginRad ?? [];
    return [times(r), ...info.map((_, j) => marginDegrees(m[j] ?? new Float64Array(0), r.trace.n))];
  });
  const data: Series[] = runs.length === 1 || sameTimes(runs) ? [tables[0]![0]!, ...tables.flatMap((t) => t.slice(1))] : join(tables);
  series.push({ label: 'zero (cone edge + margin)', color: LIMIT_COLOR, dash: [6, 4], width: 1 });
  data.push(new Float64Array(data[0]!.length));
  const intervals: Interval[] = [];
  for (const r of runs)
    r.constraints?.constraints.forEach((c) => {
      for (const iv of c.intervals)
        intervals.push({ t0: iv.startS, t1: iv.endS, label: `${runName(r)} violates ${c.name}`, color: tint(runColor(out, r.key), 0.16) });
    });
  const names = [...new Set(intervals.map((i) => i.label))];
  const note = names.length
    ? `Shaded: ${names.join('; ')}.`
    : 'No ticked run violates a constraint. Line style: one per constraint; colour: one per run.';
  return { ...base, series, data, intervals, note };
}
