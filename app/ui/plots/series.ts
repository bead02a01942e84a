/**
 * Plot contents from engine runs: which series, in which display units, with which markers.
 * Only unit conversion and de-interleaving happen here (design.md: the UI shows deg, deg/s, mN·m,
 * mN·m·s); every value comes from the run trace. Pure data, no DOM, so tests can check it.
 */
import type { ControllerRun, PipelineOutput } from '../../engine/pipeline/types';
import { DEG_PER_RAD, MILLI_PER_SI } from '../../engine/units';

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
  /** Draw points only (no line). */
  pointsOnly?: boolean;
}

export interface Interval {
  t0: number;
  t1: number;
  label: string;
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
  /** Shaded intervals (Lyapunov monitor flags). */
  intervals?: Interval[];
  /** When set, the plot has nothing to show and says why. */
  empty?: string;
}

const AXIS_COLORS = ['#c0392b', '#27864a', '#2c5aa0'];
export const PALETTE = [
  '#2c5aa0',
  '#c0392b',
  '#27864a',
  '#8e44ad',
  '#d35400',
  '#16817a',
  '#7f6a00',
  '#b03a75',
  '#4f5d75',
  '#6a994e',
  '#9c6644',
  '#1d3557',
];
const LIMIT_COLOR = '#7a8594';

/** Channel `c` of a sample-major array with `stride` values per sample, scaled. */
export function channel(src: ArrayLike<number>, n: number, stride: number, c: number, scale = 1): Float64Array {
  const out = new Float64Array(n);
  for (let k = 0; k < n; k++) out[k] = src[k * stride + c]! * scale;
  return out;
}

function scaled(src: ArrayLike<number>, n: number, scale: number): Float64Array {
  return channel(src, n, 1, 0, scale);
}

function times(run: ControllerRun): Float64Array {
  return run.trace.t.subarray(0, run.trace.n);
}

/** Log axes cannot show zero or negatives: those samples become gaps. */
function positiveOrNull(a: ArrayLike<number>): (number | null)[] {
  const out = new Array<number | null>(a.length);
  for (let i = 0; i < a.length; i++) out[i] = a[i]! > 0 ? a[i]! : null;
  return out;
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

function errorAnglePlot(runs: readonly ControllerRun[], log: boolean, join: (t: Series[][]) => Series[]): PlotSpec {
  const spec: PlotSpec = {
    id: 'error-angle',
    title: 'Attitude error angle',
    yLabel: 'error angle (deg)',
    log,
    series: runs.map((r, i) => ({ label: `${r.label} (${r.mode})`, color: PALETTE[i % PALETTE.length]! })),
    data: [],
  };
  if (runs.length === 0) return { ...spec, empty: 'No run selected' };
  spec.data = alignRuns(
    runs,
    (r) => {
      const deg = scaled(r.trace.errorAngle, r.trace.n, DEG_PER_RAD);
      return log ? positiveOrNull(deg) : deg;
    },
    join,
  );
  return spec;
}

function bodyRatePlot(run: ControllerRun): PlotSpec {
  const n = run.trace.n;
  return {
    id: 'body-rate',
    title: `Body rate — ${run.label}`,
    yLabel: 'ω body (deg/s)',
    series: [
      ...['ωx', 'ωy', 'ωz'].map((label, i) => ({ label, color: AXIS_COLORS[i]! })),
      ...['ωx ref', 'ωy ref', 'ωz ref'].map((label, i) => ({ label, color: AXIS_COLORS[i]!, dash: [4, 3], width: 1 })),
    ],
    data: [
      times(run),
      ...[0, 1, 2].map((c) => channel(run.trace.omega, n, 3, c, DEG_PER_RAD)),
      ...[0, 1, 2].map((c) => channel(run.trace.omegaRef, n, 3, c, DEG_PER_RAD)),
    ],
  };
}

/** Distinct per-wheel limits, for the ± limit lines. */
function distinct(values: ArrayLike<number>): number[] {
  const out: number[] = [];
  for (let i = 0; i < values.length; i++) if (!out.some((v) => Math.abs(v - values[i]!) <= 1e-12 * Math.abs(v))) out.push(values[i]!);
  return out;
}

function wheelPlot(
  run: ControllerRun,
  src: Float64Array,
  limits: Float64Array,
  id: string,
  title: string,
  yLabel: string,
  sym: string,
): PlotSpec {
  const n = run.trace.n;
  const N = run.trace.nWheels;
  const series: SeriesSpec[] = [];
  const data: Series[] = [times(run)];
  for (let w = 0; w < N; w++) {
    series.push({ label: `${sym}${w + 1}`, color: PALETTE[w % PALETTE.length]! });
    data.push(channel(src, n, N, w, MILLI_PER_SI));
  }
  for (const lim of distinct(limits)) {
    const v = lim * MILLI_PER_SI;
    series.push({ label: `+${sym} max`, color: LIMIT_COLOR, dash: [6, 4], width: 1 });
    data.push(new Float64Array(n).fill(v));
    series.push({ label: `−${sym} max`, color: LIMIT_COLOR, dash: [6, 4], width: 1 });
    data.push(new Float64Array(n).fill(-v));
  }
  return { id, title: `${title} — ${run.label}`, yLabel, series, data };
}

function wheelMomentumPlot(run: ControllerRun, out: PipelineOutput): PlotSpec {
  return wheelPlot(run, run.trace.hWheel, out.vehicle.maxMomentumNms, 'wheel-momentum', 'Wheel momentum', 'h (mN·m·s)', 'h');
}

function wheelTorquePlot(run: ControllerRun, out: PipelineOutput): PlotSpec {
  return wheelPlot(run, run.trace.wheelTorque, out.vehicle.maxTorqueNm, 'wheel-torque', 'Wheel torque (delivered)', 'τ (mN·m)', 'τ');
}

function logicPlot(run: ControllerRun): PlotSpec {
  const base: PlotSpec = {
    id: 'logic',
    title: `Logic value — ${run.label}`,
    yLabel: run.logicKind === 'index' ? 'potential index q' : 'h',
    series: [{ label: run.logicKind === 'index' ? 'q' : 'h', color: PALETTE[3]!, stepped: true }],
    data: [times(run), run.trace.logic.subarray(0, run.trace.n)],
    jumpTimes: run.jumps.map((j) => j.t),
  };
  if (run.logicKind === 'none') return { ...base, empty: `${run.label} is a smooth law: it has no logic variable` };
  return base;
}

function potentialPlot(run: ControllerRun): PlotSpec {
  const n = run.trace.n;
  const base: PlotSpec = {
    id: 'potential',
    title: `Active potential vs family minimum — ${run.label}`,
    yLabel: 'potential (—)',
    series: [
      { label: 'V_q (active)', color: PALETTE[0]! },
      { label: 'min_p V_p', color: PALETTE[2]!, dash: [5, 3] },
    ],
    data: [times(run), run.trace.potential.subarray(0, n), run.trace.potentialMin.subarray(0, n)],
    bands: [{ upper: 1, lower: 2, color: 'rgba(44, 90, 160, 0.15)' }],
    jumpTimes: run.jumps.map((j) => j.t),
  };
  if (run.logicKind !== 'index') return { ...base, empty: `${run.label} has no potential family (synergistic laws only)` };
  return base;
}

function lyapunovPlot(run: ControllerRun): PlotSpec {
  return {
    id: 'lyapunov',
    title: `Lyapunov value W — ${run.label}`,
    yLabel: 'W (—)',
    series: [{ label: 'W', color: PALETTE[4]! }],
    data: [times(run), run.trace.lyapunov.subarray(0, run.trace.n)],
    jumpTimes: run.jumps.map((j) => j.t),
    intervals: run.monitor.map((f) => ({ t0: f.tStart, t1: f.tEnd, label: f.message })),
  };
}

/** Hybrid time: the jump counter j against t (a stepped hybrid time domain) with W beside it. */
function hybridTimePlot(run: ControllerRun): PlotSpec {
  const n = run.trace.n;
  const j = new Float64Array(n);
  for (let k = 0; k < n; k++) j[k] = run.trace.j[k]!;
  const base: PlotSpec = {
    id: 'hybrid-time',
    title: `Hybrid time domain (t, j) — ${run.label}`,
    yLabel: 'W (—)',
    y2Label: 'jump counter j',
    series: [
      { label: 'W', color: PALETTE[4]! },
      { label: 'j', color: PALETTE[3]!, stepped: true, scale: 'j', width: 2 },
    ],
    data: [times(run), run.trace.lyapunov.subarray(0, n), j],
    jumpTimes: run.jumps.map((x) => x.t),
  };
  if (run.logicKind === 'none') return { ...base, empty: `${run.label} is a smooth law: its hybrid time domain has no jumps` };
  return base;
}

export interface PlotSetOptions {
  logError: boolean;
}

/** Every plot for the selected runs; the first selected run is the detailed one. */
export function buildPlots(
  out: PipelineOutput,
  selected: readonly string[],
  o: PlotSetOptions,
  join: (t: Series[][]) => Series[],
): PlotSpec[] {
  const runs = selected.map((k) => out.runs.find((r) => r.key === k)).filter((r): r is ControllerRun => r !== undefined);
  const detail = runs[0];
  const plots = [errorAnglePlot(runs, o.logError, join)];
  if (!detail) return plots;
  plots.push(
    bodyRatePlot(detail),
    wheelMomentumPlot(detail, out),
    wheelTorquePlot(detail, out),
    logicPlot(detail),
    potentialPlot(detail),
    lyapunovPlot(detail),
    hybridTimePlot(detail),
  );
  return plots;
}
