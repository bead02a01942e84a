/**
 * The shapes every plot shares (PlotSpec, series, intervals), the run colours and the helpers
 * that turn a run's sample-major channels into plot columns in display units. Pure data.
 */
import type { ControllerRun, PipelineOutput } from '../../engine/pipeline/types';
import type { TimeMarker } from './markers';
import type { WindowBand } from './windowBands';

export type Series = ArrayLike<number | null>;

export interface SeriesSpec {
  label: string;
  color: string;
  /** Dashed line (limits, references). */
  dash?: number[];
  stepped?: boolean;
  /** Second y scale (the hybrid-time plot's jump counter). */
  scale?: 'y' | 'j';
  width?: number;
}

export interface Interval {
  t0: number;
  t1: number;
  label: string;
  /** Fill colour (default: the monitor's orange). */
  color?: string;
}

export interface PlotSpec {
  id: string;
  title: string;
  yLabel: string;
  /** Label of the second (right) axis, when a series uses scale 'j'. */
  y2Label?: string;
  log?: boolean;
  series: SeriesSpec[];
  /** x (time, s) first, then one array per series. */
  data: Series[];
  /** Pairs of series numbers (1-based, as uPlot counts): fill between upper and lower. */
  bands?: { upper: number; lower: number; color: string }[];
  /** Vertical markers (logic jumps), s. */
  jumpTimes?: number[];
  /** Shaded intervals (Lyapunov monitor flags, wheels at a limit). */
  intervals?: Interval[];
  /** Segment starts and planned arrivals (every time axis shows them). */
  markers?: TimeMarker[];
  /** Orbit scenarios: planned site/station windows and eclipses, shaded and labelled (windowBands.ts). */
  windowBands?: readonly WindowBand[];
  /** One line under the title (what is shaded, which wheel is at its limit). */
  note?: string;
  /** When set, the plot has nothing to show and says why. */
  empty?: string;
}

export const AXIS_COLORS = ['#c0392b', '#27864a', '#2c5aa0'];
export const PALETTE = [
  '#2c5aa0',
  '#c0392b',
  '#27864a',
  '#8e44ad',
  '#b34700',
  '#16817a',
  '#7a6500',
  '#b03a75',
  '#4f5d75',
  '#4f7a38',
  '#8a5230',
  '#1d3557',
];
export const LIMIT_COLOR = '#6b7684';
export const MONITOR_FILL = 'rgba(214, 96, 20, 0.18)';

/** A run's colour: by its place in the pipeline output, so it keeps its colour whatever else is ticked. */
export function runColor(out: PipelineOutput, key: string): string {
  const i = out.runs.findIndex((r) => r.key === key);
  return PALETTE[(i < 0 ? 0 : i) % PALETTE.length]!;
}

/** Channel `c` of a sample-major array with `stride` values per sample, scaled. */
export function channel(src: ArrayLike<number>, n: number, stride: number, c: number, scale = 1): Float64Array {
  const out = new Float64Array(n);
  for (let k = 0; k < n; k++) out[k] = src[k * stride + c]! * scale;
  return out;
}

export function times(run: ControllerRun): Float64Array {
  return run.trace.t.subarray(0, run.trace.n);
}

function sameTimes(runs: readonly ControllerRun[]): boolean {
  const a = runs[0]!.trace;
  return runs.every((r) => {
    const b = r.trace;
    if (b.n !== a.n) return false;
    for (let k = 0; k < a.n; k++) if (b.t[k] !== a.t[k]) return false;
    return true;
  });
}

/**
 * Several runs on one time axis. Runs with identical sample times share it; otherwise the union
 * of times is used with gaps where a run has no sample (the caller passes uPlot.join).
 */
export function alignRuns(
  runs: readonly ControllerRun[],
  pick: (r: ControllerRun) => ArrayLike<number | null>,
  join: (tables: Series[][]) => Series[],
): Series[] {
  if (runs.length === 1 || sameTimes(runs)) return [times(runs[0]!), ...runs.map(pick)];
  return join(runs.map((r) => [times(r), pick(r)]));
}
